import { execFileSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import type request from 'supertest';
import { makeInvoicingApp, WEBHOOK_SECRET } from '../helpers/invoicing';
import { chargeLines } from '../../lib/money';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { Invoice } from '../../server/modules/invoices/invoice.entity';
import { resumePendingInvoices } from '../../server/modules/invoices/invoice-sync';
import { TEST_NOW } from '../helpers/test-app';

// Invoices and paying online, through the API: supertest on createApp, a fresh migrated SQLite, and the payments
// fake in-process behind the real SDK adapter.

// Each test signs several people up (bcrypt) and drives the payments fake: more than jest's 5 s on a busy machine.
jest.setTimeout(30_000);

type App = Awaited<ReturnType<typeof makeInvoicingApp>>;
let t: App;

afterEach(async () => {
  await t?.close();
});

async function invoiced(app: App, opts: Parameters<App['agreedContract']>[0] = {}) {
  const c = await app.agreedContract(opts);
  const res = await app.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
  if (res.status !== 201) throw new Error(`invoice failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { ...c, invoice: res.body.invoice };
}

describe('POST /api/contracts/:id/invoice', () => {
  beforeEach(async () => {
    t = await makeInvoicingApp();
  });

  test('When the grazier invoices an agreed sign-off, then the lines and totals are lib’s chargeLines for the agreed head-days, and the invoice is sent', async () => {
    const { invoice, contractId } = await invoiced(t, { headDays: 10_837.5 });
    const expected = chargeLines({ basis: 'head-day', quantity: 10_837.5, rate: '0.18' });
    expect(invoice.totalCents).toBe(expected.totalCents);
    expect(invoice.subtotalCents).toBe(expected.subtotalCents);
    expect(invoice.lines.map((l: { amountCents: number }) => l.amountCents)).toEqual(expected.lines.map((l) => l.amountCents));
    expect(invoice.lines[0].description).toBe('Grazing: 10,837.5 head-days × $0.18 per head-day');
    expect(invoice).toMatchObject({ status: 'sent', displayStatus: 'sent', number: 1, numberLabel: 'WG-0001', issueDate: '2026-12-01', dueDate: '2026-12-15', paymentTermsDays: 14 });
    expect(invoice.servicesIncluded).toEqual(['fencing', 'guardian dogs']);
    expect(invoice.payment).toEqual({ ready: true, inProgress: false, lastFailure: null });
    expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: contractId })).status).toBe('invoiced');

    // The payments API holds the same amount, finalised, with the contract-derived key's one copy.
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    const stripe = t.stripe;
    const remote = await stripe.invoices.retrieve(row.providerInvoiceId!);
    expect(remote).toMatchObject({ status: 'open', total: expected.totalCents, metadata: { fieldfold_invoice_id: invoice.id, fieldfold_contract_id: contractId, fieldfold_invoice_number: 'WG-0001' } });
    expect(remote.lines.data.map((l) => l.amount)).toEqual(expected.lines.map((l) => l.amountCents));

    // The grower is told once, with the amount and the due date.
    await t.deliverMail();
    const [sent] = t.mail.outbox.filter((m) => m.subject.startsWith('Invoice WG-0001'));
    expect(sent.subject).toBe('Invoice WG-0001 from Wade Grazier: $1,950.75 due Dec 15, 2026');
  });

  test('When the basis is per acre or flat, then the invoice bills the contracted acres, or the price once', async () => {
    const acre = await invoiced(t, { bid: { basis: 'acre', rate: '22.5' } });
    expect(acre.invoice.totalCents).toBe(chargeLines({ basis: 'acre', quantity: 80, rate: '22.5' }).totalCents);
    expect(acre.invoice.lines[0].description).toBe('Grazing: 80 acres × $22.50 per acre');
    const flat = await invoiced(t, { bid: { basis: 'flat', rate: '4200' } });
    expect(flat.invoice.totalCents).toBe(420_000);
    expect(flat.invoice.lines[0].description).toBe('Grazing: $4,200.00 for the job');
  });

  test('When a second invoice is asked for the same contract, then 409 names the first invoice', async () => {
    const { invoice, contractId, grazier } = await invoiced(t);
    const again = await t.api().post(`/api/contracts/${contractId}/invoice`).set(grazier.auth).send({});
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_invoiced');
    expect(again.body.error.message).toContain('WG-0001');
    expect(again.body.error.message).toContain(invoice.id);
    expect(again.headers.location).toBe(`/api/invoices/${invoice.id}`);
    expect(await t.dataSource.getRepository(Invoice).countBy({ contractId })).toBe(1);
  });

  test('When two requests invoice one contract at once (a double tap), then one invoice exists and the other request gets 409', async () => {
    const c = await t.agreedContract();
    const [a, b] = await Promise.all([0, 1].map(() => t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({})));
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    expect(await t.dataSource.getRepository(Invoice).countBy({ contractId: c.contractId })).toBe(1);
    const stripe = t.stripe;
    expect((await stripe.invoices.list()).data).toHaveLength(1);
  });

  test('When the grower, a stranger, or a contract not yet agreed is involved, then 403, 404 and 409', async () => {
    const c = await t.agreedContract();
    const byGrower = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grower.auth).send({});
    expect(byGrower.status).toBe(403);
    const stranger = await t.grazier('Someone Else');
    expect((await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(stranger.auth).send({})).status).toBe(404);
    await t.dataSource.getRepository(Contract).update({ id: c.contractId }, { status: 'grazing' });
    const early = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('not_agreed');
    const badTerms = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({ paymentTermsDays: 10 });
    expect(badTerms.status).toBe(400);
    expect(badTerms.body.error.fields.paymentTermsDays).toMatch(/0, 7, 14, 30/);
  });

  test('When two graziers invoice at once, then each gets consecutive numbers in their own sequence, without gaps or repeats', async () => {
    const wade = await t.grazier('Wade Kellner');
    const mirela = await t.grazier('Mirela Haas');
    const contracts = [];
    for (let i = 0; i < 3; i++) contracts.push(await t.agreedContract({ grazier: wade }));
    for (let i = 0; i < 2; i++) contracts.push(await t.agreedContract({ grazier: mirela }));
    const results = await Promise.all(contracts.map((c) => t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({})));
    expect(results.map((r) => r.status)).toEqual([201, 201, 201, 201, 201]);
    const numbers = (who: typeof wade) => results.filter((r) => r.body.invoice.grazier.id === who.user.id).map((r) => r.body.invoice.number).sort();
    expect(numbers(wade)).toEqual([1, 2, 3]);
    expect(numbers(mirela)).toEqual([1, 2]);
    expect(results.filter((r) => r.body.invoice.grazier.id === mirela.user.id).map((r) => r.body.invoice.numberLabel).sort()).toEqual(['MH-0001', 'MH-0002']);
  });
});

describe('POST /api/invoices/:id/pay', () => {
  beforeEach(async () => {
    t = await makeInvoicingApp();
  });

  test('When the grower pays with the test card that pays, then invoice and contract are paid, a receipt shows, and both parties get one receipt mail', async () => {
    const { invoice, contractId, grower, grazier } = await invoiced(t);
    const res = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(res.status).toBe(200);
    expect(res.body.invoice).toMatchObject({ status: 'paid', displayStatus: 'paid', payment: { ready: false, inProgress: false, lastFailure: null } });
    expect(res.body.invoice.receipt).toMatchObject({ amountCents: invoice.totalCents, paidDay: '2026-12-01', method: 'Test card that pays (Visa ending 4242, for testing)' });
    expect(res.body.invoice.receipt.reference).toMatch(/^[A-Z0-9]{8}-0001$/);
    expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: contractId })).status).toBe('paid');

    // The API's paid events arriving afterwards change nothing and mail nothing more.
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    for (const e of t.eventsFor(row.providerInvoiceId!)) expect((await t.deliver(e.id)).status).toBe(200);
    await t.deliverMail();
    expect(t.mail.to(grower.email).filter((m) => m.subject.startsWith('Receipt: invoice WG-0001 paid'))).toHaveLength(1);
    expect(t.mail.to(grazier.email).filter((m) => m.subject.startsWith('Invoice WG-0001 was paid'))).toHaveLength(1);
  });

  test.each([
    ['pm_card_chargeDeclined', 'generic_decline', 'The card was declined. The bank gave no reason; try another card or ask the bank.'],
    ['pm_card_chargeDeclinedInsufficientFunds', 'insufficient_funds', 'The card was declined because it does not have enough funds. Try another card, or pay once funds are available.'],
  ])('When the grower pays with %s, then 402 gives the reason in plain words and the invoice stays unpaid with it', async (pm, declineCode, words) => {
    const { invoice, grower, contractId } = await invoiced(t);
    const res = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: pm });
    expect(res.status).toBe(402);
    expect(res.body.error).toEqual({ code: 'payment_declined', message: words });
    const after = await t.api().get(`/api/invoices/${invoice.id}`).set(grower.auth);
    expect(after.body.invoice).toMatchObject({ status: 'sent', receipt: null, payment: { ready: true, inProgress: false, lastFailure: { code: 'card_declined', declineCode, message: words } } });
    expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: contractId })).status).toBe('invoiced');
    // A good card afterwards pays, and the old reason is gone.
    const paid = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(paid.body.invoice.status).toBe('paid');
    expect(paid.body.invoice.payment.lastFailure).toBeNull();
  });

  test('When a paid invoice is paid again, then 409 and nothing is charged', async () => {
    const { invoice, grower } = await invoiced(t);
    await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    const again = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_paid');
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    const stripe = t.stripe;
    expect((await stripe.invoices.retrieve(row.providerInvoiceId!, { expand: ['payments'] })).payments?.data).toHaveLength(1);
  });

  test('When the grazier voids an unpaid invoice, then it is void here and in the API and cannot be paid; a paid one cannot be voided', async () => {
    const { invoice, grazier, grower } = await invoiced(t);
    expect((await t.api().post(`/api/invoices/${invoice.id}/void`).set(grower.auth)).status).toBe(403);
    const voided = await t.api().post(`/api/invoices/${invoice.id}/void`).set(grazier.auth);
    expect(voided.status).toBe(200);
    expect(voided.body.invoice).toMatchObject({ status: 'void', displayStatus: 'void', payment: { ready: false } });
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    expect((await t.stripe.invoices.retrieve(row.providerInvoiceId!)).status).toBe('void');
    const pay = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(pay.status).toBe(409);
    expect(pay.body.error.code).toBe('invoice_void');

    const other = await invoiced(t, { grazier, grower });
    await t.api().post(`/api/invoices/${other.invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    const late = await t.api().post(`/api/invoices/${other.invoice.id}/void`).set(grazier.auth);
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe('already_paid');
  });

  test('When a grower tries to pay someone else’s invoice, then 404; the grazier of it gets 403; a made-up method 400', async () => {
    const { invoice, grazier, grower } = await invoiced(t);
    const otherGrower = await t.grower('Tomas Other');
    expect((await t.api().post(`/api/invoices/${invoice.id}/pay`).set(otherGrower.auth).send({ paymentMethod: 'pm_card_visa' })).status).toBe(404);
    expect((await t.api().get(`/api/invoices/${invoice.id}`).set(otherGrower.auth)).status).toBe(404);
    expect((await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grazier.auth).send({ paymentMethod: 'pm_card_visa' })).status).toBe(403);
    const bad = await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: '4242424242424242' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.paymentMethod).toMatch(/test payment methods/);
    expect((await t.api().get(`/api/invoices/${invoice.id}`).set(grower.auth)).body.invoice.status).toBe('sent');
  });
});

