import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createDataSource } from '../../server/db/data-source';
import { api, BASE_URL, PHONE, WIDE, openBrowser, screenshot, signIn, type Browser } from './browser';

// Invoicing and paying online, through the UI against the real server and the payments fake (both started by
// scripts/test.mjs, sharing one DATA_DIR): the grazier invoices an agreed contract, the grower tries the test
// card without funds and reads why it failed, then pays with the test card that pays and gets a receipt.

const PASSWORD = 'calder-valley-demo';
const DATA_DIR = process.env.E2E_DATA_DIR;
const BLOCK = `Oxbow walnut middles ${Date.now().toString(36)}`;

async function login(email: string) {
  return (await api<{ token: string }>('/auth/login', { body: { email, password: PASSWORD } })).token;
}

/**
 * A contract awarded through the API and moved to an agreed sign-off directly in the database (the sign-off flow
 * belongs to the contracts screens; an invoice needs only its outcome): 9 600 head-days at $0.18.
 */
async function agreedContract(): Promise<string> {
  if (!DATA_DIR) throw new Error('E2E_DATA_DIR is not set: run this suite through npm test');
  const greta = await login('greta@calder.example');
  const wade = await login('wade@calder.example');
  const { block } = await api<{ block: { id: string } }>('/blocks', {
    token: greta,
    body: {
      name: BLOCK,
      crop: 'orchard',
      acres: 64,
      placeName: 'Calder Valley, oxbow road',
      latitude: 39.71,
      longitude: -121.93,
      forageMethod: 'direct',
      lbDmPerAcre: 2100,
      targetUtilizationPct: 45,
      windowStart: '2027-01-04',
      windowEnd: '2027-03-05',
      outBy: '2027-03-01',
      sprayRecords: [],
      waterOnSite: true,
      perimeterFence: 'partial',
      truckAccess: true,
      speciesAllowed: ['sheep'],
      youngPlantings: false,
    },
  });
  await api(`/blocks/${block.id}/publish`, { token: greta, method: 'POST' });
  const { bid } = await api<{ bid: { id: string } }>(`/blocks/${block.id}/bids`, {
    token: wade,
    body: { basis: 'head-day', rate: '0.18', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: '2027-01-10', endDate: '2027-01-26', services: ['fencing'] },
  });
  const { contract } = await api<{ contract: { id: string } }>(`/bids/${bid.id}/award`, { token: greta, method: 'POST' });
  // The server's own data source on its database file (WAL: the running server keeps serving meanwhile).
  const ds = createDataSource(path.join(DATA_DIR, 'fieldfold.sqlite'));
  await ds.initialize();
  await ds.query(`UPDATE contracts SET status = 'agreed', agreed_head_days = 9600 WHERE id = ?`, [contract.id]);
  await ds.destroy();
  return contract.id;
}

