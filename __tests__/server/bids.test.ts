import { makeTestApp, TEST_NOW } from '../helpers/test-app';
import { isUniqueViolation } from '../../server/lib/db/unique-violation';
import { pendingMail } from '../../server/lib/mail/outbox';
import { bidBody, market } from '../helpers/market';
import { normaliseBid } from '../../lib/grazing/bid-compare';
import { Contract } from '../../server/modules/contracts/contract.entity';
import { Bid } from '../../server/modules/bids/bid.entity';
import { Block } from '../../server/modules/blocks/block.entity';
import { markBlockAwarded } from '../../server/modules/bids/bids.service';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let m: ReturnType<typeof market>;
beforeEach(async () => {
  t = await makeTestApp();
  m = market(t);
});
afterEach(() => t.close());

const HERBICIDE = { product: 'Orchard-floor herbicide', appliedOn: '2026-12-28', grazingRestrictionDays: 30, containsCopper: false };

describe('the market journey', () => {
  it('When a grower posts and publishes, graziers find it and bid, and the grower compares and awards, then one contract to sign and the mail that goes with it', async () => {
    const greta = await m.grower('Greta Olsen');
    const wade = await m.grazier('Wade Kellner');
    const mirela = await m.grazier('Mirela Haas', {
      homeLatitude: 39.688,
      homeLongitude: -121.99,
      flock: { species: 'goats', animalClass: 'wethers', headCount: 240, bodyWeightLb: 120 },
    });

    // The grower posts a draft and publishes it.
    const draft = await m.api().post('/api/blocks').set(greta.auth).send({ ...(await import('../helpers/market')).blockBody(), sprayRecords: [HERBICIDE] });
    expect(draft.status).toBe(201);
    const blockId = draft.body.block.id;
    expect((await m.api().post(`/api/blocks/${blockId}/publish`).set(greta.auth)).status).toBe(200);

    // A grazier finds it in the market, within 20 miles, with days of feed for the flock.
    const list = await m.api().get('/api/blocks?maxMiles=20&minDays=10').set(wade.auth);
    expect(list.body.items.map((b: { id: string }) => b.id)).toEqual([blockId]);
    expect(list.body.items[0].earliestSafeDate).toBe('2027-01-27');

    // Two graziers bid.
    const w = await m.bid(wade, blockId, { startDate: '2027-01-27', endDate: '2027-02-14' });
    const z = await m.bid(mirela, blockId, { basis: 'acre', rate: '22.50', headCount: 240, species: 'goats', animalClass: 'wethers', bodyWeightLb: 120, startDate: '2027-02-01', endDate: '2027-03-01' });
    expect(w.status).toBe('live');
    expect(w.normalised).toEqual(normaliseBid({ ...w, basis: 'head-day', rate: '0.18' } as never, { acres: 80, lbDmPerAcre: 2000, targetUtilizationPct: 45 }));

    // The grower was mailed for each bid.
    await t.deliverMail();
    expect(t.mail.to(greta.email).map((x) => x.subject)).toEqual(['New bid on North bench walnut middles', 'New bid on North bench walnut middles']);
    expect(t.mail.to(greta.email)[0].text).toMatch(/600 sheep, 2027-01-27 to 2027-02-14 \(18 days, 10800 head-days\), \$0\.18 per head-day: estimated total \$1,944\.00/);

    // The grower compares: every bid normalised, with the grazier's record.
    const compare = await m.api().get(`/api/blocks/${blockId}/bids`).set(greta.auth);
    expect(compare.status).toBe(200);
    expect(compare.body.items).toHaveLength(2);
    const byGrazier = Object.fromEntries(compare.body.items.map((b: { grazier: { name: string } }) => [b.grazier.name, b]));
    expect(byGrazier['Wade Kellner'].normalised).toMatchObject({ headDays: 10_800, estimatedTotalCents: 194_400, costPerAcreCents: 2_430, costPerHeadDayRate: '0.1800' });
    expect(byGrazier['Mirela Haas'].normalised).toMatchObject({ quantity: 80, estimatedTotalCents: 180_000, costPerAcreCents: 2_250, intakePctBodyWeight: 4.5 });
    expect(byGrazier['Mirela Haas'].grazier).toMatchObject({ completedContracts: 0 });

    // The grower awards Wade's bid.
    await t.deliverMail();
    t.mail.clear();
    const award = await m.api().post(`/api/bids/${w.id}/award`).set(greta.auth);
    expect(award.status).toBe(201);
    expect(award.body.contract).toMatchObject({
      status: 'to-sign',
      blockId,
      bidId: w.id,
      grower: { id: greta.user.id },
      grazier: { id: wade.user.id },
      basis: 'head-day',
      rate: '0.18',
      headCount: 600,
      startDate: '2027-01-27',
      endDate: '2027-02-14',
      outBy: '2027-03-01',
      acres: 80,
    });
    expect(award.body.contract.normalised.estimatedTotalCents).toBe(194_400);

    // The others are declined, the block is awarded, the mail is out.
    const after = await m.api().get(`/api/blocks/${blockId}/bids`).set(greta.auth);
    expect(Object.fromEntries(after.body.items.map((b: { id: string; status: string }) => [b.id, b.status]))).toEqual({ [w.id]: 'accepted', [z.id]: 'declined' });
    expect((await m.api().get(`/api/blocks/${blockId}`).set(greta.auth)).body.block.status).toBe('awarded');
    await t.deliverMail();
    expect(t.mail.to(wade.email).map((x) => x.subject)).toEqual(['Your bid on North bench walnut middles was accepted']);
    expect(t.mail.to(mirela.email).map((x) => x.subject)).toEqual(['Your bid on North bench walnut middles was not chosen']);

    // Both parties see the contract; the winner still sees the block, the other grazier no longer does.
    expect((await m.api().get('/api/contracts').set(greta.auth)).body.items).toHaveLength(1);
    expect((await m.api().get(`/api/contracts/${award.body.contract.id}`).set(wade.auth)).status).toBe(200);
    expect((await m.api().get(`/api/contracts/${award.body.contract.id}`).set(mirela.auth)).status).toBe(404);
    expect((await m.api().get('/api/contracts').set(mirela.auth)).body.items).toEqual([]);
    expect((await m.api().get(`/api/blocks/${blockId}`).set(wade.auth)).status).toBe(200);
    expect((await m.api().get(`/api/blocks/${blockId}`).set(mirela.auth)).status).toBe(404);
    // The declined grazier still finds their own bid among their bids.
    const mine = await m.api().get('/api/bids?status=declined').set(mirela.auth);
    expect(mine.body.items.map((b: { id: string }) => b.id)).toEqual([z.id]);
  });
});

