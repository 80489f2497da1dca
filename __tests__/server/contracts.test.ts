import { makeTestApp } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { canonicalTermsText } from '../../lib/contract-terms';
import { sha256Hex } from '../../server/modules/contracts/contract-state';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { ContractSignature } from '../../server/modules/contracts/contract-records.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let c: ReturnType<typeof contracts>;
beforeEach(async () => {
  t = await makeTestApp();
  c = contracts(t);
});
afterEach(() => t.close());

describe('POST /api/contracts/:id/sign', () => {
  it('When both parties sign, then the contract is signed, each signature keeps who, when, where from and the hash of the text they read', async () => {
    const a = await c.awarded();
    const before = await c.read(a.grower, a.contractId);
    expect(before).toMatchObject({ status: 'to-sign', termsVersion: 1, signatures: [], viewer: { party: 'grower', mustSign: true } });
    // The hash is SHA-256 of the canonical text shown on the screen.
    expect(before.termsHash).toBe(sha256Hex(before.termsText));
    expect(before.termsText).toContain('Animals out by: 2027-03-01 (Mar 1, 2027)');
    expect(before.cautions.map((x: { key: string }) => x.key)).toContain('food-safety-harvest');

    const g = await c.sign(a.grower, a.contractId);
    expect(g.status).toBe(200);
    expect(g.body.contract.status).toBe('to-sign');
    expect(g.body.contract.viewer.mustSign).toBe(false);
    const z = await c.sign(a.grazier, a.contractId);
    expect(z.status).toBe(200);
    expect(z.body.contract.status).toBe('signed');
    expect(z.body.contract.signatures.map((s: { party: string }) => s.party).sort()).toEqual(['grazier', 'grower']);

    const rows = await t.dataSource.getRepository(ContractSignature).findBy({ contractId: a.contractId });
    expect(rows).toHaveLength(2);
    for (const r of rows) {
      expect(r.termsHash).toBe(before.termsHash);
      expect(r.userAgent).toBe('fieldfold-tests/1.0');
      expect(r.ip).toMatch(/127\.0\.0\.1|::1|::ffff:127\.0\.0\.1/);
      expect(r.cautionsAcknowledged).toBe(true);
    }
    const stored = await t.dataSource.getRepository(Contract).findOneByOrFail({ id: a.contractId });
    expect(stored.termsHash).toBe(sha256Hex(canonicalTermsText(stored.terms!)));

    await t.deliverMail();
    expect(t.mail.to(a.grazier.email).map((m) => m.subject)).toContain('Greta Olsen signed the contract for North bench walnut middles');
    expect(t.mail.to(a.grower.email).map((m) => m.subject)).toContain('Contract signed by both: North bench walnut middles');
  });

  it('When a party signs twice, then 409; and two signatures racing give one', async () => {
    const a = await c.awarded();
    expect((await c.sign(a.grower, a.contractId)).status).toBe(200);
    const again = await c.sign(a.grower, a.contractId);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_signed');

    const [x, y] = await Promise.all([c.sign(a.grazier, a.contractId), c.sign(a.grazier, a.contractId)]);
    expect([x.status, y.status].sort()).toEqual([200, 409]);
    expect(await t.dataSource.getRepository(ContractSignature).countBy({ contractId: a.contractId })).toBe(2);
  });
});

describe('signing: what the signer must give', () => {
  it('When the name is missing and the cautions are not ticked, then 400 naming both', async () => {
    const a = await c.awarded();
    const res = await c.sign(a.grower, a.contractId, { typedName: '', cautionsAcknowledged: false });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['cautionsAcknowledged', 'typedName']);
  });

  it('When the signer read other terms than those waiting (a stale hash), then 409 and nothing is signed', async () => {
    const a = await c.awarded();
    const res = await c.sign(a.grower, a.contractId, { termsHash: 'a'.repeat(64) });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('terms_changed');
    expect(await t.dataSource.getRepository(ContractSignature).countBy({ contractId: a.contractId })).toBe(0);
  });
});

