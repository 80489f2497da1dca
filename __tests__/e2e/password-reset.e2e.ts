import { api, BASE_URL, PHONE, button, field, openBrowser, screenshot, signIn, type Browser } from './browser';

// A forgotten password, end to end: the link on the sign-in screen, the request, the mail as the local mail
// sink received it over SMTP (E2E_MAIL_UI_URL, started by scripts/test.mjs), the link from it, the new password,
// and signing in with it. The same link refuses a second use.

const MAIL_UI = process.env.E2E_MAIL_UI_URL ?? '';
const OLD_PASSWORD = 'a-long-orchard-password';
const NEW_PASSWORD = 'a-fresh-walnut-password';

interface SinkList {
  items: Array<{ Created: string; Parsed: { Subject: string; To: string[]; Text: string | null } }>;
}

/** The newest mail to `to` with `subject`, as the sink received it (the outbox sends a moment after the request). */
async function mailTo(to: string, subject: string): Promise<string> {
  if (!MAIL_UI) throw new Error('E2E_MAIL_UI_URL is not set: run the browser suite through npm test');
  for (let i = 0; i < 100; i++) {
    const res = await fetch(`${MAIL_UI}/api/v2/messages?limit=200`);
    const list = (await res.json()) as SinkList;
    const found = list.items.filter((m) => m.Parsed.To.includes(to) && m.Parsed.Subject === subject).sort((a, b) => b.Created.localeCompare(a.Created));
    if (found[0]?.Parsed.Text) return found[0].Parsed.Text;
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`no "${subject}" mail to ${to} reached the sink`);
}

describe('Forgotten password in the browser', () => {
  let b: Browser;
  afterEach(async () => {
    expect(b.offsite).toEqual([]);
    await b.close();
  });

  test('A grower asks for a link on the sign-in screen, opens it from the mail, sets a new password and signs in with it', async () => {
    const email = `rosa-${Date.now()}@orchard.example`;
    await api('/auth/register', { body: { email, password: OLD_PASSWORD, name: 'Rosa Amsel', roles: ['grower'] } });

    b = await openBrowser(PHONE);
    const { page } = b;
    await page.goto(`${BASE_URL}/sign-in`);
    await page.getByText('Forgotten password?').filter({ visible: true }).click();
    await page.waitForURL('**/forgot-password');
    await field(page, 'Email').fill(email);
    await button(page, 'Mail me a link').click();
    await page.getByText('Check your mail').filter({ visible: true }).waitFor();
    await page.getByText('If an account uses this email, a link to set a new password is on its way.', { exact: false }).filter({ visible: true }).waitFor();
    await screenshot(page, 'forgot-password-sent-390');

    const text = await mailTo(email, 'Set a new Fieldfold password');
    const link = /https?:\/\/[^\s/]+(\/reset-password\?token=[A-Za-z0-9_-]{43})/.exec(text);
    expect(link).not.toBeNull();
    // PUBLIC_URL names localhost; the suite's server listens on 127.0.0.1 (BASE_URL): same server, same path.
    const resetPath = link![1];

    await page.goto(`${BASE_URL}${resetPath}`);
    await page.getByText('Set a new password').first().waitFor();
    await field(page, 'New password').fill('short');
    await button(page, 'Set new password').click();
    await page.getByText('Password must be at least 10 characters').filter({ visible: true }).waitFor();
    await field(page, 'New password').fill(NEW_PASSWORD);
    await screenshot(page, 'reset-password-390');
    await button(page, 'Set new password').click();
    await page.getByText('Password set').filter({ visible: true }).waitFor();

    await page.getByText('Sign in →').filter({ visible: true }).click();
    await page.waitForURL('**/sign-in');
    await signIn(page, email, NEW_PASSWORD);
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();

    // The old password no longer signs in, and the link from the mail has been used.
    await expect(api('/auth/login', { body: { email, password: OLD_PASSWORD } })).rejects.toThrow(/401/);
    const second = await openBrowser(PHONE);
    try {
      await second.page.goto(`${BASE_URL}${resetPath}`);
      await field(second.page, 'New password').fill('yet-another-password');
      await button(second.page, 'Set new password').click();
      await second.page.getByText('This link does not work').filter({ visible: true }).waitFor();
      await second.page.getByText(/used already/).filter({ visible: true }).first().waitFor();
    } finally {
      await second.close();
    }
  });
});
