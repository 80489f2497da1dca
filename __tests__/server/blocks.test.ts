import { makeTestApp } from '../helpers/test-app';
import { blockBody, market } from '../helpers/market';
import { forageFromHeight, forageFromSamples } from '../../lib/grazing/forage';
import { capacity } from '../../lib/grazing/capacity';
import { distanceMiles } from '../../lib/geo';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let m: ReturnType<typeof market>;
beforeEach(async () => {
  t = await makeTestApp();
  m = market(t);
});
afterEach(() => t.close());

describe('POST /api/blocks', () => {
  it('When a grower posts a block measured by clipped samples, then it is a draft whose lb DM/ac is exactly the lib result', async () => {
    const g = await m.grower();
    const samples = { frameAreaM2: 0.25, samples: [{ dryGrams: 52 }, { dryGrams: 61 }, { freshGrams: 240, dryMatterPct: 22 }] };
    const { lbDmPerAcre: _, ...body } = blockBody();
    const res = await m.api().post('/api/blocks').set(g.auth).send({ ...body, forageMethod: 'samples', forageSamples: samples });
    expect(res.status).toBe(201);
    expect(res.body.block).toMatchObject({ status: 'draft', forageMethod: 'samples', forageSamples: samples, timeZone: 'America/Los_Angeles', owner: { id: g.user.id } });
    expect(res.body.block.lbDmPerAcre).toBe(forageFromSamples(samples).lbDmPerAcre);
    // And it is stored that way, not only echoed.
    const again = await m.api().get(`/api/blocks/${res.body.block.id}`).set(g.auth);
    expect(again.body.block.lbDmPerAcre).toBe(forageFromSamples(samples).lbDmPerAcre);
  });

  it('When a grower posts a block measured by stand height, then lb DM/ac is forageFromHeight of the reading', async () => {
    const g = await m.grower();
    const { lbDmPerAcre: _, ...body } = blockBody();
    const forageHeight = { heightIn: 8, residualIn: 3, lbDmPerAcrePerInch: 275 };
    const res = await m.api().post('/api/blocks').set(g.auth).send({ ...body, forageMethod: 'height', forageHeight });
    expect(res.status).toBe(201);
    expect(res.body.block.lbDmPerAcre).toBe(forageFromHeight(forageHeight).lbDmPerAcre);
  });

  it('When acres are negative and the dates are out of order or impossible, then 400 names each field and nothing is stored', async () => {
    const g = await m.grower();
    const res = await m
      .api()
      .post('/api/blocks')
      .set(g.auth)
      .send(blockBody({ acres: -12, windowStart: '2027-03-01', windowEnd: '2027-02-01', outBy: '2027-02-30', sprayRecords: [{ product: 'X', appliedOn: '2026-13-01', grazingRestrictionDays: -1, containsCopper: false }] }));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(res.body.error.fields).toMatchObject({
      acres: 'Acres must be more than 0',
      windowEnd: 'Latest out must be after the earliest-in date',
      outBy: 'Animals out by must be a real date like 2027-01-15',
      'sprayRecords[0].appliedOn': 'Date applied must be a real date like 2027-01-15',
      'sprayRecords[0].grazingRestrictionDays': 'Grazing restriction must be 0 days or more',
    });
    expect((await m.api().get('/api/blocks').set(g.auth)).body.total).toBe(0);
  });

  it('When acres come as text or an unknown field is sent, then 400 refuses them rather than coercing or ignoring', async () => {
    const g = await m.grower();
    const res = await m.api().post('/api/blocks').set(g.auth).send(blockBody({ acres: '80', status: 'open' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ acres: 'Acres must be a number', status: 'Unknown field: status' });
  });

  it('When a grazier calls the grower-only route, then 403; when nobody is signed in, then 401', async () => {
    const z = await m.grazier();
    const res = await m.api().post('/api/blocks').set(z.auth).send(blockBody());
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
    expect((await m.api().post('/api/blocks').send(blockBody())).status).toBe(401);
  });
});

describe('POST /api/blocks/:id/publish', () => {
  it('When the owner publishes a draft, then it is open; publishing again is 409', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const res = await m.api().post(`/api/blocks/${b.id}/publish`).set(g.auth);
    expect(res.status).toBe(200);
    expect(res.body.block.status).toBe('open');
    expect(res.body.block.publishedAt).toEqual(expect.any(String));
    const again = await m.api().post(`/api/blocks/${b.id}/publish`).set(g.auth);
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('already_open');
  });

  it('When the out-by date has passed at the block, then 409 out_by_passed says so', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    t.setNow('2027-03-01T09:00:00-08:00');
    const res = await m.api().post(`/api/blocks/${b.id}/publish`).set(g.auth);
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: 'out_by_passed', message: expect.stringMatching(/2027-03-01.*today \(2027-03-01\)/) });
  });

  it('When a spray restriction runs past out-by, then 409 names the restriction: there is no safe day', async () => {
    const g = await m.grower();
    const b = await m.draft(g, { sprayRecords: [{ product: 'Long-label herbicide', appliedOn: '2026-12-20', grazingRestrictionDays: 90, containsCopper: false }] });
    expect(b.earliestSafeDate).toBe('2027-03-20');
    const res = await m.api().post(`/api/blocks/${b.id}/publish`).set(g.auth);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('spray_restriction_covers_window');
    expect(res.body.error.message).toMatch(/Long-label herbicide applied 2026-12-20/);
  });

  it('When another grower tries to publish my draft, then 404; a grazier gets 403 for the role', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const other = await m.grower('Other Grower');
    expect((await m.api().post(`/api/blocks/${b.id}/publish`).set(other.auth)).status).toBe(404);
    const z = await m.grazier();
    expect((await m.api().post(`/api/blocks/${b.id}/publish`).set(z.auth)).status).toBe(403);
  });
});

