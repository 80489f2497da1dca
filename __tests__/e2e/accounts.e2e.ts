import { BASE_URL, PHONE, WIDE, button, field, openBrowser, screenshot, signIn, tabNames, type Browser } from './browser';

const DEMO_PASSWORD = 'calder-valley-demo';

describe('Accounts in the browser', () => {
  let b: Browser;
  afterEach(async () => {
    expect(b.offsite).toEqual([]); // fonts and everything else come from the Fieldfold server
    await b.close();
  });

  test('At phone width, a new grower signs up, sees the grower tabs, signs out, and the seeded grazier sees a different set', async () => {
    b = await openBrowser(PHONE);
    const { page } = b;
    await page.goto(BASE_URL);
    await page.waitForURL('**/sign-in');
    await screenshot(page, 'sign-in-390');
    await page.getByText('Create an account').filter({ visible: true }).click();
    await page.waitForURL('**/sign-up');

    // The form refuses a short password before anything is sent.
    await field(page, 'Your name').fill('Pia Lindqvist');
    await field(page, 'Email').fill(`pia-${Date.now()}@orchard.example`);
    await field(page, 'Password').fill('short');
    await page.getByRole('checkbox', { name: 'I have land to graze' }).click();
    await button(page, 'Create account').click();
    await page.getByText('Password must be at least 10 characters').waitFor();

    await field(page, 'Password').fill('a-long-orchard-password');
    await screenshot(page, 'sign-up-390');
    await button(page, 'Create account').click();
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();
    await page.getByText('No blocks yet — post your first block').waitFor();
    expect(await tabNames(page)).toEqual(['My blocks', 'Contracts', 'Invoices', 'Account']);
    await screenshot(page, 'grower-home-390');

    await page.getByRole('tab', { name: 'Account' }).click();
    await page.getByTestId('sign-out').click();
    await page.waitForURL('**/sign-in');

    await signIn(page, 'wade@calder.example', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    expect(await tabNames(page)).toEqual(['Find grazing', 'My bids', 'Contracts', 'Invoices', 'Account']);
    await screenshot(page, 'grazier-home-390');
  });

  test('At 1280 px the signed-in area uses the width: a side rail beside the content', async () => {
    b = await openBrowser(WIDE);
    const { page } = b;
    await page.goto(`${BASE_URL}/sign-up`);
    await page.getByRole('heading', { name: 'Create your account' }).waitFor();
    await screenshot(page, 'sign-up-1280');

    await signIn(page, 'wade@calder.example', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    const rail = await page.locator('[role="tablist"]:visible').boundingBox();
    expect(rail).not.toBeNull();
    expect(rail!.x).toBeLessThan(10);
    expect(rail!.width).toBeLessThan(320);
    expect(rail!.height).toBeGreaterThan(600);
    const heading = await page.getByRole('heading', { name: 'Find grazing' }).boundingBox();
    expect(heading!.x).toBeGreaterThan(rail!.width);
    await screenshot(page, 'grazier-home-1280');

    await page.getByRole('tab', { name: 'Account' }).click();
    await page.getByText('Your flock').first().waitFor();
    await screenshot(page, 'grazier-account-1280');
  });

  test('A wrong password shows the server message on the form, not a crash', async () => {
    b = await openBrowser(PHONE);
    await signIn(b.page, 'wade@calder.example', 'not-the-password');
    await b.page.getByText('Email or password is not right').waitFor();
  });
});
