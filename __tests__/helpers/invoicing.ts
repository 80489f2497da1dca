import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import Stripe from 'stripe';
import { startPaymentsFake, type PaymentsFake } from '../../server/fakes/payments/fake';
import { createPayments, PaymentsUnavailableError, type PaymentsPort } from '../../server/lib/payments';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { makeTestApp, TEST_NOW, type TestAppOptions } from './test-app';
import { market, type Person } from './market';

// The app on a fresh database with the payments fake running in-process (the real SDK adapter talks to it), and
// the steps that bring a contract to an agreed sign-off. Webhooks are held by the fake (autoDeliver off): a test
// takes the signed deliveries and posts them to the app through supertest, in the order it wants.

export const WEBHOOK_SECRET = 'whsec_fieldfold_invoices_test_secret';

type Step = 'createCustomer' | 'createDraftInvoice' | 'addLines' | 'finalize' | 'pay' | 'voidInvoice' | 'retrieve';

/**
 * The real adapter with faults to order, per step: 'down' fails before the call reaches the API (connection
 * refused); 'lose-answer' lets the API do the work and then fails (a timeout, or the process stopping before the
 * answer is recorded).
 */
export class FaultyPayments implements PaymentsPort {
  faults: Partial<Record<Step, 'down' | 'lose-answer'>> = {};
  constructor(private readonly real: PaymentsPort) {}
  get mode() {
    return this.real.mode;
  }
  private async step<T>(name: Step, call: () => Promise<T>): Promise<T> {
    if (this.faults[name] === 'down') throw new PaymentsUnavailableError('connection refused');
    const result = await call();
    if (this.faults[name] === 'lose-answer') throw new PaymentsUnavailableError('the answer was lost on the way back');
    return result;
  }
  createCustomer: PaymentsPort['createCustomer'] = (...a) => this.step('createCustomer', () => this.real.createCustomer(...a));
  createDraftInvoice: PaymentsPort['createDraftInvoice'] = (...a) => this.step('createDraftInvoice', () => this.real.createDraftInvoice(...a));
  addLines: PaymentsPort['addLines'] = (...a) => this.step('addLines', () => this.real.addLines(...a));
  finalize: PaymentsPort['finalize'] = (...a) => this.step('finalize', () => this.real.finalize(...a));
  pay: PaymentsPort['pay'] = (...a) => this.step('pay', () => this.real.pay(...a));
  voidInvoice: PaymentsPort['voidInvoice'] = (...a) => this.step('voidInvoice', () => this.real.voidInvoice(...a));
  retrieve: PaymentsPort['retrieve'] = (...a) => this.step('retrieve', () => this.real.retrieve(...a));
  verifyWebhook: PaymentsPort['verifyWebhook'] = (...a) => this.real.verifyWebhook(...a);
}

export async function makeInvoicingApp(options: Omit<TestAppOptions, 'payments'> & { latencyMs?: number } = {}) {
  const fakeDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-payments-'));
  // One clock for the app and the fake's timestamps (paid_at, created), moved together by setNow.
  const clock = { now: TEST_NOW };
  const fake: PaymentsFake = await startPaymentsFake({
    port: 0,
    dataDir: fakeDir,
    webhookUrl: 'http://127.0.0.1:9/unused',
    webhookSecret: WEBHOOK_SECRET,
    autoDeliver: false,
    latencyMs: options.latencyMs,
    now: () => clock.now,
    log: () => {},
  });
  const payments = new FaultyPayments(createPayments({ mode: 'fake', secretKey: 'sk_test_fieldfold', apiUrl: fake.url, webhookSecret: WEBHOOK_SECRET, webhookToleranceSeconds: 300 }));
  const t = await makeTestApp({ ...options, payments });
  const m = market(t);
  const api = () => request(t.app);

  /**
   * An awarded contract moved to 'agreed' with agreed head-days, directly through the data source (the sign-off
   * flow is another module's; its outcome is all an invoice needs).
   */
  async function agreedContract(opts: { grower?: Person; grazier?: Person; headDays?: number; bid?: Record<string, unknown> } = {}) {
    const grower = opts.grower ?? (await m.grower());
    const grazier = opts.grazier ?? (await m.grazier());
    const block = await m.openBlock(grower);
    const bid = await m.bid(grazier, block.id, opts.bid);
    const award = await api().post(`/api/bids/${bid.id}/award`).set(grower.auth);
    if (award.status !== 201) throw new Error(`award failed: ${award.status} ${JSON.stringify(award.body)}`);
    const contractId = award.body.contract.id as string;
    await t.dataSource.getRepository(Contract).update({ id: contractId }, { status: 'agreed', agreedHeadDays: opts.headDays ?? 10_800 });
    return { grower, grazier, contractId, blockId: block.id as string };
  }

  /** Posts one of the fake's events to the webhook route, signed as the fake signs it (now, or at `timestamp`). */
  function deliver(eventId: string, timestamp?: number) {
    const { payload, signature } = fake.signedDelivery(eventId, timestamp);
    return api().post('/api/webhooks/payments').set('Content-Type', 'application/json').set('Stripe-Signature', signature).send(payload);
  }

  function eventsFor(providerInvoiceId: string, type?: string) {
    return fake.events().filter((e) => (e.data.object as { id?: string }).id === providerInvoiceId && (type === undefined || e.type === type));
  }

  return {
    ...t,
    ...m,
    api,
    fake,
    /** The adapter the app uses; set `payments.faults` to make steps fail. */
    payments,
    /** The SDK on the fake, to look at (or act on) the API's side directly. */
    stripe: new Stripe('sk_test_fieldfold', { host: '127.0.0.1', port: fake.port, protocol: 'http' }),
    agreedContract,
    /** Moves the app's clock and the fake's together (ISO instant with offset). */
    setNow: (iso: string) => {
      t.setNow(iso);
      clock.now = Date.parse(iso);
    },
    deliver,
    eventsFor,
    close: async () => {
      await t.close();
      await fake.close();
      fs.rmSync(fakeDir, { recursive: true, force: true });
    },
  };
}
