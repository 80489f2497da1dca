import { makeTestApp, TEST_NOW } from '../helpers/test-app';
import { market } from '../helpers/market';
import { makeInvoicingApp } from '../helpers/invoicing';
import type { MailMessage, MailPort } from '../../server/lib/mail/mail-port';
import { MemoryMail } from '../../server/lib/mail/memory-mail';
import { OUTBOX_BACKOFF_MS, OUTBOX_LEASE_MS, OutboxSender, queueMail } from '../../server/lib/mail/outbox';
import { OutboxMessage } from '../../server/lib/mail/outbox.entity';
import { inTransaction } from '../../server/lib/db/transaction';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { Invoice } from '../../server/modules/invoices/invoice.entity';
import { InvoiceRecovery } from '../../server/modules/invoices/invoice-sync';

// Hosted services that fail: the mail server down or hanging, a sender that dies holding a message, the payments
// API down or losing its answer during a payment, and recovery runs from two processes at once. A state change
// never waits for them and is never undone or repeated by them: mail waits in the outbox and goes once; money
// moves once.

jest.setTimeout(60_000);

/** A mail server to order: 'down' refuses, 'hang' never answers (until released), 'up' accepts (kept in `sent`). */
class ScriptedMail implements MailPort {
  state: 'up' | 'down' | 'hang' = 'up';
  readonly sent: MailMessage[] = [];
  private hung: Array<(ok: boolean) => void> = [];
  send(msg: MailMessage): Promise<void> {
    if (this.state === 'down') return Promise.reject(new Error('connect ECONNREFUSED 127.0.0.1:1025'));
    if (this.state === 'hang') {
      return new Promise((resolve, reject) => this.hung.push((ok) => (ok ? resolve() : reject(new Error('the connection was dropped')))));
    }
    this.sent.push(msg);
    return Promise.resolve();
  }
  /** Ends every hanging send: accepted, or dropped. */
  release(ok: boolean) {
    for (const r of this.hung.splice(0)) r(ok);
  }
  get hanging() {
    return this.hung.length;
  }
}

async function row(t: { dataSource: import('typeorm').DataSource }, to: string, subject: RegExp) {
  const rows = (await t.dataSource.getRepository(OutboxMessage).findBy({ to })).filter((r) => subject.test(r.subject));
  expect(rows).toHaveLength(1);
  return rows[0];
}