describe('Invoicing an agreed contract and paying it online', () => {
  let b: Browser;
  let contractId = '';
  let invoiceId = '';
  afterAll(async () => {
    await b?.close();
  });

  test('At 390 px the grazier invoices the agreed head-days from the Invoices tab', async () => {
    contractId = await agreedContract();
    b = await openBrowser(PHONE);
    const { page } = b;
    await signIn(page, 'wade@calder.example', PASSWORD);
    await page.getByRole('heading', { name: 'Find grazing' }).waitFor();
    await page.goto(`${BASE_URL}/invoices`);
    const ready = page.getByTestId(`ready-${contractId}`);
    // 9 600 head-days × $0.18 = $1,728.00
    await ready.getByText('9,600 head-days agreed at sign-off · invoice total $1,728.00').waitFor();
    await ready.getByRole('radio', { name: '30 days' }).click();
    await ready.getByRole('button', { name: 'Create invoice' }).click();
    await page.waitForURL('**/invoices/*');
    invoiceId = page.url().split('/invoices/')[1];
    await page.getByTestId('invoice-status').filter({ visible: true }).filter({ hasText: 'Sent — awaiting payment' }).waitFor();
    await page.getByTestId('invoice-total').filter({ visible: true }).filter({ hasText: '$1,728.00' }).waitFor();
    await page.getByText('Grazing: 9,600 head-days × $0.18 per head-day').filter({ visible: true }).waitFor();
    await screenshot(page, 'invoice-grazier-390');
    expect(b.offsite).toEqual([]);
  });

  test('At 1280 px the grower tries the test card without funds, reads why it failed, and the invoice stays unpaid', async () => {
    const { page } = b;
    await page.goto(`${BASE_URL}/account`);
    await page.getByTestId('sign-out').filter({ visible: true }).click();
    await page.waitForURL('**/sign-in');
    await page.setViewportSize(WIDE);
    await signIn(page, 'greta@calder.example', PASSWORD);
    await page.getByRole('heading', { name: 'My blocks' }).waitFor();
    await page.goto(`${BASE_URL}/invoices/${invoiceId}`);
    const panel = page.getByTestId('pay-panel').filter({ visible: true });
    await panel.waitFor();
    await screenshot(page, 'invoice-grower-1280');
    await panel.getByRole('radio', { name: 'Test card without enough funds' }).click();
    await panel.getByRole('button', { name: 'Pay $1,728.00' }).click();
    await panel.getByText('Payment declined').waitFor();
    await panel.getByText('The card was declined because it does not have enough funds. Try another card, or pay once funds are available.').waitFor();
    await page.getByTestId('invoice-status').filter({ visible: true }).filter({ hasText: 'Sent — awaiting payment' }).waitFor();
    await screenshot(page, 'invoice-declined-1280');
  });

  test('At 1280 px the grower pays with the test card that pays and sees "Paid" and the receipt; at 390 px too', async () => {
    const { page } = b;
    const panel = page.getByTestId('pay-panel').filter({ visible: true });
    await panel.getByRole('radio', { name: 'Test card that pays' }).click();
    await panel.getByRole('button', { name: 'Pay $1,728.00' }).click();
    await page.getByTestId('invoice-status').filter({ visible: true }).filter({ hasText: 'Paid' }).waitFor();
    const receipt = page.getByTestId('receipt').filter({ visible: true });
    await receipt.getByText('$1,728.00 paid').waitFor();
    await receipt.getByText('Paid with: Test card that pays (Visa ending 4242, for testing)').waitFor();
    await screenshot(page, 'receipt-1280');
    await page.setViewportSize(PHONE);
    await page.reload();
    await page.getByTestId('receipt').filter({ visible: true }).waitFor();
    await screenshot(page, 'receipt-390');

    // The money view: the grower's payables, cards on a phone and a table from 1024 px.
    await page.goto(`${BASE_URL}/invoices`);
    await page.getByTestId(`invoice-card-${invoiceId}`).filter({ visible: true }).waitFor();
    await screenshot(page, 'payables-390');
    await page.setViewportSize(WIDE);
    await page.getByTestId(`invoice-row-${invoiceId}`).filter({ visible: true }).waitFor();
    await screenshot(page, 'payables-1280');
    expect(b.offsite).toEqual([]);
  });

  test('The invoice PDF both parties download holds the lines and the total (pdftotext)', async () => {
    const greta = await login('greta@calder.example');
    const res = await fetch(`${BASE_URL}/api/invoices/${invoiceId}/pdf`, { headers: { Authorization: `Bearer ${greta}` } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('application/pdf');
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-invoice-')), 'invoice.pdf');
    fs.writeFileSync(file, Buffer.from(await res.arrayBuffer()));
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    expect(text).toContain('Kellner Range Sheep');
    expect(text).toMatch(/Grazing \(head-days\)\s+9,600 head-days\s+\$0\.18\s+\$1,728\.00/);
    // Paid by now: the newest version is stamped so.
    expect(text).toMatch(/Total \(paid\)\s+\$1,728\.00/);
    expect(text).toContain('PAID');
    const wade = await login('wade@calder.example');
    const byGrazier = await fetch(`${BASE_URL}/api/invoices/${invoiceId}/pdf`, { headers: { Authorization: `Bearer ${wade}` } });
    expect(byGrazier.status).toBe(200);
    // The same newest version for both parties.
    expect(byGrazier.headers.get('etag')).toBe(res.headers.get('etag'));
    await byGrazier.arrayBuffer();
  });
});