describe('reading contracts', () => {
  it('When someone who is not a party asks for a contract, then 404, and their list is empty', async () => {
    const a = await c.awarded();
    const stranger = await c.grazier('Stella Stranger');
    const res = await c.api().get(`/api/contracts/${a.contractId}`).set(stranger.auth);
    expect(res.status).toBe(404);
    const list = await c.api().get('/api/contracts').set(stranger.auth);
    expect(list.body).toEqual({ items: [], nextCursor: null });
  });

  it('When a party lists contracts, then pages come newest first with a cursor, and status filters in SQL', async () => {
    const a = await c.awarded();
    // A second and third award for the same grower.
    const more: string[] = [];
    for (const name of ['South bench walnut middles', 'Creek block']) {
      const block = await c.openBlock(a.grower, { name });
      const bid = await c.bid(a.grazier, block.id);
      const res = await c.api().post(`/api/bids/${bid.id}/award`).set(a.grower.auth);
      more.push(res.body.contract.id);
    }
    await c.sign(a.grower, more[1]);
    await c.sign(a.grazier, more[1]);
    const seen: string[] = [];
    let cursor: string | null = null;
    do {
      const res: { status: number; body: { items: Array<{ id: string }>; nextCursor: string | null } } = await c.api().get('/api/contracts').query({ limit: 2, ...(cursor ? { cursor } : {}) }).set(a.grower.auth);
      expect(res.status).toBe(200);
      expect(res.body.items.length).toBeLessThanOrEqual(2);
      seen.push(...res.body.items.map((x) => x.id));
      cursor = res.body.nextCursor;
    } while (cursor);
    expect(seen.sort()).toEqual([a.contractId, ...more].sort());
    const signedOnly = await c.api().get('/api/contracts?status=signed').set(a.grazier.auth);
    expect(signedOnly.body.items.map((x: { id: string }) => x.id)).toEqual([more[1]]);
    // List views are light: no terms text, but the hash and signatures.
    expect(signedOnly.body.items[0].termsText).toBeUndefined();
    expect(signedOnly.body.items[0].signatures).toHaveLength(2);

    const bad = await c.api().get('/api/contracts?cursor=not-ours&limit=500').set(a.grower.auth);
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['limit']);
    const forged = await c.api().get(`/api/contracts?cursor=${Buffer.from('{"x":1}').toString('base64url')}`).set(a.grower.auth);
    expect(forged.status).toBe(400);
    expect(forged.body.error.fields).toHaveProperty('cursor');
  });
});