describe('GET /api/blocks/:id', () => {
  it('When a grazier asks for another grower\'s draft, then 404; once it is open, then the block with distance, capacity for my flock and cautions', async () => {
    const g = await m.grower();
    const z = await m.grazier();
    const b = await m.draft(g, { crop: 'vineyard', sprayRecords: [{ product: 'Copper fungicide', appliedOn: '2026-12-15', grazingRestrictionDays: 21, containsCopper: true }] });
    const hidden = await m.api().get(`/api/blocks/${b.id}`).set(z.auth);
    expect(hidden.status).toBe(404);
    expect(hidden.body.error.code).toBe('not_found');
    await m.api().post(`/api/blocks/${b.id}/publish`).set(g.auth);
    const res = await m.api().get(`/api/blocks/${b.id}`).set(z.auth);
    expect(res.status).toBe(200);
    const v = res.body.block;
    expect(v.distanceMiles).toBe(distanceMiles({ latitude: 39.801, longitude: -121.876 }, { latitude: 39.7205, longitude: -121.9262 }));
    const cap = capacity({ acres: 80, lbDmPerAcre: 2000, utilizationPct: 45, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } });
    expect(v.capacity).toBe(cap.headDays);
    expect(v.daysForMyFlock).toBe(cap.headDays / 600);
    expect(v.flockFit).toMatchObject({ headCount: 600, intakePctBodyWeight: 2.5, intakeBasis: 'dry ewe' });
    expect(v.earliestSafeDate).toBe('2027-01-05');
    expect(v.grazeFrom).toBe('2027-01-05');
    expect(v.cautions.map((c: { key: string }) => c.key)).toEqual(expect.arrayContaining(['pesticide-restriction', 'copper-sheep', 'food-safety-harvest', 'bud-break']));
    expect(v.viewer).toEqual({ isOwner: false, canBid: true, myLiveBidId: null });
    expect(v.liveBidCount).toBeNull();
  });

  it('When another grower asks for an open block, then 404: only graziers browse the market', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const other = await m.grower('Other Grower');
    expect((await m.api().get(`/api/blocks/${b.id}`).set(other.auth)).status).toBe(404);
  });

  it('When the block is withdrawn, then the grazier gets 404 and the owner still sees it', async () => {
    const g = await m.grower();
    const z = await m.grazier();
    const b = await m.openBlock(g);
    expect((await m.api().post(`/api/blocks/${b.id}/withdraw`).set(g.auth)).body.block.status).toBe('withdrawn');
    expect((await m.api().get(`/api/blocks/${b.id}`).set(z.auth)).status).toBe(404);
    expect((await m.api().get(`/api/blocks/${b.id}`).set(g.auth)).body.block.status).toBe('withdrawn');
  });
});

