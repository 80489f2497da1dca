import type request from 'supertest';
import { raceModes, raceTargets, type RaceTargets } from '../helpers/race-targets';
import { onPostgres } from '../helpers/test-database';
import { agreed, awarded, bid, grazed, grazier, invoiced, logEntry, logTimes, openBlock, signBody, signed, signUp, stayDates } from '../helpers/live-flow';
import { Bid } from '../../server/modules/bids/bid.entity';
import { Block } from '../../server/modules/blocks/block.entity';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { ContractSignature, LogEntry, SignOff } from '../../server/modules/contracts/contract-records.entity';
import { Invoice, InvoiceCounter, PaymentEventRecord } from '../../server/modules/invoices/invoice.entity';
import { OutboxMessage } from '../../server/lib/mail/outbox.entity';

// Races: the same once-only action fired many times at once — a double tap, a phone's retry, a webhook
// redelivered — must take effect once. Every request of a burst is started in the same tick (Promise.all on
// supertest requests) and spread over every server race-targets.ts gives, in each mode:
//   in-process  two apps on one database. On SQLite (in memory) the transactions run one after another, so a
//               burst interleaves at every await between them: one request's reads, another's writes. On
//               PostgreSQL each app has its own pool, so the transactions truly overlap.
//   processes   two real server processes on one database — one SQLite file, or in npm test's PostgreSQL pass one
//               fresh PostgreSQL database the first server migrates — each with its own transactions: here the
//               engine's locking and the database's unique keys and conditional updates are all that stand
//               between the requests.
// The answers must be exactly one success and conflicts for the rest, never a 500, and the database must show
// one effect: one contract, one signature, one agreed figure, one invoice, one charge, one entry, one receipt.

const BURST = 8;

let t: RaceTargets;

/** Fires `n` requests at once, request i to server i. */
function burst(n: number, make: (i: number) => PromiseLike<request.Response>): Promise<request.Response[]> {
  return Promise.all(Array.from({ length: n }, (_, i) => make(i)));
}

function statuses(results: request.Response[]): number[] {
  return results.map((r) => r.status).sort((a, b) => a - b);
}

function codes(results: request.Response[]): string[] {
  return [...new Set(results.filter((r) => r.status >= 400).map((r) => r.body.error?.code as string))].sort();
}

/** The mail owed to `email`, as rows of the outbox (one row per message, whatever became of its sending). */
async function mailTo(email: string): Promise<string[]> {
  return (await t.db.getRepository(OutboxMessage).findBy({ to: email })).map((m) => m.subject).sort();
}