describe('a double tap on pay', () => {
  test('When the grower taps pay twice while the first is running, then one payment goes through and the second is told it is in progress', async () => {
    t = await makeInvoicingApp({ latencyMs: 200 });
    const { invoice, grower } = await invoiced(t);
    const [a, b] = await Promise.all([
      t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' }),
      new Promise((r) => setTimeout(r, 40)).then(() => t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' })),
    ]);
    expect(a.status).toBe(200);
    expect(b.status).toBe(409);
    expect(b.body.error.code).toBe('payment_in_progress');
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    const stripe = t.stripe;
    expect((await stripe.invoices.retrieve(row.providerInvoiceId!, { expand: ['payments'] })).payments?.data).toHaveLength(1);
  });
});

describe('POST /api/webhooks/payments', () => {
  beforeEach(async () => {
    t = await makeInvoicingApp();
  });

  test('When paid arrives before finalized (out of order), then the invoice ends paid, and each event applies once', async () => {
    const c = await t.agreedContract();
    // Finalise the invoice in the API but lose the answer: Fieldfold still has it as being issued.
    t.payments.faults = { finalize: 'lose-answer' };
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    t.payments.faults = {};
    expect(created.status).toBe(201);
    expect(created.body.invoice.status).toBe('draft');
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });

    // The grower pays in the API directly (say, on a hosted page); the events then arrive paid-first.
    const stripe = t.stripe;
    await stripe.invoices.pay(row.providerInvoiceId!, { payment_method: 'pm_card_visa' });
    const [finalized] = t.eventsFor(row.providerInvoiceId!, 'invoice.finalized');
    const [paid] = t.eventsFor(row.providerInvoiceId!, 'invoice.paid');
    const [succeeded] = t.eventsFor(row.providerInvoiceId!, 'invoice.payment_succeeded');

    expect((await t.deliver(paid.id)).body).toEqual({ received: true, outcome: 'applied' });
    expect((await t.deliver(paid.id)).body).toEqual({ received: true, outcome: 'duplicate' });
    expect((await t.deliver(finalized.id)).body).toEqual({ received: true, outcome: 'no-change' });
    expect((await t.deliver(succeeded.id)).body).toEqual({ received: true, outcome: 'no-change' });

    const after = await t.api().get(`/api/invoices/${row.id}`).set(c.grower.auth);
    expect(after.body.invoice).toMatchObject({ status: 'paid', receipt: { amountCents: row.totalCents, method: null } });
    expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: c.contractId })).status).toBe('paid');
    await t.deliverMail();
    expect(t.mail.to(c.grower.email).filter((m) => m.subject.startsWith('Receipt:'))).toHaveLength(1);
    // The late finalized event did not mail "invoice sent" after the receipt.
    expect(t.mail.to(c.grower.email).filter((m) => m.subject.startsWith('Invoice WG-0001 from'))).toHaveLength(0);
  });

  test('When the finalized event is what tells Fieldfold, and it comes twice, then the invoice is sent once and the grower mailed once', async () => {
    const c = await t.agreedContract();
    t.payments.faults = { finalize: 'lose-answer' };
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    t.payments.faults = {};
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });
    expect(row.status).toBe('draft');
    const [finalized] = t.eventsFor(row.providerInvoiceId!, 'invoice.finalized');
    const first = await t.deliver(finalized.id);
    const second = await t.deliver(finalized.id);
    expect([first.body.outcome, second.body.outcome]).toEqual(['applied', 'duplicate']);
    expect((await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: row.id })).status).toBe('sent');
    await t.deliverMail();
    expect(t.mail.to(c.grower.email).filter((m) => m.subject.startsWith('Invoice WG-0001 from'))).toHaveLength(1);
  });

  test('When the signature is wrong, the body altered, the header missing or the timestamp old, then 400 and nothing changes', async () => {
    const { invoice, grower } = await invoiced(t);
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: invoice.id });
    const stripe = t.stripe;
    await stripe.invoices.pay(row.providerInvoiceId!, { payment_method: 'pm_card_visa' });
    const [paid] = t.eventsFor(row.providerInvoiceId!, 'invoice.paid');
    const { payload } = t.fake.signedDelivery(paid.id);

    const forged = Stripe.webhooks.generateTestHeaderString({ payload, secret: 'whsec_not_the_right_secret_at_all' });
    const post = (body: string, signature?: string) => {
      const r = t.api().post('/api/webhooks/payments').set('Content-Type', 'application/json');
      return (signature ? r.set('Stripe-Signature', signature) : r).send(body);
    };
    const wrong = await post(payload, forged);
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe('bad_signature');
    const good = Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
    expect((await post(payload.replace('"paid"', '"open"'), good)).status).toBe(400);
    expect((await post(payload)).status).toBe(400);
    const old = await t.deliver(paid.id, Math.floor(Date.now() / 1000) - 600);
    expect(old.status).toBe(400);
    expect(old.body.error.message).toMatch(/tolerance/);

    expect((await t.api().get(`/api/invoices/${invoice.id}`).set(grower.auth)).body.invoice.status).toBe('sent');
    // Refused deliveries were not stored: the genuine one still applies.
    expect((await t.deliver(paid.id)).body.outcome).toBe('applied');
  });

  test('When an event names an invoice whose API id Fieldfold never recorded (a crash after the call), then the metadata leads back to it', async () => {
    t.payments.faults = { createDraftInvoice: 'lose-answer' };
    const c = await t.agreedContract();
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    t.payments.faults = {};
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });
    expect(row.providerInvoiceId).toBeNull();
    const [draftEvent] = t.fake.events().filter((e) => e.type === 'invoice.created');
    expect((await t.deliver(draftEvent.id)).body.outcome).toBe('ignored');
    const recorded = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: row.id });
    expect(recorded.providerInvoiceId).toBe((draftEvent.data.object as { id: string }).id);
  });
});