describe('POST /api/blocks/:id/bids', () => {
  it('When the start is inside a spray restriction, then 400 names startDate, the product and the earliest safe date', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g, { sprayRecords: [HERBICIDE] });
    const res = await m.api().post(`/api/blocks/${b.id}/bids`).set((await m.grazier()).auth).send(bidBody({ startDate: '2027-01-20', endDate: '2027-02-10' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.startDate).toMatch(/inside a pesticide grazing restriction: Orchard-floor herbicide was applied on 2026-12-28 .* no grazing for 30 days\. The earliest safe date is 2027-01-27/);
  });

  it('When the stay runs past out-by, starts before the window, brings goats to a sheep block or starts in the past, then 400 names each', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g, { speciesAllowed: ['sheep'] });
    const z = await m.grazier();
    const res = await m.api().post(`/api/blocks/${b.id}/bids`).set(z.auth).send(bidBody({ startDate: '2027-01-02', endDate: '2027-03-03', species: 'goats', animalClass: 'wethers' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      startDate: "Start date must be on or after the block's earliest-in date, 2027-01-04",
      endDate: 'End date must be on or before the animals-out-by date, 2027-03-01, which the grower set before harvest',
      species: 'The grower allows only sheep on this block',
    });
    t.setNow('2027-01-15T08:00:00-08:00');
    const late = await m.api().post(`/api/blocks/${b.id}/bids`).set(z.auth).send(bidBody());
    expect(late.status).toBe(400);
    expect(late.body.error.fields.startDate).toMatch(/has passed \(today is 2027-01-15/);
  });

  it('When the body is malformed, then 400 names each field before anything else is looked at', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const res = await m.api().post(`/api/blocks/${b.id}/bids`).set((await m.grazier()).auth).send(bidBody({ rate: '-1', headCount: 0, basis: 'per-sheep', extra: true }));
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['basis', 'extra', 'headCount', 'rate']);
  });

  it('When a bid would price out beyond exact integer cents, then 400 names the rate and nothing is stored', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g, { crop: 'pasture', windowEnd: '2040-12-31', outBy: '2040-12-30', harvestDate: null });
    const z = await m.grazier();
    // 20 000 head × 5 103 days × $1 000 000 per head-day ≈ 1.02 × 10^16 cents, past 2^53.
    const res = await m.api().post(`/api/blocks/${b.id}/bids`).set(z.auth).send(bidBody({ rate: '1000000', headCount: 20_000, endDate: '2040-12-30' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.rate).toMatch(/too large/);
    expect((await m.api().get('/api/bids').set(z.auth)).body.items).toEqual([]);
  });

  it('When a grazier bids twice on one block, then 409; after withdrawing, they may bid again', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const z = await m.grazier();
    const first = await m.bid(z, b.id);
    const again = await m.api().post(`/api/blocks/${b.id}/bids`).set(z.auth).send(bidBody());
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('bid_exists');
    expect((await m.api().post(`/api/bids/${first.id}/withdraw`).set(z.auth)).body.bid.status).toBe('withdrawn');
    expect((await m.api().post(`/api/blocks/${b.id}/bids`).set(z.auth).send(bidBody())).status).toBe(201);
  });

  it('When the block is a draft of someone else, then 404; when a grower who is also a grazier bids on their own block, then 403', async () => {
    const g = await m.grower();
    const d = await m.draft(g);
    expect((await m.api().post(`/api/blocks/${d.id}/bids`).set((await m.grazier()).auth).send(bidBody())).status).toBe(404);
    const both = await t.signUp(['grower', 'grazier'], 'Both Roles');
    const own = await m.api().post('/api/blocks').set(both.auth).send((await import('../helpers/market')).blockBody());
    await m.api().post(`/api/blocks/${own.body.block.id}/publish`).set(both.auth);
    const res = await m.api().post(`/api/blocks/${own.body.block.id}/bids`).set(both.auth).send(bidBody());
    expect(res.status).toBe(403);
  });

  it('When a grower-only account bids, then 403 for the role', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    expect((await m.api().post(`/api/blocks/${b.id}/bids`).set((await m.grower('Other')).auth).send(bidBody())).status).toBe(403);
  });

  it('When a bid would eat more than the target, then it is accepted but flagged overgrazes, and the grower is told', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g, { acres: 36, lbDmPerAcre: 1800, targetUtilizationPct: 40 });
    const bid = await m.bid(await m.grazier(), b.id, { basis: 'flat', rate: '4200', startDate: '2027-01-20', endDate: '2027-02-03' });
    expect(bid.normalised.overgrazes).toBe(true);
    expect(bid.normalised.predictedUtilizationPct).toBeCloseTo(48.6111, 3);
    await t.deliverMail();
    expect(t.mail.to(g.email)[0].text).toMatch(/Predicted utilisation 49 % is above your target of 40 %/);
  });
});