describe('amendments', () => {
  it('When an amendment both signed changes the head count, then it clears both signatures and needs re-signing; until both sign the signed version stands', async () => {
    const a = await c.signed();
    const v1 = await c.read(a.grower, a.contractId);
    const res = await c.api().post(`/api/contracts/${a.contractId}/amendments`).set(a.grazier.auth).send({ headCount: 550, endDate: '2027-01-30', reason: 'Fifty ewes went to the sale yard' });
    expect(res.status).toBe(201);
    expect(res.body.amendment).toMatchObject({ version: 2, status: 'proposed', proposedBy: 'grazier', signatures: [] });
    expect(res.body.amendment.changes.map((x: { field: string }) => x.field)).toEqual(['headCount', 'endDate']);
    expect(res.body.amendment.termsText).toContain('Head: 550');
    expect(res.body.amendment.termsHash).toBe(sha256Hex(res.body.amendment.termsText));

    // Both must sign the new version, the proposer too; the signed version stands meanwhile.
    for (const who of [a.grower, a.grazier]) {
      const seen = await c.read(who, a.contractId);
      expect(seen).toMatchObject({ status: 'signed', headCount: 600, termsVersion: 1, termsHash: v1.termsHash, viewer: { mustSign: true, canAmend: false } });
      expect(seen.signatures).toHaveLength(2);
    }
    const second = await c.api().post(`/api/contracts/${a.contractId}/amendments`).set(a.grower.auth).send({ headCount: 500, reason: 'Fewer still' });
    expect(second.status).toBe(409);

    expect((await c.sign(a.grower, a.contractId)).status).toBe(200);
    const half = await c.read(a.grazier, a.contractId);
    expect(half).toMatchObject({ headCount: 600, termsVersion: 1 });
    expect(half.pendingAmendment.signatures.map((s: { party: string }) => s.party)).toEqual(['grower']);

    const done = await c.sign(a.grazier, a.contractId);
    expect(done.status).toBe(200);
    expect(done.body.contract).toMatchObject({ status: 'signed', headCount: 550, endDate: '2027-01-30', termsVersion: 2, pendingAmendment: null });
    expect(done.body.contract.termsHash).toBe(res.body.amendment.termsHash);
    expect(done.body.contract.termsHash).not.toBe(v1.termsHash);
    expect(done.body.contract.signatures.map((s: { termsVersion: number }) => s.termsVersion)).toEqual([2, 2]);
    expect(done.body.contract.amendments.map((x: { status: string }) => x.status)).toEqual(['agreed']);
    expect((await c.sign(a.grazier, a.contractId)).status).toBe(409);

    await t.deliverMail();
    expect(t.mail.to(a.grower.email).map((m) => m.subject)).toEqual(expect.arrayContaining(['Amendment proposed: North bench walnut middles', 'Amendment signed: new terms for North bench walnut middles']));
    expect(t.mail.to(a.grazier.email).map((m) => m.subject)).toContain('Greta Olsen signed the amendment for North bench walnut middles');
  });

  it('When an amendment breaks the stay, changes nothing or comes from a stranger, then 400 naming the field, 400, or 404', async () => {
    const a = await c.signed();
    const url = `/api/contracts/${a.contractId}/amendments`;
    const late = await c.api().post(url).set(a.grower.auth).send({ endDate: '2027-03-05', reason: 'Longer stay' });
    expect(late.status).toBe(400);
    expect(late.body.error.fields.endDate).toMatch(/out-by/);
    const harvest = await c.api().post(url).set(a.grower.auth).send({ outBy: '2027-09-25', reason: 'Later out-by' });
    expect(harvest.status).toBe(400);
    expect(harvest.body.error.fields.outBy).toMatch(/harvest/);
    const same = await c.api().post(url).set(a.grower.auth).send({ headCount: 600, reason: 'No change' });
    expect(same.status).toBe(400);
    const basisOnly = await c.api().post(url).set(a.grower.auth).send({ basis: 'acre', reason: 'Per acre instead' });
    expect(basisOnly.status).toBe(400);
    expect(basisOnly.body.error.fields).toHaveProperty('rate');
    const headDays = await c.api().post(url).set(a.grower.auth).send({ agreedHeadDays: 5000, reason: 'Too early' });
    expect(headDays.status).toBe(400);
    expect(headDays.body.error.fields).toHaveProperty('agreedHeadDays');
    const stranger = await c.grower('Sam Stranger');
    expect((await c.api().post(url).set(stranger.auth).send({ headCount: 500, reason: 'Not mine' })).status).toBe(404);
  });

  it('When the other party declines, or the proposer withdraws, then the signed terms stand and a new proposal takes the next number', async () => {
    const a = await c.signed();
    const url = `/api/contracts/${a.contractId}/amendments`;
    const p1 = await c.api().post(url).set(a.grower.auth).send({ rate: '0.17', reason: 'Price agreed by phone' });
    expect(p1.status).toBe(201);
    expect((await c.api().post(`${url}/${p1.body.amendment.id}/withdraw`).set(a.grazier.auth)).status).toBe(403);
    const declined = await c.api().post(`${url}/${p1.body.amendment.id}/decline`).set(a.grazier.auth);
    expect(declined.status).toBe(200);
    expect(declined.body.contract).toMatchObject({ rate: '0.18', termsVersion: 1, pendingAmendment: null });
    expect((await c.api().post(`${url}/${p1.body.amendment.id}/decline`).set(a.grazier.auth)).status).toBe(409);

    const p2 = await c.api().post(url).set(a.grower.auth).send({ rate: '0.175', reason: 'Split the difference' });
    expect(p2.body.amendment.version).toBe(3);
    const withdrawn = await c.api().post(`${url}/${p2.body.amendment.id}/withdraw`).set(a.grower.auth);
    expect(withdrawn.body.contract.amendments.map((x: { status: string }) => x.status)).toEqual(['declined', 'withdrawn']);
  });
});

