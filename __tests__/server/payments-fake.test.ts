import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { startPaymentsFake, type PaymentsFake, type PaymentsFakeOptions } from '../../server/fakes/payments/fake';
import { StripePayments } from '../../server/lib/payments/stripe-payments';
import { WebhookVerificationError } from '../../server/lib/payments';

// The local payments fake, driven through the official SDK exactly as Fieldfold drives it: form-encoded bodies,
// Idempotency-Key on every POST, the API's error objects turned into the SDK's error classes, webhooks signed so
// that stripe.webhooks.constructEvent accepts them.

const SECRET = 'whsec_fieldfold_test_signing_secret';

interface Hook {
  url: string;
  /** Raw bodies and signature headers received, in arrival order. */
  received: Array<{ body: string; signature: string; at: number }>;
  /** Status to answer with next (then 200). */
  failNext: number[];
  close: () => Promise<void>;
}

async function webhookReceiver(): Promise<Hook> {
  const hook: Hook = { url: '', received: [], failNext: [], close: async () => {} };
  const server = http.createServer((req, res) => {
    let body = '';
    req.setEncoding('utf8');
    req.on('data', (d) => (body += d));
    req.on('end', () => {
      hook.received.push({ body, signature: String(req.headers['stripe-signature'] ?? ''), at: Date.now() });
      res.statusCode = hook.failNext.shift() ?? 200;
      res.end();
    });
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  hook.url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/webhooks/payments`;
  hook.close = () => new Promise((r) => server.close(() => r()));
  return hook;
}

let dataDir: string;
let fake: PaymentsFake;
let hook: Hook;
let stripe: Stripe;

function sdk(f: PaymentsFake, key = 'sk_test_fieldfold', maxNetworkRetries = 0) {
  return new Stripe(key, { host: '127.0.0.1', port: f.port, protocol: 'http', maxNetworkRetries, telemetry: false });
}

async function start(over: Partial<PaymentsFakeOptions> = {}) {
  fake = await startPaymentsFake({ port: 0, dataDir, webhookUrl: hook.url, webhookSecret: SECRET, retryBaseMs: 20, log: () => {}, ...over });
  stripe = sdk(fake);
}

beforeEach(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'payments-fake-'));
  hook = await webhookReceiver();
  await start();
});

afterEach(async () => {
  await fake.close();
  await hook.close();
  fs.rmSync(dataDir, { recursive: true, force: true });
});

async function openInvoice(amounts = [12_345, 2_500]) {
  const customer = await stripe.customers.create({ email: 'greta@calder.example', name: 'Olsen Walnut Orchard' });
  const draft = await stripe.invoices.create({ customer: customer.id, collection_method: 'send_invoice', days_until_due: 14, metadata: { fieldfold_invoice_id: 'inv-1' } });
  for (const amount of amounts) {
    await stripe.invoiceItems.create({ customer: customer.id, invoice: draft.id, amount, currency: 'usd', description: `line ${amount}` });
  }
  return stripe.invoices.finalizeInvoice(draft.id);
}

describe('idempotency', () => {
  test('When the same Idempotency-Key is sent twice with the same body, then the second answer replays the first and nothing is made twice', async () => {
    const body = { email: 'greta@calder.example', name: 'Olsen Walnut Orchard', metadata: { fieldfold_account_id: 'acc-1' } };
    const first = await stripe.customers.create(body, { idempotencyKey: 'fieldfold:customer:acc-1' });
    const again = await stripe.customers.create(body, { idempotencyKey: 'fieldfold:customer:acc-1' });
    expect(again.id).toBe(first.id);
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
    const all = await stripe.customers.list({ email: 'greta@calder.example' });
    expect(all.data.map((c) => c.id)).toEqual([first.id]);
  });

  test('When a key is reused with other parameters, then the API answers 400 idempotency_error and makes nothing', async () => {
    await stripe.customers.create({ email: 'greta@calder.example' }, { idempotencyKey: 'k-1' });
    const err = await stripe.customers.create({ email: 'tomas@calder.example' }, { idempotencyKey: 'k-1' }).catch((e) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err.statusCode).toBe(400);
    expect(err.type).toBe('StripeIdempotencyError');
    expect(err.message).toMatch(/same parameters they were first used with/);
    expect((await stripe.customers.list()).data).toHaveLength(1);
  });

  test('When a key is reused on another endpoint, then the API answers 400 idempotency_error naming both endpoints', async () => {
    const c = await stripe.customers.create({ email: 'greta@calder.example' }, { idempotencyKey: 'k-2' });
    const err = await stripe.invoices.create({ customer: c.id }, { idempotencyKey: 'k-2' }).catch((e) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err.message).toContain("'POST /v1/customers' vs 'POST /v1/invoices'");
  });

  test('When a double tap sends the same key while the first request still runs, then the second is told 409 and, retried, gets the one result', async () => {
    await fake.close();
    await start({ latencyMs: 150 });
    const noRetry = sdk(fake);
    const [a, b] = await Promise.allSettled([
      noRetry.customers.create({ email: 'a@calder.example' }, { idempotencyKey: 'tap' }),
      new Promise((r) => setTimeout(r, 30)).then(() => noRetry.customers.create({ email: 'a@calder.example' }, { idempotencyKey: 'tap' })),
    ]);
    expect(a.status).toBe('fulfilled');
    expect(b.status).toBe('rejected');
    const err = (b as PromiseRejectedResult).reason;
    expect(err.statusCode).toBe(409);
    expect(err.rawType).toBe('idempotency_error');
    expect(err.code).toBe('idempotency_key_in_use');
    // The SDK retries a 409 by itself; with retries on, the second tap gets the first customer back.
    const withRetry = sdk(fake, 'sk_test_fieldfold', 2);
    const [c1, c2] = await Promise.all([
      withRetry.customers.create({ email: 'b@calder.example' }, { idempotencyKey: 'tap-2' }),
      new Promise((r) => setTimeout(r, 30)).then(() => withRetry.customers.create({ email: 'b@calder.example' }, { idempotencyKey: 'tap-2' })),
    ]);
    expect(c2.id).toBe(c1.id);
    expect((await stripe.customers.list({ email: 'b@calder.example' })).data).toHaveLength(1);
  });

  test('When a request fails parameter validation, then its key is not spent and the corrected request may use it', async () => {
    const err = await stripe.invoices.create({} as Stripe.InvoiceCreateParams, { idempotencyKey: 'k-3' }).catch((e) => e);
    expect(err.code).toBe('parameter_missing');
    // Same key, now with the parameter: a new request, not a replay of the error.
    const c = await stripe.customers.create({ email: 'x@calder.example' });
    const inv = await stripe.invoices.create({ customer: c.id }, { idempotencyKey: 'k-3' });
    expect(inv.status).toBe('draft');
    expect(inv.lastResponse.headers['idempotent-replayed']).toBeUndefined();
  });

  test('When the fake restarts, then a retried request with the same key still replays the saved answer', async () => {
    const first = await stripe.customers.create({ email: 'greta@calder.example' }, { idempotencyKey: 'survives' });
    await fake.close();
    await start();
    const again = await stripe.customers.create({ email: 'greta@calder.example' }, { idempotencyKey: 'survives' });
    expect(again.id).toBe(first.id);
    expect((await stripe.customers.retrieve(first.id)).id).toBe(first.id);
  });
});

describe('invoices and paying', () => {
  test('When items are added to a draft and it is finalised, then it is open with a number, the summed total and a due date from the terms', async () => {
    const inv = await openInvoice([12_345, 2_500]);
    expect(inv.status).toBe('open');
    expect(inv.number).toMatch(/^[A-Z0-9]{8}-0001$/);
    expect(inv.total).toBe(14_845);
    expect(inv.amount_due).toBe(14_845);
    expect(inv.amount_remaining).toBe(14_845);
    expect(inv.lines.data.map((l) => l.amount)).toEqual([12_345, 2_500]);
    expect(inv.due_date).toBe(inv.status_transitions.finalized_at! + 14 * 86_400);
    const err = await stripe.invoices.finalizeInvoice(inv.id).catch((e) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err.message).toMatch(/already finalized/);
  });

  test('When a finalised invoice is paid with pm_card_visa, then it is paid in full and a second payment is refused', async () => {
    const inv = await openInvoice();
    const paid = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' });
    expect(paid.status).toBe('paid');
    expect(paid.amount_paid).toBe(inv.amount_due);
    expect(paid.amount_remaining).toBe(0);
    expect(paid.status_transitions.paid_at).toEqual(expect.any(Number));
    const withPayments = await stripe.invoices.retrieve(inv.id, { expand: ['payments'] });
    expect(withPayments.payments?.data).toHaveLength(1);
    expect(withPayments.payments?.data[0].payment.payment_intent).toMatch(/^pi_/);

    const err = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' }).catch((e) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(err.statusCode).toBe(400);
    expect(err.message).toBe('Invoice is already paid');
  });

  test.each([
    ['pm_card_chargeDeclined', 'generic_decline', 'Your card was declined.'],
    ['pm_card_chargeDeclinedInsufficientFunds', 'insufficient_funds', 'Your card has insufficient funds.'],
  ])('When an invoice is paid with %s, then the SDK throws a card error card_declined/%s and the invoice stays open', async (pm, declineCode, message) => {
    const inv = await openInvoice();
    const err = await stripe.invoices.pay(inv.id, { payment_method: pm }).catch((e) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err.statusCode).toBe(402);
    expect(err.code).toBe('card_declined');
    expect(err.decline_code).toBe(declineCode);
    expect(err.message).toBe(message);
    const after = await stripe.invoices.retrieve(inv.id);
    expect(after.status).toBe('open');
    expect(after.amount_paid).toBe(0);
    expect(after.attempt_count).toBe(1);
    // A declined card does not block a good one afterwards.
    expect((await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' })).status).toBe('paid');
  });

  test('When a declined payment is retried with the same Idempotency-Key, then the decline is replayed rather than charged again', async () => {
    const inv = await openInvoice();
    const a = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_chargeDeclined' }, { idempotencyKey: 'pay-1' }).catch((e) => e);
    const b = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_chargeDeclined' }, { idempotencyKey: 'pay-1' }).catch((e) => e);
    expect(b.decline_code).toBe(a.decline_code);
    expect(b.headers['idempotent-replayed']).toBe('true');
    expect((await stripe.invoices.retrieve(inv.id)).attempt_count).toBe(1);
  });

  test('When the API is asked for something it does not have or a parameter it does not know, then it answers with its error objects', async () => {
    const missing = await stripe.invoices.retrieve('in_doesnotexist').catch((e) => e);
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(missing.statusCode).toBe(404);
    expect(missing.code).toBe('resource_missing');
    expect(missing.param).toBe('id');
    expect(missing.message).toBe("No such invoice: 'in_doesnotexist'");

    const c = await stripe.customers.create({ email: 'x@calder.example' });
    const unknown = await stripe.invoices.create({ customer: c.id, colour: 'green' } as Stripe.InvoiceCreateParams).catch((e) => e);
    expect(unknown.code).toBe('parameter_unknown');
    expect(unknown.param).toBe('colour');

    const inv = await openInvoice();
    const badPm = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_made_up' }).catch((e) => e);
    expect(badPm.statusCode).toBe(404);
    expect(badPm.param).toBe('payment_method');

    const notDraft = await stripe.invoiceItems.create({ customer: inv.customer as string, invoice: inv.id, amount: 100, currency: 'usd' }).catch((e) => e);
    expect(notDraft.code).toBe('invoice_not_editable');
  });

  test('When an open invoice is voided, then it can no longer be paid', async () => {
    const inv = await openInvoice();
    expect((await stripe.invoices.voidInvoice(inv.id)).status).toBe('void');
    const err = await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' }).catch((e) => e);
    expect(err.message).toMatch(/voided/);
  });

  test('When lists are longer than a page, then they page by cursor newest first and the SDK walks every page', async () => {
    const made: string[] = [];
    for (let i = 0; i < 5; i++) made.push((await stripe.customers.create({ email: `c${i}@calder.example` })).id);
    const page1 = await stripe.customers.list({ limit: 2 });
    expect(page1.data.map((c) => c.id)).toEqual([made[4], made[3]]);
    expect(page1.has_more).toBe(true);
    const page2 = await stripe.customers.list({ limit: 2, starting_after: page1.data[1].id });
    expect(page2.data.map((c) => c.id)).toEqual([made[2], made[1]]);
    const back = await stripe.customers.list({ limit: 2, ending_before: page2.data[0].id });
    expect(back.data.map((c) => c.id)).toEqual([made[4], made[3]]);
    expect(await stripe.customers.list({ limit: 2 }).autoPagingToArray({ limit: 100 })).toHaveLength(5);

    const draft = await stripe.invoices.create({ customer: made[0] });
    for (let i = 0; i < 12; i++) await stripe.invoiceItems.create({ customer: made[0], invoice: draft.id, amount: 100 + i, currency: 'usd' });
    const inv = await stripe.invoices.retrieve(draft.id);
    expect(inv.lines.data).toHaveLength(10);
    expect(inv.lines.has_more).toBe(true);
    const lines = await stripe.invoices.listLineItems(draft.id, { limit: 5 }).autoPagingToArray({ limit: 100 });
    // An invoice's lines keep the order they were added in.
    expect(lines.map((l) => l.amount)).toEqual(Array.from({ length: 12 }, (_, i) => 100 + i));
  });

  test('When a live key or no key is used, then the fake refuses it (test mode only)', async () => {
    const live = await sdk(fake, 'sk_live_should_never_be_here').customers.list().catch((e) => e);
    expect(live).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    const res = await fetch(`${fake.url}/v1/customers`);
    expect(res.status).toBe(401);
    expect(((await res.json()) as { error: { type: string } }).error.type).toBe('invalid_request_error');
  });
});

describe('webhooks', () => {
  function verify(body: string, signature: string, secret = SECRET) {
    return stripe.webhooks.constructEvent(body, signature, secret);
  }

  test('When an invoice is paid, then each event arrives signed so that constructEvent verifies it, in the order they happened', async () => {
    const inv = await openInvoice([5_000]);
    await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' });
    await fake.webhooksIdle();
    const events = hook.received.map((r) => verify(r.body, r.signature));
    expect(events.map((e) => e.type)).toEqual(['customer.created', 'invoice.created', 'invoiceitem.created', 'invoice.finalized', 'invoice.paid', 'invoice.payment_succeeded']);
    const paid = events[4] as Stripe.InvoicePaidEvent;
    expect(paid.data.object.id).toBe(inv.id);
    expect(paid.data.object.status).toBe('paid');
    expect(paid.data.object.metadata).toEqual({ fieldfold_invoice_id: 'inv-1' });
    expect(paid.request?.idempotency_key).toMatch(/^stripe-node-retry-/);
    // The SDK refuses the same bytes under another secret, and altered bytes under the right one.
    expect(() => verify(hook.received[4].body, hook.received[4].signature, 'whsec_some_other_secret_value')).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => verify(hook.received[4].body.replace('"paid"', '"open"'), hook.received[4].signature)).toThrow(Stripe.errors.StripeSignatureVerificationError);
  });

  test('When a declined payment happens, then invoice.payment_failed is delivered and the events list has it', async () => {
    const inv = await openInvoice();
    await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_chargeDeclinedInsufficientFunds' }).catch(() => undefined);
    await fake.webhooksIdle();
    const failed = hook.received.map((r) => verify(r.body, r.signature)).find((e) => e.type === 'invoice.payment_failed') as Stripe.InvoicePaymentFailedEvent;
    expect(failed.data.object.id).toBe(inv.id);
    expect(failed.data.object.status).toBe('open');
    const listed = await stripe.events.list({ type: 'invoice.payment_failed' });
    expect(listed.data.map((e) => e.id)).toEqual([failed.id]);
    expect((await stripe.events.retrieve(failed.id)).type).toBe('invoice.payment_failed');
  });

  test('When the receiver fails, then the delivery is retried with growing gaps until it answers 2xx', async () => {
    hook.failNext.push(500, 503, 500);
    await stripe.customers.create({ email: 'retry@calder.example' });
    await fake.webhooksIdle();
    expect(hook.received).toHaveLength(4);
    const gaps = hook.received.slice(1).map((r, i) => r.at - hook.received[i].at);
    // Base 20 ms, doubling: 20, 40, 80 (timers may run late, never early).
    expect(gaps[0]).toBeGreaterThanOrEqual(18);
    expect(gaps[1]).toBeGreaterThanOrEqual(38);
    expect(gaps[2]).toBeGreaterThanOrEqual(78);
    const [delivery] = fake.deliveries();
    expect(delivery).toMatchObject({ status: 'succeeded', attempts: 4, lastStatus: 200 });
    // Each attempt is signed afresh, and each verifies.
    for (const r of hook.received) expect(verify(r.body, r.signature).type).toBe('customer.created');
  });

  test('When the receiver never answers 2xx, then the fake gives up after maxAttempts', async () => {
    await fake.close();
    await start({ maxAttempts: 3 });
    hook.failNext.push(500, 500, 500, 500);
    await stripe.customers.create({ email: 'never@calder.example' });
    await fake.webhooksIdle();
    expect(hook.received).toHaveLength(3);
    expect(fake.deliveries()[0]).toMatchObject({ status: 'failed', attempts: 3, lastError: 'HTTP 500' });
  });

  test('When delivery is held (autoDeliver off), then events wait until deliverPending, and survive a restart', async () => {
    await fake.close();
    await start({ autoDeliver: false });
    await stripe.customers.create({ email: 'held@calder.example' });
    await new Promise((r) => setTimeout(r, 60));
    expect(hook.received).toHaveLength(0);
    await fake.close();
    await start();
    await fake.webhooksIdle();
    expect(hook.received.map((r) => verify(r.body, r.signature).type)).toEqual(['customer.created']);
  });

  test('When the timestamp is old, then constructEvent refuses even a correct signature', async () => {
    await stripe.customers.create({ email: 'old@calder.example' });
    const [event] = fake.events();
    const old = fake.signedDelivery(event.id, Math.floor(Date.now() / 1000) - 600);
    expect(() => verify(old.payload, old.signature)).toThrow(/tolerance/);
    const fresh = fake.signedDelivery(event.id);
    expect(verify(fresh.payload, fresh.signature).id).toBe(event.id);
  });
});

describe('the payments port on the SDK, against the fake', () => {
  function port() {
    return new StripePayments({ mode: 'fake', secretKey: 'sk_test_fieldfold', apiUrl: fake.url, webhookSecret: SECRET, webhookToleranceSeconds: 300 });
  }

  test('When an invoice is issued twice with the same keys (a retry after a crash), then the API holds one customer, one invoice and one set of lines', async () => {
    const payments = port();
    const lines = [
      { key: '0', description: 'Grazing: 10 800 head-days × $0.18', amountCents: 194_400 },
      { key: '1', description: 'Hauling and mobilisation', amountCents: 45_000 },
    ];
    async function issue() {
      const customer = await payments.createCustomer({ accountId: 'acc-1', email: 'greta@calder.example', name: 'Greta' }, 'fieldfold:customer:acc-1');
      const draft = await payments.createDraftInvoice(
        { customerId: customer.id, fieldfoldInvoiceId: 'inv-1', contractId: 'con-1', number: 'KRS-0001', dueDate: '2027-02-15', description: 'Grazing' },
        'fieldfold:invoice:con-1:draft',
      );
      await payments.addLines(draft, lines, 'fieldfold:invoice:con-1:line');
      return payments.finalize(draft.id, 'fieldfold:invoice:con-1:finalize');
    }
    const a = await issue();
    const b = await issue();
    expect(b.id).toBe(a.id);
    expect(a).toMatchObject({ status: 'open', totalCents: 239_400, fieldfoldInvoiceId: 'inv-1' });
    expect(a.number).toMatch(/^[A-Z0-9]{8}-0001$/);
    expect((await stripe.invoices.retrieve(a.id)).metadata).toMatchObject({ fieldfold_invoice_number: 'KRS-0001' });
    expect((await stripe.customers.list()).data).toHaveLength(1);
    expect((await stripe.invoices.list()).data).toHaveLength(1);
    expect((await stripe.invoices.listLineItems(a.id)).data).toHaveLength(2);
  });

  test('When lines were partly added and their keys are gone, then addLines adds only the missing ones', async () => {
    const payments = port();
    const customer = await payments.createCustomer({ accountId: 'acc-2', email: 't@calder.example', name: 'T' }, 'c-2');
    const draft = await payments.createDraftInvoice({ customerId: customer.id, fieldfoldInvoiceId: 'inv-2', contractId: 'con-2', number: 'X-1', dueDate: '2027-02-15', description: 'd' }, 'd-2');
    const lines = [
      { key: '0', description: 'a', amountCents: 100 },
      { key: '1', description: 'b', amountCents: 200 },
    ];
    await payments.addLines(draft, lines.slice(0, 1), 'first-attempt');
    await payments.addLines(draft, lines, 'second-attempt');
    expect((await stripe.invoices.listLineItems(draft.id)).data.map((l) => l.amount)).toEqual([100, 200]);
  });

  test('When paying, then the port tells paid, declined with the codes, and already paid apart', async () => {
    const payments = port();
    const inv = await openInvoice([7_700]);
    const declined = await payments.pay(inv.id, 'pm_card_chargeDeclinedInsufficientFunds', 'p-1');
    expect(declined).toEqual({ kind: 'declined', code: 'card_declined', declineCode: 'insufficient_funds', message: 'Your card has insufficient funds.' });
    const paid = await payments.pay(inv.id, 'pm_card_visa', 'p-2');
    expect(paid).toMatchObject({ kind: 'paid', invoice: { status: 'paid', amountPaidCents: 7_700 } });
    const again = await payments.pay(inv.id, 'pm_card_visa', 'p-3');
    expect(again).toMatchObject({ kind: 'already-paid', invoice: { status: 'paid' } });
  });

  test('When a webhook is verified, then a good one gives the event and a bad or missing signature throws WebhookVerificationError', async () => {
    const payments = port();
    const inv = await openInvoice([1_000]);
    await stripe.invoices.pay(inv.id, { payment_method: 'pm_card_visa' });
    const paid = fake.events().find((e) => e.type === 'invoice.paid')!;
    const { payload, signature } = fake.signedDelivery(paid.id);
    const event = payments.verifyWebhook(Buffer.from(payload), signature);
    expect(event).toMatchObject({ id: paid.id, type: 'invoice.paid', invoice: { id: inv.id, status: 'paid', fieldfoldInvoiceId: 'inv-1' } });
    expect(() => payments.verifyWebhook(Buffer.from(payload), undefined)).toThrow(WebhookVerificationError);
    expect(() => payments.verifyWebhook(Buffer.from(payload + ' '), signature)).toThrow(WebhookVerificationError);
  });

  test('When the API is down, then the port says unavailable rather than failing a request for good', async () => {
    const payments = port();
    await fake.close();
    const err = await payments.retrieve('in_x').catch((e) => e);
    expect(err.name).toBe('PaymentsUnavailableError');
    await start();
  });
});
