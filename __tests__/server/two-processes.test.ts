import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sharp from 'sharp';
import Stripe from 'stripe';
import type { DataSource } from 'typeorm';
import { createDataSource } from '../../server/db/data-source';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { addDays, todayIn } from '../../lib/day-keys';
import { blockBody, bidBody } from '../helpers/market';
import { buildServerIfStale, freePort, startPaymentsFakeProcess, startServerProcess, type RunningProcess } from '../helpers/server-processes';
import { freshTestDatabase, onPostgres, rawQuery, type TestDatabase } from '../helpers/test-database';

// Two real server processes (the built server) on two ports, one database — PostgreSQL in npm test's PostgreSQL
// pass, one SQLite file otherwise — one DATA_DIR and one payments fake. Whatever one process promises once must
// hold when the same requests are spread over both: the database keeps the promise, not the process.

const ZONE = 'America/Los_Angeles';
let dataDir: string;
let db: TestDatabase | null = null;
let ds: DataSource;
let a: RunningProcess;
let b: RunningProcess;
let fake: RunningProcess;
let stripe: Stripe;

beforeAll(async () => {
  buildServerIfStale();
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-two-'));
  const env: Record<string, string> = { DATA_DIR: dataDir };
  if (onPostgres) {
    db = await freshTestDatabase();
    env.DATABASE_URL = db.target;
  }
  const [portA, portB, fakePort, nobody] = [await freePort(), await freePort(), await freePort(), await freePort()];
  // The fake's own deliveries go to a port nobody listens on: the test delivers the event itself, to both at once.
  fake = await startPaymentsFakeProcess(fakePort, dataDir, `http://127.0.0.1:${nobody}/api/webhooks/payments`);
  env.PAYMENTS_FAKE_PORT = String(fakePort);
  // The first migrates; the second starts on the schema it made (npm start does the same).
  a = await startServerProcess(portA, env);
  b = await startServerProcess(portB, env);
  ds = createDataSource(db ? db.target : path.join(dataDir, 'fieldfold.sqlite'));
  await ds.initialize();
  stripe = new Stripe('sk_test_fieldfold_local_fake', { host: '127.0.0.1', port: fakePort, protocol: 'http' });
}, 180_000);