describe('the mail outbox when the mail server fails', () => {
  test('When the mail server is down, then the award answers 201, the message is retried on the backoff schedule and never earlier, and goes once when the server is back', async () => {
    const mail = new ScriptedMail();
    mail.state = 'down';
    const logged: string[] = [];
    const t = await makeTestApp({ mail, log: (m) => logged.push(m) });
    const m = market(t);
    try {
      const grower = await m.grower();
      const block = await m.openBlock(grower);
      const wade = await m.grazier('Wade Kellner');
      const b = await m.bid(wade, block.id);
      const res = await m.api().post(`/api/bids/${b.id}/award`).set(grower.auth);
      expect(res.status).toBe(201);
      const rowsAfterAward = await t.dataSource.getRepository(OutboxMessage).count();

      await t.deliverMail();
      let at = TEST_NOW;
      let attempts = 1;
      expect(await row(t, wade.email, /was accepted/)).toMatchObject({ status: 'pending', attempts, nextAttemptAt: at + OUTBOX_BACKOFF_MS[0], claimedUntil: null, lastError: 'connect ECONNREFUSED 127.0.0.1:1025' });
      // 5 s, 30 s, 2 min, 10 min, 30 min, then every 30 min: a moment before each is due nothing is tried.
      for (const delay of [...OUTBOX_BACKOFF_MS, OUTBOX_BACKOFF_MS.at(-1)!]) {
        t.setNow(new Date(at + delay - 1).toISOString());
        await t.deliverMail();
        expect((await row(t, wade.email, /was accepted/)).attempts).toBe(attempts);
        at += delay;
        t.setNow(new Date(at).toISOString());
        await t.deliverMail();
        attempts += 1;
        expect(await row(t, wade.email, /was accepted/)).toMatchObject({ status: 'pending', attempts, nextAttemptAt: at + OUTBOX_BACKOFF_MS[Math.min(attempts - 1, OUTBOX_BACKOFF_MS.length - 1)] });
      }
      expect(logged.filter((l) => /"Your bid on .* was accepted" not sent \(attempt 7\), retrying in 1800 s/.test(l))).toHaveLength(1);

      mail.state = 'up';
      t.setNow(new Date(at + OUTBOX_BACKOFF_MS.at(-1)!).toISOString());
      await t.deliverMail();
      await t.deliverMail();
      expect(mail.sent.filter((x) => x.to === wade.email && /was accepted/.test(x.subject))).toHaveLength(1);
      expect(await row(t, wade.email, /was accepted/)).toMatchObject({ status: 'sent', attempts: attempts + 1, lastError: null, claimedUntil: null });
      // One row per message, however many attempts.
      expect(await t.dataSource.getRepository(OutboxMessage).count()).toBe(rowsAfterAward);
      expect(await t.dataSource.getRepository(OutboxMessage).countBy({ status: 'pending' })).toBe(0);
    } finally {
      await t.close();
    }
  });

  test('When the mail server accepts the connection and never answers, then the request is not held: the award answers at once and the message waits, claimed', async () => {
    const mail = new ScriptedMail();
    const t = await makeTestApp({ mail });
    const m = market(t);
    try {
      const grower = await m.grower();
      const block = await m.openBlock(grower);
      const wade = await m.grazier('Wade Kellner');
      const b = await m.bid(wade, block.id);
      await t.deliverMail();
      mail.state = 'hang';
      const started = Date.now();
      const res = await m.api().post(`/api/bids/${b.id}/award`).set(grower.auth);
      expect(res.status).toBe(201);
      expect(Date.now() - started).toBeLessThan(5_000);
      await new Promise((r) => setTimeout(r, 50));
      expect(mail.hanging).toBe(1);
      expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: res.body.contract.id })).status).toBe('to-sign');
      const claimed = (await t.dataSource.getRepository(OutboxMessage).find()).filter((r) => r.claimedUntil !== null);
      expect(claimed.map((r) => [r.to, r.subject, r.status, r.claimedUntil])).toEqual([[wade.email, `Your bid on ${block.name} was accepted`, 'pending', TEST_NOW + OUTBOX_LEASE_MS]]);
    } finally {
      mail.state = 'down';
      mail.release(false);
      await t.close();
    }
  });

  test('When a sender dies holding a message, then another sends it only once the lease has run out, and the first one’s late answer changes nothing', async () => {
    const hanging = new ScriptedMail();
    hanging.state = 'hang';
    // The app's own sender (the first process) hangs; it must not pick the message up again after it drops.
    const t = await makeTestApp({ mail: hanging });
    const other = new MemoryMail();
    const clock = { now: TEST_NOW };
    // A second process's sender on the same database.
    const second = new OutboxSender(t.dataSource, other, () => clock.now);
    try {
      await inTransaction(t.dataSource, (tx) => queueMail(tx, [{ to: 'greta@calder.example', subject: 'Head-days to sign off: North bench', text: 'Wade proposed 6,000 head-days.' }], TEST_NOW));
      void t.outbox.drain();
      await new Promise((r) => setTimeout(r, 50));
      expect(hanging.hanging).toBe(1);

      expect(await second.drain()).toBe(0);
      clock.now = TEST_NOW + OUTBOX_LEASE_MS - 1;
      expect(await second.drain()).toBe(0);
      clock.now = TEST_NOW + OUTBOX_LEASE_MS;
      expect(await second.drain()).toBe(1);
      expect(other.outbox.map((x) => x.subject)).toEqual(['Head-days to sign off: North bench']);
      const sent = await row(t, 'greta@calder.example', /Head-days/);
      expect(sent).toMatchObject({ status: 'sent', attempts: 2, lastError: null, claimedUntil: null });

      // The first sender's connection finally drops: it records no failure over the second's send.
      hanging.release(false);
      await t.outbox.stop();
      expect(await row(t, 'greta@calder.example', /Head-days/)).toEqual(sent);
      expect(await second.drain()).toBe(0);
    } finally {
      hanging.release(false);
      await second.stop();
      await t.close();
    }
  });

  test('When two senders drain at once through a slow mail server, then each message goes once', async () => {
    const t = await makeTestApp();
    const delivered: string[] = [];
    const slow: MailPort = { send: (msg) => new Promise((r) => setTimeout(() => r(void delivered.push(msg.subject)), 20)) };
    const a = new OutboxSender(t.dataSource, slow, () => TEST_NOW);
    const b = new OutboxSender(t.dataSource, slow, () => TEST_NOW);
    try {
      const subjects = Array.from({ length: 12 }, (_, i) => `Block changed: terrace ${i}`);
      await inTransaction(t.dataSource, (tx) => queueMail(tx, subjects.map((subject) => ({ to: 'wade@calder.example', subject, text: 'The window moved.' })), TEST_NOW));
      const [x, y] = await Promise.all([a.drain(), b.drain()]);
      expect(x + y).toBe(12);
      expect(x).toBeGreaterThan(0);
      expect(y).toBeGreaterThan(0);
      expect(delivered.sort()).toEqual([...subjects].sort());
      expect(await t.dataSource.getRepository(OutboxMessage).countBy({ status: 'sent', attempts: 1 })).toBe(12);
    } finally {
      await a.stop();
      await b.stop();
      await t.close();
    }
  });
});

