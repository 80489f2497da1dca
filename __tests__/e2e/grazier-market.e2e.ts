import { api, PHONE, WIDE, button, field, openBrowser, screenshot, signIn, type Browser } from './browser';

// The grazier's side of the market through the UI: Find grazing with a filter, a seeded open block with its
// cautions and the capacity for my flock, a bid with its live preview, My bids, and a contract's terms.
const PASSWORD = 'calder-valley-demo';
const WADE = 'wade@calder.example';
// Seeded (server/db/seed/demo.ts): copper-sprayed vineyard rows, 13.8 miles from Wade's corrals, sheep only.
const VINEYARD = 'Terrace 2 vineyard rows';

interface BlockLite {
  id: string;
  name: string;
  distanceMiles: number | null;
  daysForMyFlock: number | null;
  capacity: number | null;
  grazeFrom: string;
  grazeUntil: string;
  viewer: { myLiveBidId: string | null };
}
interface BidLite {
  id: string;
  blockId: string;
  status: string;
  rate: string;
  headCount: number;
  normalised: { estimatedTotalCents: number; headDays: number; costPerAcreCents: number; costPerHeadDayRate: string; overgrazes: boolean };
}

/** The day `n` days after a 'YYYY-MM-DD' day (the seed dates its market from the day it runs). */
const plusDays = (day: string, n: number) => new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

const login = (email: string) => api<{ token: string }>('/auth/login', { body: { email, password: PASSWORD } }).then((r) => r.token);

async function vineyardFor(token: string): Promise<BlockLite> {
  const list = await api<{ items: BlockLite[] }>('/blocks?view=market&pageSize=50', { token });
  const block = list.items.find((b) => b.name === VINEYARD);
  if (!block) throw new Error(`${VINEYARD} is not open in the seeded market`);
  return block;
}

const cents = (c: number) => `$${(c / 100).toLocaleString('en-US', { minimumFractionDigits: 2, maximumFractionDigits: 2 })}`;