describe('GET /api/blocks', () => {
  async function district() {
    const g = await m.grower();
    // Distances from the grazier's base at 39.801, -121.876: near ≈ 6 mi, mid ≈ 14 mi, far ≈ 70 mi.
    const near = await m.openBlock(g, { name: 'Near walnut', acres: 80, latitude: 39.7205, longitude: -121.9262 });
    const mid = await m.openBlock(g, { name: 'Mid vineyard', crop: 'vineyard', acres: 36, latitude: 39.6512, longitude: -122.0488, speciesAllowed: ['goats'], windowStart: '2027-02-10', windowEnd: '2027-03-20', outBy: '2027-03-10' });
    const far = await m.openBlock(g, { name: 'Far fallow', crop: 'fallow', acres: 120, lbDmPerAcre: 2600, latitude: 40.8, longitude: -121.9, harvestDate: null });
    const draft = await m.draft(g, { name: 'Still a draft' });
    return { g, near, mid, far, draft };
  }

  it('When a grazier lists the market, then open blocks only, nearest first, with distance, capacity and cautions', async () => {
    const d = await district();
    const z = await m.grazier();
    const res = await m.api().get('/api/blocks').set(z.auth);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ total: 3, page: 1, pageSize: 20 });
    expect(res.body.items.map((b: { name: string }) => b.name)).toEqual(['Near walnut', 'Mid vineyard', 'Far fallow']);
    const [near, mid, far] = res.body.items;
    expect(near.distanceMiles).toBeLessThan(mid.distanceMiles);
    expect(far.distanceMiles).toBeGreaterThan(60);
    expect(near.cautions.length).toBeGreaterThan(0);
    expect(res.body.items.some((b: { id: string }) => b.id === d.draft.id)).toBe(false);
  });

  it('When a grazier lists the market, then each block comes as a card: the same figures as the block page, the cautions as flags without their text, no notes, spray records or forage measurements', async () => {
    await district();
    const z = await m.grazier();
    const res = await m.api().get('/api/blocks').set(z.auth);
    expect(res.status).toBe(200);
    for (const card of res.body.items) {
      const page = await m.api().get(`/api/blocks/${card.id}`).set(z.auth);
      expect(page.status).toBe(200);
      const { cautions, sprayRecords, notes, forageSamples, forageHeight, photos, ...figures } = page.body.block;
      expect(sprayRecords).toBeDefined();
      expect(notes !== undefined && forageSamples !== undefined && forageHeight !== undefined).toBe(true);
      expect(card).toEqual({ ...figures, photos: expect.any(Array), cautions: cautions.map((c: { key: string; tone: string; title: string }) => ({ key: c.key, tone: c.tone, title: c.title })) });
      expect(card.photos).toHaveLength(photos.length);
      expect(Object.keys(card)).not.toEqual(expect.arrayContaining(['notes']));
      for (const c of card.cautions) expect(c).not.toHaveProperty('text');
    }
    expect(res.body.items.some((c: { cautions: unknown[] }) => c.cautions.length > 0)).toBe(true);
  });

  it('When filters are given, then distance, size, species, days of feed and dates narrow the list', async () => {
    await district();
    const z = await m.grazier();
    const names = async (q: Record<string, string>) => {
      const res = await m.api().get('/api/blocks').query(q).set(z.auth);
      expect(res.status).toBe(200);
      return res.body.items.map((b: { name: string }) => b.name);
    };
    expect(await names({ maxMiles: '20' })).toEqual(['Near walnut', 'Mid vineyard']);
    expect(await names({ minAcres: '50', maxAcres: '100' })).toEqual(['Near walnut']);
    expect(await names({ species: 'sheep', sort: 'acres' })).toEqual(['Far fallow', 'Near walnut']);
    // 600 ewes at 3.75 lb/day: near 80 ac × 2 000 × 45 % → 32 days; mid 36 ac × 2 000 × 45 % → 14.4 days.
    expect(await names({ minDays: '20', sort: 'days' })).toEqual(['Far fallow', 'Near walnut']);
    // Mid opens 2027-02-10; a grazier free only until 2027-02-10 shares no whole day with it.
    expect(await names({ from: '2027-01-01', to: '2027-02-10', sort: 'window' })).toEqual(['Far fallow', 'Near walnut']);
    expect(await names({ from: '2027-03-06' })).toEqual(['Mid vineyard']);
  });

  it('When paging, then each page holds pageSize items and total counts them all', async () => {
    await district();
    const z = await m.grazier();
    const p1 = await m.api().get('/api/blocks?pageSize=2&page=1').set(z.auth);
    const p2 = await m.api().get('/api/blocks?pageSize=2&page=2').set(z.auth);
    expect(p1.body).toMatchObject({ total: 3, page: 1, pageSize: 2 });
    expect(p1.body.items).toHaveLength(2);
    expect(p2.body.items.map((b: { name: string }) => b.name)).toEqual(['Far fallow']);
  });

  it('When the query is malformed or needs a profile detail the grazier lacks, then 400 names the parameter', async () => {
    await district();
    const z = await m.grazier('No Profile', { name: 'No Profile' });
    const res = await m.api().get('/api/blocks?maxMiles=25&minDays=3&sort=distance').set(z.auth);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({ maxMiles: expect.stringMatching(/home base/), minDays: expect.stringMatching(/flock/), sort: expect.stringMatching(/home base/) });
    const bad = await m.api().get('/api/blocks?pageSize=51&page=abc&radius=3').set(z.auth);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual({ pageSize: 'Page size must be at most 50', page: 'Page must be a number', radius: 'Unknown field: radius' });
    const twice = await m.api().get('/api/blocks?page=1&page=2').set(z.auth);
    expect(twice.status).toBe(400);
    expect(twice.body.error.fields.page).toBeDefined();
  });

  it('When a grower lists, then their own blocks in every state, and a status filter narrows them', async () => {
    const d = await district();
    await m.openBlock(await m.grower('Someone Else'), { name: 'Not mine' });
    const all = await m.api().get('/api/blocks').set(d.g.auth);
    expect(all.body.total).toBe(4);
    expect(all.body.items.every((b: { viewer: { isOwner: boolean }; liveBidCount: number }) => b.viewer.isOwner && b.liveBidCount === 0)).toBe(true);
    const drafts = await m.api().get('/api/blocks?status=draft').set(d.g.auth);
    expect(drafts.body.items.map((b: { name: string }) => b.name)).toEqual(['Still a draft']);
    expect((await m.api().get('/api/blocks?view=market').set(d.g.auth)).status).toBe(403);
  });
});

