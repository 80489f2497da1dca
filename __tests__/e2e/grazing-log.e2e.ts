import type { Page } from 'playwright-core';
import { api, BASE_URL, PHONE, WIDE, button, openBrowser, screenshot, signIn, type Browser } from './browser';

// The grazing log from the truck, end to end: a fresh contract signed by both (set up through the API),
// the grazier logs the move in at 390 px, loses the signal, reloads the page and still has the log (the
// service worker serves the app, IndexedDB the data), logs a tally offline, gets the signal back and sees
// both sent once; then the animals go out, the grazier proposes the head-days, the grower approves them at
// 1280 px, and both download the log as a PDF.
const PASSWORD = 'calder-valley-demo';
const GRAZIER = 'wade@calder.example';
const GROWER = 'tomas@calder.example';
const BLOCK = `Creek bottom fallow ${Date.now().toString(36)}`;
const ZONE = 'America/Los_Angeles';

interface ContractLite {
  id: string;
  status: string;
  termsHash: string;
  pendingAmendment?: { termsHash: string } | null;
  signOff?: { status: string; agreedHeadDays: number | null } | null;
}
interface LogLite {
  items: Array<{ clientId: string; kind: string; change: number | null; count: number | null }>;
  figures: { headNow: number; headDaysSoFar: number };
}

/** Today and later days at the block ('YYYY-MM-DD' in its zone), as the server counts them. */
function dayAtBlock(plus = 0): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone: ZONE, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
  return new Date(Date.parse(`${parts}T12:00:00Z`) + plus * 86_400_000).toISOString().slice(0, 10);
}

const login = (email: string) => api<{ token: string; user: { id: string; name: string } }>('/auth/login', { body: { email, password: PASSWORD } });

/** A screenshot of the whole screen: the app scrolls inside its own view, so the viewport grows to fit it first. */
async function longShot(page: Page, name: string) {
  const size = page.viewportSize()!;
  // A string, not a function: the suite compiles without the DOM library.
  const height = Number(await page.evaluate('Math.max(...Array.from(document.querySelectorAll("div"), (d) => d.scrollHeight))'));
  await page.setViewportSize({ width: size.width, height: Math.min(Math.max(height, size.height), 4000) });
  await screenshot(page, name);
  await page.setViewportSize(size);
}

const visibleText = (page: Page, text: string | RegExp) => page.getByText(text).filter({ visible: true }).first();