describe('who may see and change a bid', () => {
  it('When a grazier reads or changes another grazier\'s bid, then 404 — its existence does not leak — and the block\'s bid list shows only their own', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const a = await m.grazier('Grazier A');
    const other = await m.grazier('Grazier B');
    const bidA = await m.bid(a, b.id);
    expect((await m.api().get(`/api/bids/${bidA.id}`).set(other.auth)).status).toBe(404);
    expect((await m.api().patch(`/api/bids/${bidA.id}`).set(other.auth).send({ rate: '0.01' })).status).toBe(404);
    expect((await m.api().post(`/api/bids/${bidA.id}/withdraw`).set(other.auth)).status).toBe(404);
    const list = await m.api().get(`/api/blocks/${b.id}/bids`).set(other.auth);
    expect(list.status).toBe(200);
    expect(list.body.items).toEqual([]);
    expect((await m.api().get(`/api/bids/${bidA.id}`).set(a.auth)).body.bid.rate).toBe('0.18');
  });

  it('When the block owner tries to change a grazier\'s bid, then 403 (they can see it, but it is not theirs)', async () => {
    const both = await t.signUp(['grower', 'grazier'], 'Both Roles');
    const own = await m.api().post('/api/blocks').set(both.auth).send((await import('../helpers/market')).blockBody());
    await m.api().post(`/api/blocks/${own.body.block.id}/publish`).set(both.auth);
    const bid = await m.bid(await m.grazier(), own.body.block.id);
    expect((await m.api().get(`/api/bids/${bid.id}`).set(both.auth)).status).toBe(200);
    const res = await m.api().patch(`/api/bids/${bid.id}`).set(both.auth).send({ rate: '0.01' });
    expect(res.status).toBe(403);
  });

  it('When a grower asks for or awards bids on someone else\'s block, then 404', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const bid = await m.bid(await m.grazier(), b.id);
    const stranger = await m.grower('Stranger');
    expect((await m.api().get(`/api/blocks/${b.id}/bids`).set(stranger.auth)).status).toBe(404);
    expect((await m.api().post(`/api/bids/${bid.id}/award`).set(stranger.auth)).status).toBe(404);
    expect((await m.api().get(`/api/bids/${bid.id}`).set(stranger.auth)).status).toBe(404);
  });

  it('When the grazier edits their live bid, then it is checked again in full; after the award it is 409', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const z = await m.grazier();
    const bid = await m.bid(z, b.id);
    const ok = await m.api().patch(`/api/bids/${bid.id}`).set(z.auth).send({ endDate: '2027-02-05', rate: '0.200' });
    expect(ok.status).toBe(200);
    expect(ok.body.bid).toMatchObject({ endDate: '2027-02-05', rate: '0.20', normalised: { days: 26 } });
    await t.deliverMail();
    expect(t.mail.to(g.email).map((x) => x.subject)).toContain('Bid changed on North bench walnut middles');
    const bad = await m.api().patch(`/api/bids/${bid.id}`).set(z.auth).send({ endDate: '2027-03-04' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.endDate).toMatch(/animals-out-by/);
    expect((await m.api().post(`/api/bids/${bid.id}/award`).set(g.auth)).status).toBe(201);
    const late = await m.api().patch(`/api/bids/${bid.id}`).set(z.auth).send({ note: 'too late' });
    expect(late.status).toBe(409);
    expect(late.body.error.code).toBe('bid_not_live');
  });
});