describe('The grazier side of the market', () => {
  let b: Browser;
  let wade = '';
  afterEach(async () => {
    expect(b.offsite).toEqual([]);
    await b.close();
  });

  beforeAll(async () => {
    wade = await login(WADE);
    // A run against a server that kept an earlier run's bid starts from a clean slate on this block.
    const block = await vineyardFor(wade);
    if (block.viewer.myLiveBidId) await api(`/bids/${block.viewer.myLiveBidId}/withdraw`, { method: 'POST', token: wade });
  });

  test('At 390 × 844: find grazing, narrow by distance, open a seeded block, read its cautions and capacity, and bid', async () => {
    b = await openBrowser(PHONE);
    const { page } = b;
    const block = await vineyardFor(wade);

    await signIn(page, WADE, PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    const card = page.getByRole('link', { name: new RegExp(`^${VINEYARD}`) }).filter({ visible: true });
    await card.waitFor();
    // The card says how long the block feeds my 600 head, rounded down, as the API computed it.
    await card.getByText(`Feeds your 600 head for ${Math.floor(block.daysForMyFlock!)} days`).waitFor();
    await card.getByText('Copper sprays: a risk for sheep', { exact: false }).waitFor();
    await screenshot(page, 'market-list-390');

    // A distance filter nearer than the vineyard hides it; clearing the filter brings it back.
    await button(page, 'Filters').click();
    await field(page, 'Within').fill(String(Math.floor(block.distanceMiles!)));
    await page.getByTestId('market-count').filter({ hasText: 'match' }).waitFor();
    await card.waitFor({ state: 'hidden' });
    await screenshot(page, 'market-filtered-390');
    await button(page, 'Clear the filter').first().click();
    await card.waitFor();

    await card.click();
    await page.getByRole('heading', { name: VINEYARD }).waitFor();
    await page.getByText('Copper sprays: a risk for sheep').filter({ visible: true }).waitFor();
    await page.getByText('Food safety before harvest').filter({ visible: true }).waitFor();
    await expect(page.getByTestId('flock-days').filter({ visible: true }).textContent()).resolves.toBe(`${Math.floor(block.daysForMyFlock!)} days`);
    await expect(page.getByTestId('flock-head-days').filter({ visible: true }).textContent()).resolves.toBe(Math.floor(block.capacity!).toLocaleString('en-US'));
    await expect(page.getByTestId('block-distance').filter({ visible: true }).textContent()).resolves.toContain(
      `${block.distanceMiles!.toLocaleString('en-US', { maximumFractionDigits: 1 })} miles`,
    );
    await screenshot(page, 'market-block-390');

    await button(page, 'Bid on this block').click();
    await page.getByRole('heading', { name: 'Bid on this block' }).waitFor();
    // Filled in from the flock profile.
    await expect(field(page, 'Head count').inputValue()).resolves.toBe('600');
    await expect(field(page, 'Typical body weight').inputValue()).resolves.toBe('150');

    await field(page, 'Rate').fill('0.2');
    // Out after the out-by date: the block's rule shows beside the field, in the server's words.
    const start = plusDays(block.grazeFrom, 2);
    await field(page, 'Start date').fill(start);
    await field(page, 'End date').fill(plusDays(block.grazeUntil, 5));
    await field(page, 'End date').blur();
    await page.getByText(/End date must be on or before the animals-out-by date/).filter({ visible: true }).waitFor();

    // 21 days for 600 head is more than the block's target take: a clear warning.
    await field(page, 'End date').fill(plusDays(start, 21));
    await page.getByTestId('overgraze-warning').filter({ visible: true }).waitFor();
    await screenshot(page, 'market-bid-overgraze-390');

    // 10 days: within the target; 600 × 10 head-days × $0.20 = $1,200.00.
    await field(page, 'End date').fill(plusDays(start, 10));
    await page.getByTestId('overgraze-warning').waitFor({ state: 'detached' });
    await expect(page.getByTestId('preview-head-days').filter({ visible: true }).textContent()).resolves.toBe('6,000');
    await expect(page.getByTestId('preview-total').filter({ visible: true }).textContent()).resolves.toBe('$1,200.00');
    await page.getByRole('button', { name: 'guardian dogs' }).filter({ visible: true }).click();
    await screenshot(page, 'market-bid-390');
    await button(page, 'Place bid').click();

    await page.getByRole('heading', { name: 'My bids' }).waitFor();
    // What the server stored and computed is what the form previewed.
    const mine = await api<{ items: BidLite[] }>('/bids', { token: wade });
    const bid = mine.items.find((x) => x.blockId === block.id && x.status === 'live');
    expect(bid).toMatchObject({ rate: '0.20', headCount: 600, normalised: { estimatedTotalCents: 120_000, headDays: 6000, overgrazes: false } });
    const listed = page.getByTestId(`my-bid-${bid!.id}`).filter({ visible: true });
    await listed.getByText(`${VINEYARD} →`).waitFor();
    await listed.getByText('Live — the grower can award it').waitFor();
    await screenshot(page, 'market-my-bids-390');
  });

  test('At 1280 px: filters beside the results, the block with my bid, and changing then withdrawing the bid', async () => {
    b = await openBrowser(WIDE);
    const { page } = b;
    await signIn(page, WADE, PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    const card = page.getByRole('link', { name: new RegExp(`^${VINEYARD}`) }).filter({ visible: true });
    await card.waitFor();
    const filters = await page.getByText('Filters', { exact: true }).filter({ visible: true }).boundingBox();
    const count = await page.getByTestId('market-count').filter({ visible: true }).boundingBox();
    // The filters sit in a column to the left of the results, both starting near the top.
    expect(filters!.x + 300).toBeLessThan(count!.x);
    expect(Math.abs(filters!.y - count!.y)).toBeLessThan(200);
    await screenshot(page, 'market-list-1280');

    await card.click();
    await page.getByRole('heading', { name: VINEYARD }).waitFor();
    await page.getByTestId('my-live-bid').filter({ visible: true }).waitFor();
    await screenshot(page, 'market-block-1280');

    await button(page, 'Edit my bid').click();
    await page.getByRole('heading', { name: 'Change my bid' }).waitFor();
    await expect(field(page, 'Rate').inputValue()).resolves.toBe('0.20');
    await field(page, 'Head count').fill('500');
    await expect(page.getByTestId('preview-total').filter({ visible: true }).textContent()).resolves.toBe('$1,000.00');
    await screenshot(page, 'market-bid-1280');
    await button(page, 'Save my bid').click();
    await page.getByRole('heading', { name: 'My bids' }).waitFor();
    await page.getByText('500 dry ewes', { exact: false }).filter({ visible: true }).first().waitFor();

    await page.getByText('Change or withdraw this bid →').filter({ visible: true }).first().click();
    await page.getByRole('heading', { name: 'Change my bid' }).waitFor();
    await button(page, 'Withdraw my bid').click();
    await button(page, 'Withdraw bid').click();
    await page.getByRole('heading', { name: 'My bids' }).waitFor();
    await page.getByRole('heading', { name: /^Withdrawn/ }).waitFor();
    await screenshot(page, 'market-my-bids-1280');
  });

  test('A contract from an awarded bid reads the same terms for the grazier, awaiting signatures', async () => {
    // A grower of our own, so the seeded market stays as it is for the other suites.
    const stamp = Date.now().toString(36);
    const grower = await api<{ token: string }>('/auth/register', {
      body: { email: `ines-${stamp}@orchard.example`, password: 'a-long-orchard-password', name: 'Ines Varga', roles: ['grower'] },
    });
    const name = `Plum middles ${stamp}`;
    const { block } = await api<{ block: { id: string } }>('/blocks', {
      token: grower.token,
      body: {
        name,
        crop: 'orchard',
        acres: 25,
        placeName: 'Calder Valley, south road',
        latitude: 39.69,
        longitude: -121.95,
        forageMethod: 'direct',
        lbDmPerAcre: 2000,
        targetUtilizationPct: 45,
        windowStart: '2027-01-10',
        windowEnd: '2027-02-20',
        outBy: '2027-02-15',
        harvestDate: '2027-08-01',
        sprayRecords: [],
        waterOnSite: true,
        perimeterFence: 'full',
        truckAccess: true,
        speciesAllowed: ['sheep'],
        youngPlantings: false,
      },
    });
    await api(`/blocks/${block.id}/publish`, { method: 'POST', token: grower.token });
    const { bid } = await api<{ bid: BidLite }>(`/blocks/${block.id}/bids`, {
      token: wade,
      body: { basis: 'acre', rate: '30', headCount: 400, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: '2027-01-12', endDate: '2027-01-20', services: ['fencing'] },
    });
    const { contract } = await api<{ contract: { id: string } }>(`/bids/${bid.id}/award`, { method: 'POST', token: grower.token });

    b = await openBrowser(PHONE);
    const { page } = b;
    await signIn(page, WADE, PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    await page.getByRole('tab', { name: 'Contracts' }).click();
    const item = page.getByRole('link', { name: `Contract for ${name}` }).filter({ visible: true });
    await item.getByText('Awaiting signatures').waitFor();
    await screenshot(page, 'market-contracts-390');
    await item.click();
    await page.waitForURL(`**/contracts/${contract.id}`);
    await page.getByRole('heading', { name: `Contract · ${name}` }).waitFor();
    // 25 acres × $30 = $750.00, the same normalised figure the grower compared.
    await expect(page.getByTestId('contract-total').filter({ visible: true }).textContent()).resolves.toBe(cents(bid.normalised.estimatedTotalCents));
    expect(bid.normalised.estimatedTotalCents).toBe(75_000);
    await expect(page.getByTestId('contract-rate').filter({ visible: true }).textContent()).resolves.toBe('$30.00 per acre');
    const grazierSide = page.getByTestId('signature-grazier').filter({ visible: true });
    await grazierSide.getByText('Grazier — you').waitFor();
    await grazierSide.getByText('Kellner Range Sheep (Wade Kellner)').waitFor();
    await screenshot(page, 'market-contract-390');

    await page.setViewportSize(WIDE);
    const grazierSideWide = page.getByTestId('signature-grazier').filter({ visible: true });
    await grazierSideWide.getByText('Grazier — you').waitFor();
    await grazierSideWide.getByText('Kellner Range Sheep (Wade Kellner)').waitFor();
    await screenshot(page, 'market-contract-1280');
  });
});
