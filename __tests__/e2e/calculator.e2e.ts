import { BASE_URL, PHONE, WIDE, field, openBrowser, screenshot, type Browser } from './browser';

const digits = (s: string | null) => Number((s ?? '').replace(/[^0-9.]/g, ''));

async function api(path: string, body: unknown): Promise<Record<string, number>> {
  const res = await fetch(`${BASE_URL}/api/calc/${path}`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify(body) });
  expect(res.status).toBe(200);
  return (await res.json()) as Record<string, number>;
}

describe('The public forage calculator', () => {
  let b: Browser;
  afterEach(async () => {
    expect(b.offsite).toEqual([]);
    await b.close();
  });

  test('Signed out at 390 px: typing updates the figures, and they equal the API for the same inputs', async () => {
    b = await openBrowser(PHONE);
    const { page } = b;
    await page.goto(`${BASE_URL}/calculator`);
    await page.getByRole('heading', { name: 'Forage calculator' }).waitFor();

    // The invented example's clipped samples equal POST /api/calc/forage.
    const forage = await api('forage', {
      frameAreaM2: 0.25,
      samples: [
        { freshGrams: 310, dryMatterPct: 20 },
        { freshGrams: 260, dryMatterPct: 20 },
        { freshGrams: 345, dryMatterPct: 20 },
      ],
    });
    expect(digits(await page.getByTestId('calc-lb-per-acre').textContent())).toBe(Math.round(forage.lbDmPerAcre));

    await page.getByRole('radio', { name: 'I know it' }).click();
    await field(page, 'Standing forage').fill('1850');
    await field(page, 'Block size').fill('72.5');
    await field(page, 'Take (utilisation)').fill('40');
    await field(page, 'Head').fill('640');
    await field(page, 'Body weight').fill('145');
    await field(page, 'Intake').fill('2.5');

    const cap = await api('capacity', { acres: 72.5, lbDmPerAcre: 1850, utilizationPct: 40, animal: { bodyWeightLb: 145, intakePctBodyWeight: 2.5 } });
    const headDays = page.getByTestId('calc-head-days');
    for (let i = 0; i < 50 && digits(await headDays.textContent()) !== Math.floor(cap.headDays); i++) await page.waitForTimeout(100);
    expect(digits(await headDays.textContent())).toBe(Math.floor(cap.headDays));
    expect(digits(await page.getByTestId('calc-standing').textContent())).toBe(Math.round(cap.standingLb));
    expect(digits(await page.getByTestId('calc-allowable').textContent())).toBe(Math.round(cap.allowableLb));
    expect(digits(await page.getByTestId('calc-days').textContent())).toBe(Math.floor(cap.headDays / 640));
    expect(await page.getByTestId('calc-aum').textContent()).toBe(cap.aum.toLocaleString('en-US', { maximumFractionDigits: 2 }));
    await screenshot(page, 'calculator-390');

    // Bad input: the shared schema's message appears beside the field and the figures step aside.
    await field(page, 'Take (utilisation)').fill('130');
    await page.getByText('Utilisation must be at most 100 %').waitFor();
    await page.getByTestId('calc-incomplete').waitFor();
  });

  test('Signed out at 1280 px: inputs and results side by side, with the cautions', async () => {
    b = await openBrowser(WIDE);
    const { page } = b;
    await page.goto(`${BASE_URL}/calculator`);
    await page.getByText('Pesticide labels set when animals may graze').waitFor();
    await page.getByText('Copper sprays and sheep').waitFor();
    const inputs = await page.getByText('1 · Forage on the ground').boundingBox();
    const results = await page.getByText('What the block carries').boundingBox();
    expect(results!.x).toBeGreaterThan(inputs!.x + 300);
    await screenshot(page, 'calculator-1280');
  });
});
