import type { Page } from 'playwright-core';
import { api, BASE_URL, PHONE, WIDE, button, field, openBrowser, screenshot, signIn, type Browser } from './browser';

// The market end to end, through the UI: a grower posts and opens a block, two graziers bid, the grower
// compares the bids (cards on a phone, a table at 1280 px) and awards one, which makes a contract.
const PASSWORD = 'calder-valley-demo';
const BLOCK = `Creekside almond middles ${Date.now().toString(36)}`;

/** Signs out the way a user does: Account tab → Sign out. */
async function signOut(page: Page) {
  await page.goto(`${BASE_URL}/account`);
  await page.getByTestId('sign-out').filter({ visible: true }).click();
  await page.waitForURL('**/sign-in');
}

describe('Posting, bidding and awarding a block', () => {
  let b: Browser;
  let blockId = '';
  afterAll(async () => {
    await b?.close();
  });

  test('At 390 px a grower posts a block through the form and opens it for bids', async () => {
    b = await openBrowser(PHONE);
    const { page } = b;
    await signIn(page, 'tomas@calder.example', PASSWORD);
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();
    await button(page, 'Post a block').click();
    await page.getByRole('heading', { name: 'Post a block' }).waitFor();

    await field(page, 'Block name').fill(BLOCK);
    await page.getByRole('button', { name: 'orchard', exact: true }).click();
    await field(page, 'Acres').fill('-5');
    await field(page, 'Place').fill('Calder Valley, creek road');
    await button(page, 'Save draft').click();
    // The shared schema refuses before anything is sent, naming the fields.
    await page.getByText('Acres must be more than 0').waitFor();
    await page.getByText('Earliest in (window start) is required').waitFor();

    await field(page, 'Acres').fill('36.5');
    await field(page, 'Standing forage').fill('1800');
    await field(page, 'Earliest in').fill('2027-01-05');
    await field(page, 'Latest out').fill('2027-02-28');
    await field(page, 'Animals out by').fill('2027-02-20');
    await button(page, 'Add a spray record').click();
    await field(page, 'Spray 1 product').fill('Dormant oil');
    await field(page, 'Spray 1 date applied').fill('2026-12-20');
    await field(page, 'Spray 1 grazing restriction').fill('14');
    await page.getByText('Earliest safe grazing date: Jan 3, 2027').waitFor();
    await page.getByRole('button', { name: 'goats', exact: true }).click(); // sheep and goats allowed
    // 36.5 ac × 1 800 lb × 45 % ÷ (150 lb × 2.5 %) = 7 884 head-days for the reference ewe
    await page.getByTestId('block-form-capacity').filter({ hasText: '7,884 head-days' }).waitFor();
    await screenshot(page, 'block-form-390');
    await button(page, 'Save draft').click();

    await page.getByRole('heading', { name: BLOCK }).waitFor();
    blockId = page.url().split('/blocks/')[1];
    expect(blockId).toMatch(/^[0-9a-f-]{36}$/);
    await button(page, 'Open for bids').click();
    await page.getByText('Taking bids').filter({ visible: true }).first().waitFor();
    await screenshot(page, 'block-owner-open-390');
  });

  test('Two graziers bid (one through the API, one through the UI at 390 px)', async () => {
    const mirela = await api<{ token: string }>('/auth/login', { body: { email: 'mirela@calder.example', password: PASSWORD } });
    await api(`/blocks/${blockId}/bids`, {
      token: mirela.token,
      body: { basis: 'acre', rate: '38.00', headCount: 240, species: 'goats', animalClass: 'wethers', bodyWeightLb: 120, startDate: '2027-01-20', endDate: '2027-02-10', services: ['herding'] },
    });

    const { page } = b;
    await signOut(page);
    await signIn(page, 'wade@calder.example', PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    await page.goto(`${BASE_URL}/blocks/${blockId}/bid`);
    await field(page, 'Rate').fill('0.16');
    await field(page, 'Head count').fill('500');
    await field(page, 'Start date').fill('2027-01-08');
    await field(page, 'End date').fill('2027-01-22');
    await screenshot(page, 'bid-form-390');
    await button(page, 'Place bid').click();
    await page.getByRole('heading', { name: 'My bids' }).waitFor();
    await page.getByText(BLOCK).first().waitFor();
  });

  test('At 1280 px the grower compares the bids side by side, sorted by estimated total', async () => {
    const { page } = b;
    await signOut(page);
    await page.setViewportSize(WIDE);
    await signIn(page, 'tomas@calder.example', PASSWORD);
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();
    await page.goto(`${BASE_URL}/blocks/${blockId}`);
    const table = page.getByRole('table', { name: 'Bids compared' });
    await table.waitFor();
    const rows = table.locator('[data-testid^="bid-row-"]');
    expect(await rows.count()).toBe(2);
    // 500 head × 14 days × $0.16 = $1,120.00; 36.5 ac × $38 = $1,387.00 — cheapest first.
    await expect(rows.nth(0).textContent()).resolves.toContain('$1,120.00');
    await expect(rows.nth(1).textContent()).resolves.toContain('$1,387.00');
    await screenshot(page, 'bid-comparison-1280');
    await page.getByRole('button', { name: 'Sort by Estimated total' }).click();
    await expect(rows.nth(0).textContent()).resolves.toContain('$1,387.00');
  });

  test('At 390 px the grower awards one bid; the block is awarded and a contract is waiting for signatures', async () => {
    const { page } = b;
    await page.setViewportSize(PHONE);
    await page.goto(`${BASE_URL}/blocks/${blockId}`);
    const card = page.locator('[data-testid^="bid-card-"]').filter({ hasText: 'Kellner Range Sheep' });
    await card.getByRole('button', { name: 'Award' }).click();
    await card.getByRole('button', { name: 'Confirm award' }).click();
    await page.getByText('Awarded to Kellner Range Sheep').waitFor();
    await page.getByText('Awarded').filter({ visible: true }).first().waitFor();
    await screenshot(page, 'block-awarded-390');
    const tomas = await api<{ token: string }>('/auth/login', { body: { email: 'tomas@calder.example', password: PASSWORD } });
    const contracts = await api<{ items: Array<{ blockId: string; status: string; headCount: number }> }>('/contracts', { token: tomas.token });
    const contract = contracts.items.find((c) => c.blockId === blockId);
    expect(contract).toMatchObject({ status: 'to-sign', headCount: 500 });
  });
});