describe('POST /api/bids/:id/award', () => {
  it('When two different bids on one block are awarded at the same moment, then exactly one 201 and one 409, and one contract', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const one = await m.bid(await m.grazier('One'), b.id);
    const two = await m.bid(await m.grazier('Two'), b.id, { startDate: '2027-01-15' });
    const results = await Promise.all([m.api().post(`/api/bids/${one.id}/award`).set(g.auth), m.api().post(`/api/bids/${two.id}/award`).set(g.auth)]);
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    expect(results.find((r) => r.status === 409)!.body.error.code).toBe('already_awarded');
    expect(await t.dataSource.getRepository(Contract).countBy({ blockId: b.id })).toBe(1);
    const statuses = (await t.dataSource.getRepository(Bid).findBy({ blockId: b.id })).map((x) => x.status).sort();
    expect(statuses).toEqual(['accepted', 'declined']);
  });

  it('When a stale read of an open block slips past the status check, then the conditional UPDATE changes no row and refuses with 409', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const stale = await t.dataSource.getRepository(Block).findOneByOrFail({ id: b.id });
    await t.dataSource.getRepository(Block).update({ id: b.id }, { status: 'awarded' });
    expect(stale.status).toBe('open');
    await expect(markBlockAwarded(t.dataSource.manager, stale, new Date())).rejects.toMatchObject({ status: 409, code: 'already_awarded' });
  });

  it('When two contracts or two accepted bids for one block reach the database, then its unique keys refuse the second', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const one = await m.bid(await m.grazier('One'), b.id);
    const two = await m.bid(await m.grazier('Two'), b.id, { startDate: '2027-01-15' });
    await m.api().post(`/api/bids/${one.id}/award`).set(g.auth);
    const contract = await t.dataSource.getRepository(Contract).findOneByOrFail({ blockId: b.id });
    const secondContract = await t.dataSource.getRepository(Contract).insert({ ...contract, id: 'second-contract', bidId: two.id }).catch((e: unknown) => e);
    expect(isUniqueViolation(secondContract)).toBe(true);
    const secondAccepted = await t.dataSource.getRepository(Bid).update({ id: two.id }, { status: 'accepted' }).catch((e: unknown) => e);
    expect(isUniqueViolation(secondAccepted)).toBe(true);
  });

  it('When the same bid is awarded twice at once, then one 201 and one 409', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const one = await m.bid(await m.grazier(), b.id);
    const results = await Promise.all([1, 2].map(() => m.api().post(`/api/bids/${one.id}/award`).set(g.auth)));
    expect(results.map((r) => r.status).sort()).toEqual([201, 409]);
    expect(await t.dataSource.getRepository(Contract).countBy({ blockId: b.id })).toBe(1);
  });

  it('When the bid\'s own grazier calls award, then 403 for the role; a withdrawn bid cannot be awarded (409)', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const z = await m.grazier();
    const bid = await m.bid(z, b.id);
    expect((await m.api().post(`/api/bids/${bid.id}/award`).set(z.auth)).status).toBe(403);
    await m.api().post(`/api/bids/${bid.id}/withdraw`).set(z.auth);
    const res = await m.api().post(`/api/bids/${bid.id}/award`).set(g.auth);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('bid_not_live');
  });

  it('When the mail server is down, then the award still stands, the mail waits in the outbox and goes once the server is back', async () => {
    await t.close();
    const logged: string[] = [];
    const delivered: string[] = [];
    let up = false;
    t = await makeTestApp({
      log: (msg) => logged.push(msg),
      mail: { send: async (msg) => (up ? void delivered.push(msg.subject) : Promise.reject(new Error('mail server down'))) },
    });
    m = market(t);
    const g = await m.grower();
    const b = await m.openBlock(g);
    const bid = await m.bid(await m.grazier(), b.id);
    const res = await m.api().post(`/api/bids/${bid.id}/award`).set(g.auth);
    expect(res.status).toBe(201);
    await t.deliverMail();
    expect(await t.dataSource.getRepository(Contract).countBy({ blockId: b.id })).toBe(1);
    expect(logged.some((l) => /\[mail\] "Your bid on .* was accepted" not sent \(attempt 1\), retrying in 5 s: mail server down/.test(l))).toBe(true);
    expect(await pendingMail(t.dataSource)).toBeGreaterThan(0);
    // Back up, and past the backoff: every waiting message goes, each once.
    up = true;
    t.setNow(new Date(TEST_NOW + 60_000).toISOString());
    await t.deliverMail();
    await t.deliverMail();
    expect(delivered.filter((s) => /was accepted/.test(s))).toHaveLength(1);
    expect(await pendingMail(t.dataSource)).toBe(0);
  });
});