describe('The grazing log from the truck', () => {
  let b: Browser;
  let contractId = '';
  let grazierToken = '';
  let growerToken = '';
  const seen = new Set<string>();

  beforeAll(async () => {
    const [grower, grazier] = await Promise.all([login(GROWER), login(GRAZIER)]);
    growerToken = grower.token;
    grazierToken = grazier.token;
    // A fallow field open from today for 30 days, out by day 25; Wade bids 500 head for ten days from today.
    const { block } = await api<{ block: { id: string } }>('/blocks', {
      token: growerToken,
      body: {
        name: BLOCK,
        crop: 'fallow',
        acres: 30,
        placeName: 'Calder Valley, creek bottom',
        latitude: 39.7,
        longitude: -121.9,
        forageMethod: 'direct',
        lbDmPerAcre: 1800,
        targetUtilizationPct: 45,
        windowStart: dayAtBlock(0),
        windowEnd: dayAtBlock(30),
        outBy: dayAtBlock(25),
        sprayRecords: [],
        waterOnSite: true,
        perimeterFence: 'full',
        truckAccess: true,
        speciesAllowed: ['sheep'],
        youngPlantings: false,
      },
    });
    await api(`/blocks/${block.id}/publish`, { method: 'POST', token: growerToken });
    const { bid } = await api<{ bid: { id: string } }>(`/blocks/${block.id}/bids`, {
      token: grazierToken,
      body: { basis: 'head-day', rate: '0.17', headCount: 500, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: dayAtBlock(0), endDate: dayAtBlock(10), services: ['fencing'] },
    });
    const { contract } = await api<{ contract: ContractLite }>(`/bids/${bid.id}/award`, { method: 'POST', token: growerToken });
    contractId = contract.id;
    for (const [token, user] of [
      [growerToken, grower.user],
      [grazierToken, grazier.user],
    ] as const) {
      const c = (await api<{ contract: ContractLite }>(`/contracts/${contractId}`, { token })).contract;
      await api(`/contracts/${contractId}/sign`, { token, body: { typedName: user.name, cautionsAcknowledged: true, termsHash: c.pendingAmendment?.termsHash ?? c.termsHash } });
    }
  });

  afterAll(async () => {
    await b?.close();
  });

  test('At 390 px the grazier logs the move in: the stepper starts at the contract’s 500 head and the entry is sent', async () => {
    b = await openBrowser(PHONE);
    const { page } = b;
    await signIn(page, GRAZIER, PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    await page.goto(`${BASE_URL}/contracts/${contractId}/log`);
    await page.getByRole('heading', { name: 'Grazing log' }).waitFor();

    await button(page, 'Animals in').click();
    await expect(page.getByLabel('Head in', { exact: true }).filter({ visible: true }).inputValue()).resolves.toBe('500');
    await page.getByLabel('Paddock or cell', { exact: true }).filter({ visible: true }).fill('Cell A (north half)');
    await button(page, 'Save entry').click();
    await page.getByTestId('queue-summary').filter({ hasText: 'Everything written on this phone has been sent.' }).waitFor();
    await page.getByTestId('figure-head-now').filter({ hasText: /^500$/ }).waitFor();
    await screenshot(page, 'grazing-log-390');
    await longShot(page, 'grazing-log-390-full');
  });

  test('With no signal the grazier reloads the page, still sees the log, and logs a tally that waits on the phone', async () => {
    const { page, context } = b;
    // The worker registers after the page is up; the app shell must be precached before the signal goes.
    await expect(page.evaluate('navigator.serviceWorker.ready.then(() => true)')).resolves.toBe(true);
    await context.setOffline(true);
    // The service worker serves the app itself; the contract, the log and the account come from IndexedDB
    // and local storage.
    await page.reload();
    await page.getByRole('heading', { name: 'Grazing log' }).waitFor();
    await visibleText(page, 'No signal').waitFor();
    await visibleText(page, /Cell A \(north half\)/).waitFor();
    await page.getByTestId('figure-head-now').filter({ hasText: /^500$/ }).waitFor();

    await button(page, 'Daily tally').click();
    await expect(page.getByLabel('Head counted', { exact: true }).filter({ visible: true }).inputValue()).resolves.toBe('500');
    await page.getByRole('button', { name: 'Minus 1 head counted' }).filter({ visible: true }).click();
    await button(page, 'Save entry').click();
    await visibleText(page, 'Saved on this phone. It will be sent when there is signal.').waitFor();
    await page.getByTestId('queue-summary').filter({ hasText: '1 waiting to send' }).waitFor();
    await screenshot(page, 'grazing-log-offline-390');
  });

  test('Back online, the waiting tally goes out by itself, and the server holds each entry once', async () => {
    const { page, context } = b;
    await context.setOffline(false);
    await page.getByTestId('queue-summary').filter({ hasText: 'Everything written on this phone has been sent.' }).waitFor({ timeout: 45_000 });
    const log = await api<LogLite>(`/contracts/${contractId}/log`, { token: grazierToken });
    const counts = new Map<string, number>();
    for (const e of log.items) counts.set(e.clientId, (counts.get(e.clientId) ?? 0) + 1);
    expect([...counts.values()].every((n) => n === 1)).toBe(true);
    expect(log.items.map((e) => [e.kind, e.change ?? e.count]).sort()).toEqual([
      ['move', 500],
      ['tally', 499],
    ]);
    log.items.forEach((e) => seen.add(e.clientId));
    const contract = (await api<{ contract: ContractLite }>(`/contracts/${contractId}`, { token: grazierToken })).contract;
    expect(contract.status).toBe('grazing');
  });

  test('The grazier logs the animals out and proposes the head-days the log adds up to', async () => {
    const { page } = b;
    await button(page, 'Animals out').click();
    await expect(page.getByLabel('Head out', { exact: true }).filter({ visible: true }).inputValue()).resolves.toBe('500');
    await button(page, 'Save entry').click();
    await page.getByTestId('figure-head-now').filter({ hasText: /^0$/ }).waitFor();
    await page.getByTestId('queue-summary').filter({ hasText: 'Everything written on this phone has been sent.' }).waitFor();
    await button(page, 'End grazing and propose head-days').click();
    await page.getByRole('heading', { name: 'Sign-off' }).waitFor();
    await page.getByTestId('propose-head-days').filter({ visible: true }).click();
    await visibleText(page, /^Proposed: .* head-days$/).waitFor();
    await visibleText(page, 'Waiting for the grower to approve or dispute.').waitFor();
    await longShot(page, 'sign-off-proposed-390');
  });

  test('At 1280 px the grower reads the proposal day by day and approves it; the figure is locked with both names', async () => {
    const { page } = b;
    await page.goto(`${BASE_URL}/account`);
    await page.getByTestId('sign-out').filter({ visible: true }).click();
    await page.waitForURL('**/sign-in');
    await page.setViewportSize(WIDE);
    await signIn(page, GROWER, PASSWORD);
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();
    await page.goto(`${BASE_URL}/contracts/${contractId}/sign-off`);
    await page.getByRole('table', { name: 'Head-days by day' }).filter({ visible: true }).waitFor();
    await screenshot(page, 'sign-off-review-1280');
    await page.getByTestId('approve-head-days').filter({ visible: true }).click();
    const agreed = page.getByTestId('agreed-head-days').filter({ visible: true });
    await agreed.waitFor();
    await visibleText(page, /^Proposed by Wade Kellner/).waitFor();
    await visibleText(page, /^Agreed when Tomás Reyes approved/).waitFor();
    await screenshot(page, 'sign-off-agreed-1280');

    const contract = (await api<{ contract: ContractLite }>(`/contracts/${contractId}`, { token: growerToken })).contract;
    expect(contract.status).toBe('agreed');
    expect(contract.signOff?.status).toBe('agreed');
    await expect(agreed.textContent()).resolves.toBe(contract.signOff!.agreedHeadDays!.toLocaleString('en-US', { maximumFractionDigits: 4 }));

    await page.goto(`${BASE_URL}/contracts/${contractId}/log`);
    await page.getByRole('heading', { name: 'Grazing log' }).waitFor();
    await screenshot(page, 'grazing-log-1280');
  });

  test('Both parties download the log as a PDF from the contract screen', async () => {
    const { page } = b;
    const download = async () => {
      await page.goto(`${BASE_URL}/contracts/${contractId}`);
      const wait = page.waitForEvent('download');
      await page.getByTestId('download-log-pdf').filter({ visible: true }).click();
      const file = await wait;
      expect(file.suggestedFilename()).toMatch(/^fieldfold-log-creek-bottom-fallow-[a-z0-9-]+\.pdf$/);
      const stream = await file.createReadStream();
      const chunks: Buffer[] = [];
      for await (const c of stream) chunks.push(c as Buffer);
      const bytes = Buffer.concat(chunks);
      expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
      return bytes.length;
    };
    expect(await download()).toBeGreaterThan(1000);
    await screenshot(page, 'contract-agreed-1280');

    await page.goto(`${BASE_URL}/account`);
    await page.getByTestId('sign-out').filter({ visible: true }).click();
    await page.waitForURL('**/sign-in');
    await page.setViewportSize(PHONE);
    await signIn(page, GRAZIER, PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    expect(await download()).toBeGreaterThan(1000);
    await screenshot(page, 'contract-agreed-390');
    // Nothing was stored twice along the way.
    const log = await api<LogLite>(`/contracts/${contractId}/log`, { token: grazierToken });
    expect(log.items).toHaveLength(3);
    expect(new Set(log.items.map((e) => e.clientId)).size).toBe(3);
    expect([...seen].every((id) => log.items.some((e) => e.clientId === id))).toBe(true);
  });
});