describe('PATCH /api/blocks/:id', () => {
  it('When the owner switches a draft from samples to a direct figure, then the samples are dropped and the figure stored', async () => {
    const g = await m.grower();
    const { lbDmPerAcre: _, ...body } = blockBody();
    const created = await m.api().post('/api/blocks').set(g.auth).send({ ...body, forageMethod: 'samples', forageSamples: { frameAreaM2: 0.25, samples: [{ dryGrams: 50 }] } });
    const res = await m.api().patch(`/api/blocks/${created.body.block.id}`).set(g.auth).send({ forageMethod: 'direct', lbDmPerAcre: 1850, notes: 'Re-measured after rain' });
    expect(res.status).toBe(200);
    expect(res.body.block).toMatchObject({ forageMethod: 'direct', lbDmPerAcre: 1850, forageSamples: null, notes: 'Re-measured after rain' });
  });

  it('When a patch breaks the date order, then 400 names the field and the block is unchanged', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const res = await m.api().patch(`/api/blocks/${b.id}`).set(g.auth).send({ windowEnd: '2027-01-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.windowEnd).toMatch(/after the earliest-in/);
    expect((await m.api().get(`/api/blocks/${b.id}`).set(g.auth)).body.block.windowEnd).toBe('2027-03-05');
  });

  it('When someone else patches, then 404 for another grower and 403 for a grazier; a withdrawn block is 409', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    expect((await m.api().patch(`/api/blocks/${b.id}`).set((await m.grower('Other')).auth).send({ notes: 'x' })).status).toBe(404);
    expect((await m.api().patch(`/api/blocks/${b.id}`).set((await m.grazier()).auth).send({ notes: 'x' })).status).toBe(403);
    await m.api().post(`/api/blocks/${b.id}/withdraw`).set(g.auth);
    const res = await m.api().patch(`/api/blocks/${b.id}`).set(g.auth).send({ notes: 'x' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('block_not_editable');
  });
});