describe('recovery: the payments API down, or a crash between steps', () => {
  test('When the payments API is down at invoicing, then the invoice is kept as being issued and the next run sends it, making one invoice in the API', async () => {
    t = await makeInvoicingApp();
    const c = await t.agreedContract();
    t.payments.faults = { createCustomer: 'down' };
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    expect(created.status).toBe(201);
    expect(created.body.invoice.status).toBe('draft');
    expect(created.body.invoice.payment.ready).toBe(false);
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });
    expect(row.syncError).toMatch(/connection refused/);
    expect(row.syncNextAt).toBe(TEST_NOW + 10_000);

    // No PDF before the invoice is issued.
    const pdf = await t.api().get(`/api/invoices/${row.id}/pdf`).set(c.grazier.auth);
    expect(pdf.status).toBe(409);
    expect(pdf.body.error.code).toBe('not_issued');

    // Paying now is refused plainly (the service is still down), charging nothing.
    const early = await t.api().post(`/api/invoices/${row.id}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(early.status).toBe(503);
    expect(early.body.error.code).toBe('payments_unavailable');
    expect(early.headers['retry-after']).toBe('60');

    // That attempt counted: the next waits longer (10 s, then 60 s).
    const retried = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: row.id });
    expect(retried).toMatchObject({ syncAttempts: 2, syncNextAt: TEST_NOW + 60_000 });
    // Back up: the recovery run after the backoff sends it; a second run has nothing to do.
    t.payments.faults = {};
    expect(await resumePendingInvoices({ ...t.ctx, now: () => TEST_NOW + 30_000 })).toBe(0);
    const ctx = { ...t.ctx, now: () => TEST_NOW + 61_000 };
    expect(await resumePendingInvoices(ctx)).toBe(1);
    expect(await resumePendingInvoices(ctx)).toBe(0);
    expect((await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: row.id })).status).toBe('sent');
    expect((await t.stripe.invoices.list()).data).toHaveLength(1);
    expect((await t.stripe.customers.list()).data).toHaveLength(1);
  });

  test('When the process stops after the API made the draft but before its id was recorded, then the retry with the same keys finds it again', async () => {
    t = await makeInvoicingApp();
    t.payments.faults = { createDraftInvoice: 'lose-answer' };
    const c = await t.agreedContract();
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    t.payments.faults = {};
    expect(created.body.invoice.status).toBe('draft');
    const ctx = { ...t.ctx, now: () => TEST_NOW + 60_000 };
    await resumePendingInvoices(ctx);
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });
    expect(row.status).toBe('sent');
    const stripe = t.stripe;
    const all = await stripe.invoices.list();
    expect(all.data.map((i) => i.id)).toEqual([row.providerInvoiceId]);
    expect(all.data[0].lines.data).toHaveLength(1);
  });
});

function download(url: string, auth: Record<string, string>) {
  return t
    .api()
    .get(url)
    .set(auth)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
}

/** The PDF's text as pdftotext (poppler) reads it, keeping the layout. */
function pdfText(bytes: Buffer): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'invoice-pdf-')), 'invoice.pdf');
  fs.writeFileSync(file, bytes);
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

describe('GET /api/invoices and the PDF', () => {
  beforeEach(async () => {
    t = await makeInvoicingApp();
  });

  test('When the grazier lists receivables and the grower payables, then each sees their side with totals, overdue by the block’s calendar, paid this season', async () => {
    const wade = await t.grazier('Wade Kellner');
    const greta = await t.grower('Greta Olsen');
    const a = await invoiced(t, { grazier: wade, grower: greta, headDays: 1000 });
    const b = await invoiced(t, { grazier: wade, grower: greta, headDays: 2000 });
    await invoiced(t, { grazier: wade, headDays: 3000 });
    await t.api().post(`/api/invoices/${a.invoice.id}/pay`).set(greta.auth).send({ paymentMethod: 'pm_card_visa' });

    const receivable = await t.api().get('/api/invoices').set(wade.auth);
    expect(receivable.body.side).toBe('receivable');
    expect(receivable.body.items).toHaveLength(3);
    expect(receivable.body.totals).toEqual({
      outstandingCents: 36_000 + 54_000,
      outstandingCount: 2,
      overdueCents: 0,
      overdueCount: 0,
      paidThisSeasonCents: 18_000,
      paidThisSeasonCount: 1,
      season: '2026',
    });
    const payable = await t.api().get('/api/invoices?side=payable').set(greta.auth);
    expect(payable.body.items.map((i: { id: string }) => i.id).sort()).toEqual([a.invoice.id, b.invoice.id].sort());
    expect(payable.body.items.every((i: { viewerSide: string }) => i.viewerSide === 'payable')).toBe(true);
    // The list offers no PDF link (each is a token signed per invoice and viewer); the invoice's own page has it.
    expect(payable.body.items.every((i: { pdf: Record<string, unknown> }) => !('url' in i.pdf) && 'version' in i.pdf)).toBe(true);
    expect((await t.api().get(`/api/invoices/${a.invoice.id}`).set(greta.auth)).body.invoice.pdf.url).toMatch(/^\/api\/invoices\/.+\/pdf\?access=/);

    // Due Dec 15 at the block (America/Los_Angeles): still on time that day, overdue the day after.
    t.setNow('2026-12-15T23:30:00-08:00');
    expect((await t.api().get('/api/invoices?side=payable').set(greta.auth)).body.totals.overdueCount).toBe(0);
    t.setNow('2026-12-16T00:30:00-08:00');
    const late = await t.api().get('/api/invoices?side=payable').set(greta.auth);
    expect(late.body.totals).toMatchObject({ overdueCents: 36_000, overdueCount: 1 });
    expect(late.body.items.find((i: { id: string }) => i.id === b.invoice.id).displayStatus).toBe('overdue');
    expect((await t.api().get('/api/invoices?side=sideways').set(greta.auth)).status).toBe(400);
  });

  test('When the grower has more invoices than a page, then they come a page at a time in due order (date, number, id), with the totals and the count of every page; a cursor or limit the API did not give is a 400 naming it', async () => {
    const greta = await t.grower('Greta Olsen');
    const wade = await t.grazier('Wade Kellner');
    const mirela = await t.grazier('Mirela Haas');
    // Two graziers' sequences to one grower (their numbers collide: the id breaks the tie), due on three days.
    const made: Array<{ id: string; dueDate: string; number: number; totalCents: number }> = [];
    for (const [grazier, paymentTermsDays, headDays] of [
      [wade, 14, 1000],
      [mirela, 14, 2000],
      [wade, 0, 3000],
      [mirela, 30, 4000],
      [wade, 14, 5000],
      [mirela, 0, 6000],
    ] as const) {
      const c = await t.agreedContract({ grower: greta, grazier, headDays });
      const res = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(grazier.auth).send({ paymentTermsDays });
      expect(res.status).toBe(201);
      made.push(res.body.invoice);
    }
    await t.api().post(`/api/invoices/${made[1].id}/pay`).set(greta.auth).send({ paymentMethod: 'pm_card_visa' });
    const inOrder = [...made].sort((a, b) => (a.dueDate < b.dueDate ? -1 : a.dueDate > b.dueDate ? 1 : a.number - b.number || (a.id < b.id ? -1 : 1))).map((i) => i.id);

    const whole = await t.api().get('/api/invoices?limit=100').set(greta.auth);
    expect(whole.status).toBe(200);
    expect(whole.body.items.map((i: { id: string }) => i.id)).toEqual(inOrder);
    expect(whole.body).toMatchObject({ total: 6, nextCursor: null });

    const pages: string[][] = [];
    let cursor: string | null = null;
    do {
      const res: request.Response = await t.api().get(`/api/invoices?limit=4${cursor ? `&cursor=${cursor}` : ''}`).set(greta.auth);
      expect(res.status).toBe(200);
      expect(res.body.totals).toEqual(whole.body.totals);
      expect(res.body.total).toBe(6);
      pages.push(res.body.items.map((i: { id: string }) => i.id));
      cursor = res.body.nextCursor;
    } while (cursor);
    expect(pages.map((p) => p.length)).toEqual([4, 2]);
    expect(pages.flat()).toEqual(inOrder);
    // The totals count every page: five owed, one paid this season.
    expect(whole.body.totals).toMatchObject({ outstandingCount: 5, paidThisSeasonCount: 1, paidThisSeasonCents: made[1].totalCents });
    // The default page is 25: all six here.
    expect((await t.api().get('/api/invoices').set(greta.auth)).body.items).toHaveLength(6);

    const forged = await t.api().get(`/api/invoices?cursor=${Buffer.from('["x"]').toString('base64url')}`).set(greta.auth);
    expect(forged.status).toBe(400);
    expect(forged.body.error.fields).toHaveProperty('cursor');
    for (const limit of ['0', '101', 'ten']) {
      const bad = await t.api().get(`/api/invoices?limit=${limit}`).set(greta.auth);
      expect(bad.status).toBe(400);
      expect(bad.body.error.fields).toHaveProperty('limit');
    }
  });

  test('When either party downloads the PDF, then it is the stored file with its SHA-256 and its text holds the lines and the total; others get 404', async () => {
    const { invoice, grower, grazier } = await invoiced(t, { headDays: 10_800 });
    expect(invoice.pdf.sha256).toMatch(/^[0-9a-f]{64}$/);
    const byGrazier = await download(`/api/invoices/${invoice.id}/pdf`, grazier.auth);
    expect(byGrazier.status).toBe(200);
    expect(byGrazier.headers['content-type']).toBe('application/pdf');
    expect(byGrazier.headers['content-disposition']).toBe(`attachment; filename="fieldfold-invoice-${invoice.id.slice(0, 8)}-v1.pdf"`);
    expect(byGrazier.headers.etag).toBe(`"${invoice.pdf.sha256}"`);
    const bytes = byGrazier.body as Buffer;
    expect(crypto.createHash('sha256').update(bytes).digest('hex')).toBe(invoice.pdf.sha256);

    const text = pdfText(bytes);
    expect(text).toContain('Invoice WG-0001');
    expect(text).toMatch(/Grazing \(head-days\)\s+10,800 head-days\s+\$0\.18\s+\$1,944\.00/);
    expect(text).toMatch(/Total due\s+\$1,944\.00/);
    expect(text).toContain('SENT · DUE DEC 15, 2026');

    // The grower's link from the view carries its own token (a download sends no header).
    const growerView = await t.api().get(`/api/invoices/${invoice.id}`).set(grower.auth);
    const viaLink = await t.api().get(growerView.body.invoice.pdf.url);
    expect(viaLink.status).toBe(200);
    expect(viaLink.headers['content-type']).toBe('application/pdf');
    const stranger = await t.grower('Not A Party');
    expect((await t.api().get(`/api/invoices/${invoice.id}/pdf`).set(stranger.auth)).status).toBe(404);
    expect((await t.api().get(`/api/invoices/${invoice.id}/pdf?access=forged`)).status).toBe(401);

    // Paid: a second version, stamped paid, is what both now download.
    await t.api().post(`/api/invoices/${invoice.id}/pay`).set(grower.auth).send({ paymentMethod: 'pm_card_visa' });
    const paidView = (await t.api().get(`/api/invoices/${invoice.id}`).set(grazier.auth)).body.invoice;
    expect(paidView.pdf.version).toBe(2);
    const paidPdf = await download(`/api/invoices/${invoice.id}/pdf`, grower.auth);
    expect(paidPdf.headers['content-disposition']).toBe(`attachment; filename="fieldfold-invoice-${invoice.id.slice(0, 8)}-v2.pdf"`);
    expect(crypto.createHash('sha256').update(paidPdf.body as Buffer).digest('hex')).toBe(paidView.pdf.sha256);
    expect(pdfText(paidPdf.body as Buffer)).toMatch(/Total \(paid\)\s+\$1,944\.00/);
  });
});