describe.each(raceModes())(`%s, on ${onPostgres ? 'PostgreSQL' : 'SQLite'}`, (mode) => {
  beforeAll(async () => {
    t = await raceTargets(mode);
  }, 120_000);
  afterAll(async () => {
    await t?.close();
  });

  describe('POST /api/bids/:id/award, many at once', () => {
    test('When every bid on a block is awarded several times at once, then one contract, one accepted bid, the others declined, each grazier told once', async () => {
      const grower = await signUp(t, ['grower'], 'Greta Olsen');
      const block = await openBlock(t, grower);
      const graziers = [await grazier(t, 'Wade Kellner'), await grazier(t, 'Mirela Haas'), await grazier(t, 'Ines Brandt')];
      const bids: Array<{ id: string }> = [];
      for (const [i, g] of graziers.entries()) bids.push(await bid(t, g, block.id, stayDates(t.now(), i)));

      // Each bid three times over: different bids racing, and the same bid racing itself.
      const results = await burst(bids.length * 3, (i) => t.api(i).post(`/api/bids/${bids[i % bids.length].id}/award`).set(grower.auth));
      expect(statuses(results)).toEqual([201, ...Array(bids.length * 3 - 1).fill(409)]);
      for (const code of codes(results)) expect(['already_awarded', 'bid_not_live']).toContain(code);

      const winner = results.find((r) => r.status === 201)!.body.contract;
      const contracts = await t.db.getRepository(Contract).findBy({ blockId: block.id });
      expect(contracts.map((c) => c.id)).toEqual([winner.id]);
      const stored = await t.db.getRepository(Bid).findBy({ blockId: block.id });
      expect(stored.filter((b) => b.status === 'accepted').map((b) => b.id)).toEqual([winner.bidId]);
      expect(stored.filter((b) => b.status === 'declined')).toHaveLength(bids.length - 1);
      expect((await t.db.getRepository(Block).findOneByOrFail({ id: block.id })).status).toBe('awarded');

      const won = graziers[bids.findIndex((b) => b.id === winner.bidId)];
      expect(await mailTo(won.email)).toEqual([`Your bid on ${block.name} was accepted`]);
      for (const g of graziers.filter((x) => x !== won)) expect(await mailTo(g.email)).toEqual([`Your bid on ${block.name} was not chosen`]);
    });
  });

  describe('POST /api/contracts/:id/sign, the same party many times at once', () => {
    test('When each party signs many times at once, then one signature each, the contract signed once, one mail per signing', async () => {
      const a = await awarded(t);
      const byGrazier = await signBody(t, a.grazier, a.contractId);
      const first = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/sign`).set(a.grazier.auth).send(byGrazier));
      expect(statuses(first)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      expect(codes(first)).toEqual(['already_signed']);
      expect(await t.db.getRepository(ContractSignature).countBy({ contractId: a.contractId, party: 'grazier' })).toBe(1);
      expect((await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId })).status).toBe('to-sign');

      const byGrower = await signBody(t, a.grower, a.contractId);
      const second = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/sign`).set(a.grower.auth).send(byGrower));
      expect(statuses(second)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      expect(await t.db.getRepository(ContractSignature).countBy({ contractId: a.contractId })).toBe(2);
      expect((await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId })).status).toBe('signed');
      // The grazier's signing told the grower once; the grower's completed it and told both once.
      const signing = async (email: string) => (await mailTo(email)).filter((s) => / signed /.test(s));
      expect(await signing(a.grower.email)).toEqual(['Contract signed by both: North bench walnut middles', 'Wade Kellner signed the contract for North bench walnut middles']);
      expect(await signing(a.grazier.email)).toEqual(['Contract signed by both: North bench walnut middles']);
    });
  });

  describe('POST /api/contracts/:id/sign-off, many at once', () => {
    test('When the grazier proposes many times at once and then the grower approves many times at once, then one round, one agreed figure', async () => {
      const a = await grazed(t);
      const proposed = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/sign-off`).set(a.grazier.auth).send({ action: 'propose' }));
      expect(statuses(proposed)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      for (const code of codes(proposed)) expect(['already_proposed', 'sign_off_changed']).toContain(code);
      const rounds = await t.db.getRepository(SignOff).findBy({ contractId: a.contractId });
      expect(rounds.map((r) => [r.round, r.status])).toEqual([[1, 'proposed']]);

      const approved = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/sign-off`).set(a.grower.auth).send({ action: 'approve' }));
      expect(statuses(approved)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      for (const code of codes(approved)) expect(['already_agreed', 'already_answered']).toContain(code);
      const [round] = await t.db.getRepository(SignOff).findBy({ contractId: a.contractId });
      const contract = await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId });
      expect(round).toMatchObject({ status: 'agreed', agreedHeadDays: rounds[0].proposedHeadDays, agreedBy: 'grower' });
      expect(contract).toMatchObject({ status: 'agreed', agreedHeadDays: rounds[0].proposedHeadDays });
      expect(rounds[0].proposedHeadDays).toBeGreaterThan(0);
      expect((await mailTo(a.grazier.email)).filter((s) => s.startsWith('Head-days'))).toEqual(['Head-days agreed: North bench walnut middles']);
      expect((await mailTo(a.grower.email)).filter((s) => s.startsWith('Head-days'))).toEqual(['Head-days to sign off: North bench walnut middles']);
    });

    test('When the grower approves and disputes at the same moment, then exactly one answer counts and the contract matches it', async () => {
      const a = await grazed(t);
      const propose = await t.api().post(`/api/contracts/${a.contractId}/sign-off`).set(a.grazier.auth).send({ action: 'propose' });
      expect(propose.status).toBe(200);
      const answers = await burst(BURST, (i) =>
        t
          .api(i)
          .post(`/api/contracts/${a.contractId}/sign-off`)
          .set(a.grower.auth)
          .send(i % 2 === 0 ? { action: 'approve' } : { action: 'dispute', headDays: 100, comment: 'Our count is lower' }),
      );
      expect(statuses(answers)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      const winner = answers.find((r) => r.status === 200)!;
      const [round] = await t.db.getRepository(SignOff).findBy({ contractId: a.contractId });
      const contract = await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId });
      if (winner.body.contract.status === 'agreed') {
        expect(round).toMatchObject({ status: 'agreed', counterHeadDays: null, agreedHeadDays: round.proposedHeadDays });
        expect(contract).toMatchObject({ status: 'agreed', agreedHeadDays: round.proposedHeadDays });
      } else {
        expect(round).toMatchObject({ status: 'disputed', counterHeadDays: 100, agreedHeadDays: null });
        expect(contract).toMatchObject({ status: 'sign-off', agreedHeadDays: null });
      }
      expect((await mailTo(a.grazier.email)).filter((s) => /^Head-days (agreed|disputed)/.test(s))).toHaveLength(1);
    });
  });

  describe('POST /api/contracts/:id/log, one entry replayed at once', () => {
    test('When a phone sends the same client id many times at once, then one entry is stored and every answer carries it', async () => {
      const a = await signed(t);
      const [at] = logTimes(t.now(), 1);
      const entry = logEntry('move', at, { change: 600, paddock: 'North cell' });
      const results = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth).send(entry));
      expect(statuses(results)).toEqual([200, ...Array(BURST - 2).fill(200), 201].sort((x, y) => x - y));
      expect(new Set(results.map((r) => r.body.entry.id)).size).toBe(1);
      expect(results.every((r) => r.body.entry.clientId === entry.clientId && r.body.figures.headNow === 600)).toBe(true);
      expect(await t.db.getRepository(LogEntry).countBy({ contractId: a.contractId })).toBe(1);
      expect((await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId })).status).toBe('grazing');
    });

    test('When many different entries arrive at once, then every one is stored (none lost to another)', async () => {
      const a = await signed(t);
      const [inAt, ...times] = logTimes(t.now(), BURST + 1);
      expect((await t.api().post(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth).send(logEntry('move', inAt, { change: 600 }))).status).toBe(201);
      const entries = times.map((at) => logEntry('tally', at, { count: 600, note: 'walked the fence line' }));
      const results = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth).send(entries[i]));
      expect(statuses(results)).toEqual(Array(BURST).fill(201));
      const stored = await t.db.getRepository(LogEntry).findBy({ contractId: a.contractId });
      expect(stored.map((e) => e.clientId).sort()).toEqual([...entries.map((e) => e.clientId), stored.find((e) => e.kind === 'move')!.clientId].sort());
    });
  });

  describe('POST /api/contracts/:id/invoice, many at once', () => {
    test('When the grazier invoices one contract many times at once, then one invoice, one number, one invoice and customer in the payments API, one mail', async () => {
      const a = await agreed(t);
      const [invoicesBefore, customersBefore] = [(await t.stripe.invoices.list({ limit: 100 })).data.length, (await t.stripe.customers.list({ limit: 100 })).data.length];
      const results = await burst(BURST, (i) => t.api(i).post(`/api/contracts/${a.contractId}/invoice`).set(a.grazier.auth).send({}));
      expect(statuses(results)).toEqual([201, ...Array(BURST - 1).fill(409)]);
      expect(codes(results)).toEqual(['already_invoiced']);
      const invoice = results.find((r) => r.status === 201)!.body.invoice;
      expect(invoice).toMatchObject({ status: 'sent', number: 1 });

      expect((await t.db.getRepository(Invoice).findBy({ contractId: a.contractId })).map((i) => i.id)).toEqual([invoice.id]);
      expect(await t.db.getRepository(InvoiceCounter).findOneByOrFail({ grazierId: a.grazier.user.id })).toMatchObject({ lastNumber: 1 });
      const remote = (await t.stripe.invoices.list({ limit: 100 })).data;
      expect(remote).toHaveLength(invoicesBefore + 1);
      expect(remote.filter((r) => r.metadata?.fieldfold_contract_id === a.contractId)).toHaveLength(1);
      expect((await t.stripe.customers.list({ limit: 100 })).data).toHaveLength(customersBefore + 1);
      expect((await mailTo(a.grower.email)).filter((s) => s.startsWith('Invoice '))).toHaveLength(1);
    });
  });

  describe('POST /api/invoices/:id/pay, many at once', () => {
    test('When the grower taps pay many times at once, then the money moves once: one payment in the API, the invoice paid, one receipt each', async () => {
      const a = await invoiced(t);
      const results = await burst(BURST, (i) => t.api(i).post(`/api/invoices/${a.invoiceId}/pay`).set(a.grower.auth).send({ paymentMethod: 'pm_card_visa' }));
      expect(statuses(results)).toEqual([200, ...Array(BURST - 1).fill(409)]);
      for (const code of codes(results)) expect(['already_paid', 'payment_in_progress']).toContain(code);

      const row = await t.db.getRepository(Invoice).findOneByOrFail({ id: a.invoiceId });
      expect(row).toMatchObject({ status: 'paid', payingUntil: null });
      expect(row.payAttempts).toBeGreaterThanOrEqual(1);
      const remote = await t.stripe.invoices.retrieve(row.providerInvoiceId!, { expand: ['payments'] });
      expect(remote.status).toBe('paid');
      expect(remote.payments?.data).toHaveLength(1);
      expect((await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId })).status).toBe('paid');
      expect((await mailTo(a.grower.email)).filter((s) => s.startsWith('Receipt:'))).toHaveLength(1);
      expect((await mailTo(a.grazier.email)).filter((s) => / was paid: /.test(s))).toHaveLength(1);
    });
  });

  describe('POST /api/webhooks/payments, one event many times at once', () => {
    test('When the paid event is delivered many times at once, then it applies once: the invoice paid once, one receipt each, the rest duplicates', async () => {
      const a = await invoiced(t);
      const row = await t.db.getRepository(Invoice).findOneByOrFail({ id: a.invoiceId });
      // Paid in the API directly (a hosted payment page): Fieldfold learns it only from the events.
      await t.stripe.invoices.pay(row.providerInvoiceId!, { payment_method: 'pm_card_visa' });
      const [paid] = t.eventsFor(row.providerInvoiceId!, 'invoice.paid');
      const [succeeded] = t.eventsFor(row.providerInvoiceId!, 'invoice.payment_succeeded');

      const results = await burst(BURST, (i) => t.deliver(i % 2 === 0 ? paid.id : succeeded.id, i));
      expect(statuses(results)).toEqual(Array(BURST).fill(200));
      const outcomes = results.map((r) => r.body.outcome as string);
      // One of the two events paid the invoice; each event was stored once; every other delivery changed nothing.
      expect(outcomes.filter((o) => o === 'applied')).toHaveLength(1);
      expect(outcomes.filter((o) => o === 'no-change')).toHaveLength(1);
      expect(outcomes.filter((o) => o === 'duplicate')).toHaveLength(BURST - 2);
      expect((await t.db.getRepository(PaymentEventRecord).findBy([{ id: paid.id }, { id: succeeded.id }])).map((e) => e.invoiceId)).toEqual([a.invoiceId, a.invoiceId]);

      expect(await t.db.getRepository(Invoice).findOneByOrFail({ id: a.invoiceId })).toMatchObject({ status: 'paid', paidWith: null });
      expect((await t.db.getRepository(Contract).findOneByOrFail({ id: a.contractId })).status).toBe('paid');
      expect((await mailTo(a.grower.email)).filter((s) => s.startsWith('Receipt:'))).toHaveLength(1);
      expect((await mailTo(a.grazier.email)).filter((s) => / was paid: /.test(s))).toHaveLength(1);
    });
  });

  describe('the outbox senders of every server', () => {
    test('When every server sends at once, then each message owed goes once and is marked sent', async () => {
      const a = await awarded(t);
      await t.settleMail();
      const rows = await t.db.getRepository(OutboxMessage).findBy([{ to: a.grower.email }, { to: a.grazier.email }]);
      expect(rows.length).toBeGreaterThan(0);
      for (const r of rows) expect(r).toMatchObject({ status: 'sent', attempts: 1, claimedUntil: null });
    });
  });
});