describe('POST /api/contracts/:id/cancel', () => {
  it('When a party cancels before the animals arrive, then the contract is cancelled with the reason, and both are mailed', async () => {
    const a = await c.signed();
    const bad = await c.api().post(`/api/contracts/${a.contractId}/cancel`).set(a.grazier.auth).send({});
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('reason');
    const res = await c.api().post(`/api/contracts/${a.contractId}/cancel`).set(a.grazier.auth).send({ reason: 'The truck broke down for the month' });
    expect(res.status).toBe(200);
    expect(res.body.contract).toMatchObject({ status: 'cancelled', cancellation: { by: 'grazier', byName: 'Wade Kellner', reason: 'The truck broke down for the month' } });
    expect((await c.api().post(`/api/contracts/${a.contractId}/cancel`).set(a.grower.auth).send({ reason: 'Again' })).status).toBe(409);
    await t.deliverMail();
    expect(t.mail.to(a.grower.email).at(-1)!.subject).toBe('Contract cancelled: North bench walnut middles');
    expect(t.mail.to(a.grower.email).at(-1)!.text).toContain('The truck broke down for the month');
    expect(t.mail.to(a.grazier.email).at(-1)!.subject).toBe('Contract cancelled: North bench walnut middles');
  });

  it('When the animals are in, then cancelling is 409; a stranger gets 404', async () => {
    const a = await c.signed();
    t.setNow('2027-01-11T12:00:00-08:00');
    await c.logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-10T09:00:00-08:00', change: 600 });
    const res = await c.api().post(`/api/contracts/${a.contractId}/cancel`).set(a.grower.auth).send({ reason: 'Changed my mind' });
    expect(res.status).toBe(409);
    const stranger = await c.grower('Sam Stranger');
    expect((await c.api().post(`/api/contracts/${a.contractId}/cancel`).set(stranger.auth).send({ reason: 'Not mine' })).status).toBe(404);
  });
});

describe('mail while the mail server is down', () => {
  it('When the mail server is down, then signing still stands, the mail waits and goes once, after it is back', async () => {
    await t.close();
    let up = false;
    const delivered: string[] = [];
    const logged: string[] = [];
    t = await makeTestApp({ log: (l) => logged.push(l), mail: { send: async (msg) => (up ? void delivered.push(msg.subject) : Promise.reject(new Error('mail server down'))) } });
    c = contracts(t);
    const a = await c.awarded();
    const res = await c.sign(a.grower, a.contractId);
    expect(res.status).toBe(200);
    await t.deliverMail();
    expect(delivered).toEqual([]);
    expect(logged.some((l) => /\[mail\] "Greta Olsen signed the contract for .*" not sent \(attempt 1\)/.test(l))).toBe(true);
    // Nothing is blocked meanwhile: the other party signs.
    expect((await c.sign(a.grazier, a.contractId)).body.contract.status).toBe('signed');
    // The sender's run after that commit (kicked, not awaited) ends while the server is still down: on PostgreSQL
    // it was still running when the clock moved on below, and set its retry from the moved clock, after the runs below.
    await t.deliverMail();
    expect(delivered).toEqual([]);

    up = true;
    t.setNow(new Date(Date.parse('2026-12-01T12:00:00-08:00') + 60 * 60_000).toISOString());
    await t.deliverMail();
    await t.deliverMail();
    expect(delivered.filter((s) => s === 'Greta Olsen signed the contract for North bench walnut middles')).toHaveLength(1);
    expect(delivered.filter((s) => s === 'Contract signed by both: North bench walnut middles')).toHaveLength(2);
  });
});