afterAll(async () => {
  // What the servers logged, for a failure's story (nothing on a clean run but their start-up lines).
  if (process.env.TWO_PROCESSES_LOG) for (const p of [a, b]) console.log(p?.output());
  await Promise.all([a?.stop(), b?.stop(), fake?.stop()]);
  await ds?.destroy();
  await db?.drop();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

interface Answer {
  status: number;
  body: any;
}

async function call(p: RunningProcess, method: string, url: string, token?: string, body?: unknown): Promise<Answer> {
  const res = await fetch(`${p.url}${url}`, {
    method,
    headers: { ...(token ? { Authorization: `Bearer ${token}` } : {}), ...(body !== undefined ? { 'Content-Type': 'application/json' } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null };
}

async function ok(p: RunningProcess, method: string, url: string, token: string | undefined, body: unknown, expected: number): Promise<any> {
  const r = await call(p, method, url, token, body);
  if (r.status !== expected) throw new Error(`${method} ${url} on ${p.url}: ${r.status} ${JSON.stringify(r.body)}`);
  return r.body;
}

let people = 0;
async function signUp(p: RunningProcess, roles: string[], name: string): Promise<{ token: string; id: string; name: string }> {
  people += 1;
  const body = await ok(p, 'POST', '/api/auth/register', undefined, { email: `two-${people}-${Date.now()}@test.example`, password: 'long-enough-password', name, roles }, 201);
  return { token: body.token, id: body.user.id, name };
}

// Dates round today at the block, so the log may take an entry now.
const today = todayIn(ZONE, Date.now());
const stay = { startDate: today, endDate: addDays(today, 10) };
const window = { windowStart: today, windowEnd: addDays(today, 60), outBy: addDays(today, 55), harvestDate: addDays(today, 200) };

let grower: { token: string; id: string; name: string };
let contractId: string;
let grazierOfContract: { token: string; id: string; name: string };

describe('two server processes on one database', () => {
  it('When a person signs up on one process, then the other accepts their token, and a photo stored by one is served by the other', async () => {
    grower = await signUp(a, ['grower'], 'Greta Olsen');
    expect((await call(b, 'GET', '/api/me', grower.token)).body.user.id).toBe(grower.id);
    const { block } = await ok(b, 'POST', '/api/blocks', grower.token, blockBody({ ...window, timeZone: ZONE }), 201);
    const png = await sharp({ create: { width: 16, height: 12, channels: 3, background: '#5a7d3a' } }).png().toBuffer();
    const form = new FormData();
    form.append('photo', new Blob([new Uint8Array(png)], { type: 'image/png' }), 'orchard.png');
    const up = await fetch(`${a.url}/api/blocks/${block.id}/photos`, { method: 'POST', headers: { Authorization: `Bearer ${grower.token}` }, body: form });
    expect(up.status).toBe(201);
    const photo = ((await up.json()) as { photo: { id: string } }).photo;
    const onB = await fetch(`${b.url}/api/blocks/${block.id}/photos/${photo.id}`, { headers: { Authorization: `Bearer ${grower.token}` } });
    expect(onB.status).toBe(200);
    expect(onB.headers.get('content-type')).toMatch(/^image\//);
    // Signing out on B ends the session for A too (sessions are rows, not process memory).
    const other = await ok(a, 'POST', '/api/auth/login', undefined, { email: (await call(a, 'GET', '/api/me', grower.token)).body.user.email, password: 'long-enough-password' }, 200);
    await ok(b, 'POST', '/api/auth/logout', other.token, undefined, 204);
    expect((await call(a, 'GET', '/api/me', other.token)).status).toBe(401);
  }, 60_000);

  it('When 50 awards of one block\'s ten bids arrive spread over both processes at once, then exactly one succeeds and one contract exists', async () => {
    const { block } = await ok(a, 'POST', '/api/blocks', grower.token, blockBody({ ...window, timeZone: ZONE, name: 'Raced walnut block' }), 201);
    await ok(b, 'POST', `/api/blocks/${block.id}/publish`, grower.token, undefined, 200);
    const graziers = [];
    const bids: string[] = [];
    for (let i = 0; i < 10; i++) {
      const p = i % 2 ? b : a;
      const g = await signUp(p, ['grazier'], `Grazier ${i}`);
      await ok(p, 'PATCH', '/api/me', g.token, { homePlace: 'Pine Hollow corrals', homeLatitude: 39.801, homeLongitude: -121.876, flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 } }, 200);
      bids.push((await ok(p, 'POST', `/api/blocks/${block.id}/bids`, g.token, bidBody(stay), 201)).bid.id);
      graziers.push(g);
    }
    const answers = await Promise.all(Array.from({ length: 50 }, (_, i) => call(i % 2 ? b : a, 'POST', `/api/bids/${bids[i % 10]}/award`, grower.token)));
    expect(answers.filter((r) => r.status !== 201 && r.status !== 409)).toEqual([]);
    const statuses = answers.map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(49);
    const won = answers.find((r) => r.status === 201)!.body.contract;
    expect(await ds.getRepository(Contract).countBy({ blockId: block.id })).toBe(1);
    const accepted = await rawQuery<{ n: number | string }>(ds, `SELECT COUNT(*) AS n FROM bids WHERE block_id = :id AND status = 'accepted'`, { id: block.id });
    expect(Number(accepted[0].n)).toBe(1);
    const declined = await rawQuery<{ n: number | string }>(ds, `SELECT COUNT(*) AS n FROM bids WHERE block_id = :id AND status = 'declined'`, { id: block.id });
    expect(Number(declined[0].n)).toBe(9);
    contractId = won.id;
    const winner = await ds.getRepository(Contract).findOneByOrFail({ id: contractId });
    grazierOfContract = graziers.find((g) => g.id === winner.grazierId)!;
  }, 120_000);

  it('When the phone sends one log entry 50 times spread over both processes at once, then it is stored once and every answer names that entry', async () => {
    for (const [who, p] of [[grower, a], [grazierOfContract, b]] as const) {
      const c = (await ok(p, 'GET', `/api/contracts/${contractId}`, who.token, undefined, 200)).contract;
      await ok(p, 'POST', `/api/contracts/${contractId}/sign`, who.token, { typedName: who.name, cautionsAcknowledged: true, termsHash: c.termsHash }, 200);
    }
    const entry = { clientId: `phone-${Date.now()}`, kind: 'observation', at: new Date().toISOString(), note: 'Trough full, fence hot' };
    const answers = await Promise.all(Array.from({ length: 50 }, (_, i) => call(i % 2 ? b : a, 'POST', `/api/contracts/${contractId}/log`, grazierOfContract.token, entry)));
    expect(answers.filter((r) => r.status !== 201 && r.status !== 200)).toEqual([]);
    const statuses = answers.map((r) => r.status);
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 200)).toHaveLength(49);
    expect(new Set(answers.map((r) => r.body.entry.id)).size).toBe(1);
    const rows = await rawQuery<{ n: number | string }>(ds, 'SELECT COUNT(*) AS n FROM contract_log_entries WHERE contract_id = :id AND client_id = :clientId', { id: contractId, clientId: entry.clientId });
    expect(Number(rows[0].n)).toBe(1);
  }, 120_000);

  it('When one payments event is delivered to both processes at once, then it is applied once: one stored event, one paid invoice, one set of receipts', async () => {
    // The sign-off is another module's flow; an invoice needs only its outcome (as in helpers/invoicing.ts).
    await ds.getRepository(Contract).update({ id: contractId }, { status: 'agreed', agreedHeadDays: 6000 });
    const invoice = (await ok(b, 'POST', `/api/contracts/${contractId}/invoice`, grazierOfContract.token, {}, 201)).invoice;
    expect(invoice.status).toBe('sent');
    const [row] = await rawQuery<{ provider_invoice_id: string }>(ds, 'SELECT provider_invoice_id FROM invoices WHERE id = :id', { id: invoice.id });
    // The grower pays outside Fieldfold (the API's own page, a bank transfer marked paid): the API tells by event.
    await stripe.invoices.pay(row.provider_invoice_id, { paid_out_of_band: true });
    const event = (await stripe.events.list({ type: 'invoice.paid' })).data.find((e) => (e.data.object as { id: string }).id === row.provider_invoice_id)!;
    const payload = JSON.stringify(event, null, 2);
    const secret = fs.readFileSync(path.join(dataDir, 'payments-webhook-secret'), 'utf8').trim();
    const deliver = (p: RunningProcess) =>
      fetch(`${p.url}/api/webhooks/payments`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'Stripe-Signature': stripe.webhooks.generateTestHeaderString({ payload, secret }) },
        body: payload,
      }).then(async (r) => ({ status: r.status, body: (await r.json()) as { outcome: string } }));
    const answers = await Promise.all([deliver(a), deliver(b), deliver(a), deliver(b)]);
    expect(answers.map((r) => r.status)).toEqual([200, 200, 200, 200]);
    expect(answers.map((r) => r.body.outcome).sort()).toEqual(['applied', 'duplicate', 'duplicate', 'duplicate']);
    const events = await rawQuery<{ n: number | string }>(ds, 'SELECT COUNT(*) AS n FROM payment_events WHERE id = :id', { id: event.id });
    expect(Number(events[0].n)).toBe(1);
    const [paid] = await rawQuery<{ status: string }>(ds, 'SELECT status FROM invoices WHERE id = :id', { id: invoice.id });
    expect(paid.status).toBe('paid');
    const receipts = await rawQuery<{ subject: string }>(ds, `SELECT subject FROM mail_outbox WHERE subject LIKE :receipt OR subject LIKE :paid`, { receipt: 'Receipt: invoice %', paid: 'Invoice % was paid%' });
    expect(receipts).toHaveLength(2);
  }, 120_000);
});
