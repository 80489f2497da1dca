import crypto from 'node:crypto';
import { market, type Person } from './market';
import type { makeTestApp } from './test-app';

// Builders for the contract tests: an awarded contract between a fresh grower and grazier, signatures,
// and log entries with their own client ids. Dates follow helpers/market.ts: the default bid stays on the
// walnut block from Jan 10 to Jan 28, 2027 (out by Mar 1), in America/Los_Angeles.

type TestApp = Awaited<ReturnType<typeof makeTestApp>>;

export function clientId(): string {
  return crypto.randomUUID();
}

export function contracts(t: TestApp) {
  const m = market(t);
  const api = m.api;

  async function awarded(over: { block?: Record<string, unknown>; bid?: Record<string, unknown> } = {}) {
    const grower = await m.grower('Greta Olsen');
    const grazier = await m.grazier('Wade Kellner');
    const block = await m.openBlock(grower, over.block);
    const bid = await m.bid(grazier, block.id, over.bid);
    const res = await api().post(`/api/bids/${bid.id}/award`).set(grower.auth);
    if (res.status !== 201) throw new Error(`award failed: ${res.status} ${JSON.stringify(res.body)}`);
    return { grower, grazier, block, bid, contractId: res.body.contract.id as string };
  }

  async function read(who: Person, id: string) {
    const res = await api().get(`/api/contracts/${id}`).set(who.auth);
    if (res.status !== 200) throw new Error(`read failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.contract;
  }

  /** Signs whatever waits for the signer's signature (the terms, or the pending amendment) as shown to them. */
  async function sign(who: Person, id: string, over: Record<string, unknown> = {}) {
    const c = await read(who, id);
    return api()
      .post(`/api/contracts/${id}/sign`)
      .set(who.auth)
      .set('User-Agent', 'fieldfold-tests/1.0')
      .send({ typedName: who.user.name, cautionsAcknowledged: true, termsHash: c.pendingAmendment?.termsHash ?? c.termsHash, ...over });
  }

  async function signed(over: Parameters<typeof awarded>[0] = {}) {
    const a = await awarded(over);
    for (const who of [a.grower, a.grazier]) {
      const res = await sign(who, a.contractId);
      if (res.status !== 200) throw new Error(`sign failed: ${res.status} ${JSON.stringify(res.body)}`);
    }
    return a;
  }

  function log(who: Person, id: string, entry: Record<string, unknown>) {
    return api()
      .post(`/api/contracts/${id}/log`)
      .set(who.auth)
      .send({ clientId: clientId(), ...entry });
  }

  async function logOk(who: Person, id: string, entry: Record<string, unknown>) {
    const res = await log(who, id, entry);
    if (res.status !== 201) throw new Error(`log failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.entry;
  }

  function signOff(who: Person, id: string, body: Record<string, unknown>) {
    return api().post(`/api/contracts/${id}/sign-off`).set(who.auth).send(body);
  }

  /** A signed contract whose grazier logged 600 in on Jan 10 and out on Jan 20, 2027 (10 days: 6 000 head-days). */
  async function grazed(over: Parameters<typeof awarded>[0] = {}) {
    const a = await signed(over);
    t.setNow('2027-01-20T16:00:00-08:00');
    await logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-10T08:00:00-08:00', change: 600, paddock: 'North cell' });
    await logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-20T08:00:00-08:00', change: -600 });
    return a;
  }

  return { ...m, awarded, read, sign, signed, log, logOk, signOff, grazed };
}