describe('editing an open block that has live bids', () => {
  it('When the grower narrows the window past a live bid, then 409 live_bids_conflict and nothing changes', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    await m.bid(await m.grazier(), b.id, { startDate: '2027-01-10', endDate: '2027-02-20' });
    const res = await m.api().patch(`/api/blocks/${b.id}`).set(g.auth).send({ outBy: '2027-02-15' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('live_bids_conflict');
    expect(res.body.error.message).toMatch(/1 live bid would no longer fit .* 2027-01-10 to 2027-02-20 .* animals-out-by date, 2027-02-15/);
    expect((await m.api().get(`/api/blocks/${b.id}`).set(g.auth)).body.block.outBy).toBe('2027-03-01');
  });

  it('When the grower records a new spray that covers a live bid\'s start, then the record is kept, the bid is flagged, its grazier mailed, and it cannot be awarded until moved', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const z = await m.grazier();
    const bid = await m.bid(z, b.id, { startDate: '2027-01-10', endDate: '2027-02-10' });
    const res = await m.api().patch(`/api/blocks/${b.id}`).set(g.auth).send({ sprayRecords: [HERBICIDE] });
    expect(res.status).toBe(200);
    expect(res.body.block.earliestSafeDate).toBe('2027-01-27');
    const seen = await m.api().get(`/api/bids/${bid.id}`).set(z.auth);
    expect(seen.body.bid.conflicts).toEqual([{ field: 'startDate', message: expect.stringMatching(/earliest safe date is 2027-01-27/) }]);
    await t.deliverMail();
    const mail = t.mail.to(z.email).at(-1)!;
    expect(mail.subject).toBe('Block changed: North bench walnut middles');
    expect(mail.text).toMatch(/Changed: sprayRecords\..*cannot be awarded until you change it/s);
    const blocked = await m.api().post(`/api/bids/${bid.id}/award`).set(g.auth);
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.code).toBe('bid_conflicts_block');
    expect((await m.api().patch(`/api/bids/${bid.id}`).set(z.auth).send({ startDate: '2027-01-27' })).status).toBe(200);
    expect((await m.api().post(`/api/bids/${bid.id}/award`).set(g.auth)).status).toBe(201);
  });

  it('When the grower withdraws an open block, then live bids are declined and their graziers told', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const z = await m.grazier();
    const bid = await m.bid(z, b.id);
    const res = await m.api().post(`/api/blocks/${b.id}/withdraw`).set(g.auth);
    expect(res.body.block.status).toBe('withdrawn');
    expect((await m.api().get(`/api/bids/${bid.id}`).set(z.auth)).body.bid.status).toBe('declined');
    await t.deliverMail();
    expect(t.mail.to(z.email).map((x) => x.subject)).toContain('Block withdrawn: North bench walnut middles');
    expect((await m.api().post(`/api/blocks/${b.id}/withdraw`).set(g.auth)).status).toBe(409);
  });
});