describe('the payments API failing during a payment', () => {
  type App = Awaited<ReturnType<typeof makeInvoicingApp>>;
  let t: App;
  beforeEach(async () => {
    t = await makeInvoicingApp();
  });
  afterEach(async () => {
    await t.close();
  });

  async function sentInvoice() {
    const c = await t.agreedContract();
    const res = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    expect(res.body.invoice.status).toBe('sent');
    const row = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: res.body.invoice.id });
    return { ...c, invoiceId: row.id, providerInvoiceId: row.providerInvoiceId! };
  }

  async function paymentsInApi(providerInvoiceId: string) {
    return (await t.stripe.invoices.retrieve(providerInvoiceId, { expand: ['payments'] })).payments?.data.length ?? 0;
  }

  async function receipts(c: { grower: { email: string }; grazier: { email: string } }) {
    await t.deliverMail();
    return [t.mail.to(c.grower.email).filter((x) => x.subject.startsWith('Receipt:')).length, t.mail.to(c.grazier.email).filter((x) => / was paid: /.test(x.subject)).length];
  }

  test('When the payments API is down as the grower pays, then 503 with Retry-After, nothing charged, the invoice free to pay again; the next try pays once', async () => {
    const c = await sentInvoice();
    t.payments.faults = { pay: 'down' };
    const res = await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(res.status).toBe(503);
    expect(res.body.error.code).toBe('payments_unavailable');
    expect(res.headers['retry-after']).toBe('30');
    expect(await paymentsInApi(c.providerInvoiceId)).toBe(0);
    expect(await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: c.invoiceId })).toMatchObject({ status: 'sent', payingUntil: null, paidAt: null });

    t.payments.faults = {};
    const again = await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(again.status).toBe(200);
    expect(again.body.invoice.status).toBe('paid');
    expect(await paymentsInApi(c.providerInvoiceId)).toBe(1);
    expect(await receipts(c)).toEqual([1, 1]);
  });

  test('When the API charges but its answer is lost, then 503 and the invoice still unpaid here; paying again records the one charge, never a second', async () => {
    const c = await sentInvoice();
    t.payments.faults = { pay: 'lose-answer' };
    const lost = await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(lost.status).toBe(503);
    expect(lost.body.error.message).toMatch(/If you were charged, the invoice will show paid shortly/);
    expect(await paymentsInApi(c.providerInvoiceId)).toBe(1);
    expect(await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: c.invoiceId })).toMatchObject({ status: 'sent', payingUntil: null });

    t.payments.faults = {};
    const retry = await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(retry.status).toBe(200);
    expect(retry.body.invoice).toMatchObject({ status: 'paid', receipt: { method: null } });
    expect(await paymentsInApi(c.providerInvoiceId)).toBe(1);
    // The API's events for that charge arrive afterwards and change nothing.
    for (const e of t.eventsFor(c.providerInvoiceId)) expect(['no-change', 'ignored']).toContain((await t.deliver(e.id)).body.outcome);
    expect((await t.dataSource.getRepository(Contract).findOneByOrFail({ id: c.contractId })).status).toBe('paid');
    expect(await receipts(c)).toEqual([1, 1]);
  });

  test('When the answer is lost and the paid event arrives first, then the event records the payment and a second tap is told it is paid', async () => {
    const c = await sentInvoice();
    t.payments.faults = { pay: 'lose-answer' };
    expect((await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' })).status).toBe(503);
    t.payments.faults = {};
    const [paid] = t.eventsFor(c.providerInvoiceId, 'invoice.paid');
    expect((await t.deliver(paid.id)).body.outcome).toBe('applied');
    const tap = await t.api().post(`/api/invoices/${c.invoiceId}/pay`).set(c.grower.auth).send({ paymentMethod: 'pm_card_visa' });
    expect(tap.status).toBe(409);
    expect(tap.body.error.code).toBe('already_paid');
    expect(await paymentsInApi(c.providerInvoiceId)).toBe(1);
    expect(await receipts(c)).toEqual([1, 1]);
  });

  test('When invoicing stops at finalise and two processes’ recovery runs start together, then the invoice is issued once: one invoice, one set of lines, one customer, one mail', async () => {
    const c = await t.agreedContract();
    t.payments.faults = { finalize: 'down' };
    const created = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
    expect(created.status).toBe(201);
    expect(created.body.invoice).toMatchObject({ status: 'draft', payment: { ready: false } });
    t.payments.faults = {};

    // Past the first backoff (10 s), two processes' timers fire at once.
    t.setNow(new Date(TEST_NOW + 11_000).toISOString());
    const runs = [new InvoiceRecovery(t.ctx), new InvoiceRecovery(t.ctx)];
    for (const r of runs) r.kick();
    await Promise.all(runs.map((r) => r.stop()));

    const inv = await t.dataSource.getRepository(Invoice).findOneByOrFail({ id: created.body.invoice.id });
    expect(inv).toMatchObject({ status: 'sent', syncError: null });
    const remote = (await t.stripe.invoices.list()).data;
    expect(remote.map((r) => [r.id, r.status])).toEqual([[inv.providerInvoiceId, 'open']]);
    expect(remote[0].lines.data.map((l) => l.amount)).toEqual(inv.lines.map((l) => l.amountCents));
    expect((await t.stripe.customers.list()).data).toHaveLength(1);
    await t.deliverMail();
    expect(t.mail.to(c.grower.email).filter((x) => x.subject.startsWith('Invoice '))).toHaveLength(1);
  });
});
