import fc from 'fast-check';
import { DataSource } from 'typeorm';
import { makeTestApp, TEST_NOW } from '../helpers/test-app';
import { onPostgres, rawQuery } from '../helpers/test-database';
import { seedSeasonBlocks, seedSeasonPeople, type SeasonPeople } from '../helpers/market-season';
import { market } from '../helpers/market';
import { migrations } from '../../server/db/data-source';
import { MarketFigures1765400000000 } from '../../server/db/migrations/1765400000000-market-figures';
import { MarketPlaceIndex1766400000000 } from '../../server/db/migrations/1766400000000-market-place-index';
import { AppError } from '../../server/lib/errors/app-error';
import { check } from '../../server/lib/http/validate';
import { hasRole } from '../../server/lib/http/auth';
import type { ServiceContext } from '../../server/lib/service-context';
import type { Account } from '../../server/modules/accounts/account.entity';
import { Block } from '../../server/modules/blocks/block.entity';
import { blockCard, blockViews, flockOf, homeOf } from '../../server/modules/blocks/block-views';
import { listBlocks } from '../../server/modules/blocks/blocks.service';
import { EXACT_COUNT_UP_TO, findBlockPage } from '../../server/modules/blocks/block-list';
import { allowableForage, capacity, daysForHead } from '../../lib/grazing/capacity';
import { intakeForFlock } from '../../lib/grazing/flock-intake';
import { grazeSpan, type GrazeSpan } from '../../lib/grazing/graze-window';
import { distanceMiles } from '../../lib/geo';
import { todayIn } from '../../lib/day-keys';
import { blockListQuerySchema, type BlockListQuery, type BlockListResponse } from '../../lib/schemas/block';

// The market moved from "load every open block and filter in memory" to SQL. These tests pin what a user
// sees — the same blocks, in the same order, with the same figures, the same errors — against the
// in-memory algorithm as it stood before the move, copied here verbatim as the reference.

// ——— the reference: listBlocks as it was (server/modules/blocks/blocks.service.ts before the SQL market) ———

interface RefFigures {
  span: GrazeSpan;
  distanceMiles: number | null;
  daysForMyFlock: number | null;
}

function refViewerFigures(viewer: Account, block: Block): RefFigures {
  const home = homeOf(viewer);
  const flock = flockOf(viewer);
  let days: number | null = null;
  if (flock) {
    const intake = intakeForFlock(flock.species, flock.animalClass);
    const headDays = capacity({
      acres: block.acres,
      lbDmPerAcre: block.lbDmPerAcre,
      utilizationPct: block.targetUtilizationPct,
      animal: { bodyWeightLb: flock.bodyWeightLb, intakePctBodyWeight: intake.pct },
    }).headDays;
    days = daysForHead(headDays, flock.headCount);
  }
  return { span: grazeSpan(block), distanceMiles: home ? distanceMiles(home, block) : null, daysForMyFlock: days };
}

function refListView(viewer: Account, asked: BlockListQuery['view']): 'mine' | 'market' {
  const isGrower = hasRole(viewer, 'grower');
  const isGrazier = hasRole(viewer, 'grazier');
  if (asked === 'mine' && !isGrower) throw AppError.forbidden('Only a grower account has blocks of its own');
  if (asked === 'market' && !isGrazier) throw AppError.forbidden('Only a grazier account browses open blocks');
  if (asked) return asked;
  if (isGrower && isGrazier) return viewer.activeRole === 'grower' ? 'mine' : 'market';
  if (isGrower) return 'mine';
  if (isGrazier) return 'market';
  throw AppError.forbidden('Only growers and graziers have blocks to list');
}

type Sortable = { block: Block; fig: RefFigures };

const REF_SORTS: Record<NonNullable<BlockListQuery['sort']>, (a: Sortable, b: Sortable) => number> = {
  distance: (a, b) => (a.fig.distanceMiles ?? Infinity) - (b.fig.distanceMiles ?? Infinity),
  window: (a, b) => (a.fig.span.from < b.fig.span.from ? -1 : a.fig.span.from > b.fig.span.from ? 1 : 0),
  acres: (a, b) => b.block.acres - a.block.acres,
  days: (a, b) => (b.fig.daysForMyFlock ?? -1) - (a.fig.daysForMyFlock ?? -1),
  newest: (a, b) => b.block.createdAt.getTime() - a.block.createdAt.getTime(),
};

async function referenceListBlocks(ctx: ServiceContext, viewer: Account, rawQuery: unknown): Promise<Omit<BlockListResponse, 'totalCapped'>> {
  const q = (await check(blockListQuerySchema, rawQuery)) as BlockListQuery;
  const view = refListView(viewer, q.view);
  const home = homeOf(viewer);
  const flock = flockOf(viewer);
  const fields: Record<string, string> = {};
  if (q.maxMiles !== undefined && !home) fields.maxMiles = 'Set your home base in your profile to filter by distance';
  if (q.sort === 'distance' && !home) fields.sort = 'Set your home base in your profile to sort by distance';
  if (q.minDays !== undefined && !flock) fields.minDays = 'Describe your flock in your profile to filter by days of feed';
  if (q.sort === 'days' && !flock) fields.sort = 'Describe your flock in your profile to sort by days of feed';
  if (q.status !== undefined && view === 'market') fields.status = 'The market lists open blocks only';
  if (Object.keys(fields).length > 0) throw AppError.badRequest('Some filters need a profile detail or do not apply', fields);

  const qb = ctx.ds.getRepository(Block).createQueryBuilder('b');
  if (view === 'mine') {
    qb.where('b.owner_id = :me', { me: viewer.id });
    if (q.status) qb.andWhere('b.status = :status', { status: q.status });
  } else {
    qb.where("b.status = 'open'").andWhere('b.owner_id != :me', { me: viewer.id });
  }
  if (q.minAcres !== undefined) qb.andWhere('b.acres >= :minAcres', { minAcres: q.minAcres });
  if (q.maxAcres !== undefined) qb.andWhere('b.acres <= :maxAcres', { maxAcres: q.maxAcres });
  const blocks = await qb.getMany();

  const rows: Sortable[] = blocks
    .map((block) => ({ block, fig: refViewerFigures(viewer, block) }))
    .filter(({ block, fig }) => {
      if (view === 'market' && fig.span.until <= todayIn(block.timeZone, ctx.now())) return false;
      if (q.species && !block.speciesAllowed.includes(q.species)) return false;
      const from = q.from && q.from > fig.span.from ? q.from : fig.span.from;
      const until = q.to && q.to < fig.span.until ? q.to : fig.span.until;
      if ((q.from || q.to) && !(from < until)) return false;
      if (q.maxMiles !== undefined && !(fig.distanceMiles! <= q.maxMiles)) return false;
      if (q.minDays !== undefined && !(fig.daysForMyFlock! >= q.minDays)) return false;
      return true;
    });

  const sort = q.sort ?? (view === 'mine' ? 'newest' : home ? 'distance' : 'window');
  rows.sort((a, b) => REF_SORTS[sort](a, b) || a.block.name.localeCompare(b.block.name) || a.block.id.localeCompare(b.block.id));

  const page = q.page ?? 1;
  const pageSize = q.pageSize ?? 20;
  const slice = rows.slice((page - 1) * pageSize, page * pageSize).map((r) => r.block);
  return { items: (await blockViews(ctx, viewer, slice)).map(blockCard), total: rows.length, page, pageSize };
}

// ——— the season ———

let t: Awaited<ReturnType<typeof makeTestApp>>;
let ctx: ServiceContext;
let people: SeasonPeople;
let blocks: Block[];
const clock = { now: TEST_NOW };

beforeAll(async () => {
  t = await makeTestApp();
  // The app's own service context, on a clock these tests move.
  ctx = { ...t.ctx, now: () => clock.now };
  people = await seedSeasonPeople(t.dataSource);
  blocks = await seedSeasonBlocks(t.dataSource, people, 360);
}, 60_000);

afterAll(async () => {
  await t.close();
});

/** A result or the error a user would get, with photo links' signing time taken out (it is the wall clock's second). */
async function outcome(fn: () => Promise<Omit<BlockListResponse, 'totalCapped'>>): Promise<unknown> {
  try {
    const res = await fn();
    return JSON.parse(JSON.stringify(res).replace(/access=[^"]+/g, 'access=…'));
  } catch (err) {
    if (err instanceof AppError) return { status: err.status, code: err.code, message: err.message, fields: err.fields };
    throw err;
  }
}

/** Compares one query; resolves with the number of blocks on the page, or null for an error. */
async function expectSameAsReference(viewer: Account, query: Record<string, string>): Promise<number | null> {
  const actual = await outcome(() => listBlocks(ctx, viewer, { ...query }));
  const expected = await outcome(() => referenceListBlocks(ctx, viewer, { ...query }));
  // The reference counts every block; the list counts exactly up to EXACT_COUNT_UP_TO or the page's end, and past
  // that says "more than" that many.
  const capped = (e: Omit<BlockListResponse, 'totalCapped'>) => {
    const upTo = Math.max(EXACT_COUNT_UP_TO, e.page * e.pageSize);
    return { ...e, total: Math.min(e.total, upTo), totalCapped: e.total > upTo };
  };
  expect(actual).toEqual(expected !== null && typeof expected === 'object' && 'items' in expected ? capped(expected as Omit<BlockListResponse, 'totalCapped'>) : expected);
  const items = (expected as Partial<BlockListResponse>).items;
  return items ? items.length : null;
}

// Values chosen round the season's own figures, so the filters' boundaries are hit exactly as well as between.
const dayArb = fc.constantFrom('2026-09-15', '2026-11-30', '2026-12-01', '2026-12-02', '2026-12-20', '2027-01-04', '2027-01-15', '2027-02-10', '2027-03-01', '2027-04-20', '2027-08-01');
const milesArb = fc.constantFrom('0.5', '6', '25', '50', '120.5', '250', '400', '1000', '5000');
const acresArb = fc.constantFrom('0', '0.5', '10', '12.5', '36', '40', '80', '120', '300.25', '1000', '5000');
const daysArb = fc.constantFrom('0', '0.5', '1', '3', '7', '14.4', '30', '90', '365', '3650');

/** `arb` with probability `p`, else left out. */
const maybe = <T>(arb: fc.Arbitrary<T>, p = 0.5): fc.Arbitrary<T | undefined> =>
  fc.oneof({ weight: Math.round((1 - p) * 10), arbitrary: fc.constant(undefined) }, { weight: Math.round(p * 10), arbitrary: arb });

/**
 * Queries for one viewer: mostly ones that viewer may ask (ordered ranges, "mine" only for growers, distance
 * only with a home base, days only with a flock), and one in ten broken on purpose so the errors are compared too.
 */
function queryArbFor(viewer: Account): fc.Arbitrary<Record<string, string>> {
  const grower = hasRole(viewer, 'grower');
  const grazier = hasRole(viewer, 'grazier');
  const home = !!homeOf(viewer);
  const flock = !!flockOf(viewer);
  const sorts = ['window', 'acres', 'newest', ...(home ? ['distance'] : []), ...(flock ? ['days'] : [])];
  const views = [...(grower ? ['mine'] : []), ...(grazier ? ['market'] : [])];
  return fc
    .record({
      view: maybe(fc.constantFrom(...views), 0.6),
      status: maybe(fc.constantFrom('draft', 'open', 'awarded', 'withdrawn'), 0.3),
      days: fc.tuple(maybe(dayArb, 0.4), maybe(dayArb, 0.4)),
      maxMiles: home ? maybe(milesArb, 0.4) : fc.constant(undefined),
      acres: fc.tuple(maybe(acresArb, 0.3), maybe(acresArb, 0.3)),
      minDays: flock ? maybe(daysArb, 0.3) : fc.constant(undefined),
      species: maybe(fc.constantFrom('sheep', 'goats'), 0.3),
      sort: maybe(fc.constantFrom(...sorts), 0.8),
      page: maybe(fc.constantFrom('1', '2', '3', '7'), 0.6),
      pageSize: maybe(fc.constantFrom('1', '2', '7', '20', '50'), 0.7),
      broken: fc.constantFrom(...(['none', 'none', 'none', 'none', 'none', 'none', 'none', 'none', 'none', 'some'] as const)),
      breakage: fc.constantFrom('ranges', 'status', 'view', 'profile'),
    })
    .map(({ view, status, days, acres, broken, breakage, ...rest }) => {
      const q: Record<string, string | undefined> = { view, ...rest };
      const [d1, d2] = days;
      const [a1, a2] = acres;
      q.from = d1 && d2 && d1 > d2 ? d2 : d1;
      q.to = d1 && d2 && d1 > d2 ? d1 : d2;
      q.minAcres = a1 && a2 && Number(a1) > Number(a2) ? a2 : a1;
      q.maxAcres = a1 && a2 && Number(a1) > Number(a2) ? a1 : a2;
      const listsMine = view === 'mine' || (!view && grower && (!grazier || viewer.activeRole === 'grower'));
      if (status && listsMine) q.status = status;
      if (broken === 'some') {
        if (breakage === 'ranges') [q.from, q.to, q.minAcres, q.maxAcres] = [q.to ?? '2027-03-01', q.from ?? '2027-01-01', q.maxAcres ?? '1', q.minAcres ?? '2'];
        if (breakage === 'status') q.status = 'open';
        if (breakage === 'view') q.view = grower && grazier ? 'market' : grower ? 'market' : 'mine';
        if (breakage === 'profile') Object.assign(q, { maxMiles: '10', sort: 'days', minDays: '2' });
      }
      return Object.fromEntries(Object.entries(q).filter(([, v]) => v !== undefined)) as Record<string, string>;
    });
}

describe('GET /api/blocks in SQL gives what the in-memory market gave', () => {
  it('When the seeded season is listed with every sort, view and page for every kind of viewer, then the same blocks, order, figures and totals', async () => {
    for (const viewer of people.viewers) {
      for (const view of [undefined, 'market', 'mine']) {
        for (const sort of [undefined, 'distance', 'window', 'acres', 'days', 'newest']) {
          for (const page of ['1', '2', '9']) {
            const q: Record<string, string> = { page, pageSize: '13' };
            if (view) q.view = view;
            if (sort) q.sort = sort;
            await expectSameAsReference(viewer, q);
          }
        }
      }
    }
  }, 120_000);

  it('When any combination of filters, sort and paging is asked (fast-check over the query space), then the same answer as the reference', async () => {
    const tally = { pages: 0, empty: 0, errors: 0 };
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...people.viewers).chain((viewer) => fc.tuple(fc.constant(viewer), queryArbFor(viewer))), async ([viewer, query]) => {
        const n = await expectSameAsReference(viewer, query);
        if (n === null) tally.errors += 1;
        else if (n === 0) tally.empty += 1;
        else tally.pages += 1;
      }),
      { numRuns: 500 },
    );
    // The property means something only if most queries return blocks.
    expect(tally.pages).toBeGreaterThan(tally.errors + tally.empty);
    expect(tally.errors).toBeGreaterThan(0);
  }, 240_000);

  it('When the clock stands at other instants (midnight in one zone or another), then "a day left to graze" is judged in each block\'s zone exactly as before', async () => {
    const instants = ['2026-11-30T10:30:00Z', '2026-12-01T00:00:00Z', '2026-12-01T09:59:59Z', '2026-12-01T10:00:00Z', '2026-12-01T11:00:00Z', '2026-12-02T08:00:00Z', '2026-12-02T12:00:00Z', '2026-12-03T23:30:00Z'];
    try {
      for (const at of instants) {
        clock.now = Date.parse(at);
        for (const viewer of [people.viewers[0], people.viewers[4], people.viewers[8], people.viewers[9]]) {
          for (const sort of ['distance', 'window', 'newest']) await expectSameAsReference(viewer, { view: 'market', sort, pageSize: '50' });
          await expectSameAsReference(viewer, { view: 'market', sort: 'window', from: '2026-11-30', to: '2026-12-03', pageSize: '50' });
        }
      }
    } finally {
      clock.now = TEST_NOW;
    }
  }, 120_000);

  it('When the season is seeded, then it holds the ties and edges these comparisons need', () => {
    const open = blocks.filter((b) => b.status === 'open');
    expect(open.length).toBeGreaterThan(250);
    const count = <T>(xs: T[]) => xs.length - new Set(xs).size;
    expect(count(open.map((b) => b.acres))).toBeGreaterThan(100);
    expect(count(open.map((b) => `${b.latitude},${b.longitude}`))).toBeGreaterThan(10);
    expect(count(open.map((b) => b.createdAt.getTime()))).toBeGreaterThan(10);
    expect(count(open.map((b) => b.name))).toBeGreaterThan(50);
    expect(open.some((b) => b.longitude > 179) && open.some((b) => b.longitude < -179)).toBe(true);
    expect(open.some((b) => grazeSpan(b).from >= grazeSpan(b).until)).toBe(true);
  });
});

describe('the count stops past the page', () => {
  it('When the list holds more blocks than the exact count goes to, then the page is the same, the total says "more than" and is exact again at the end', async () => {
    const viewer = people.viewers.find((v) => homeOf(v) && hasRole(v, 'grazier'))!;
    const listViewer = { id: viewer.id, home: homeOf(viewer), flock: null };
    for (const sort of ['distance', 'window', 'acres', 'newest'] as const) {
      const ask = (page: number) => ({ sort, page, pageSize: 7 });
      const exact = await findBlockPage(ctx.ds, clock.now, listViewer, 'market', ask(1), { exactCountUpTo: 100_000 });
      expect(exact.totalCapped).toBe(false);
      expect(exact.total).toBeGreaterThan(40);
      const capped = await findBlockPage(ctx.ds, clock.now, listViewer, 'market', ask(1), { exactCountUpTo: 20 });
      expect([capped.total, capped.totalCapped]).toEqual([20, true]);
      expect(capped.blocks.map((b) => b.id)).toEqual(exact.blocks.map((b) => b.id));
      // A page past the cap counts to its own end, and still finds the same blocks.
      const far = await findBlockPage(ctx.ds, clock.now, listViewer, 'market', ask(5), { exactCountUpTo: 20 });
      expect([far.total, far.totalCapped]).toEqual([35, true]);
      expect(far.blocks.map((b) => b.id)).toEqual((await findBlockPage(ctx.ds, clock.now, listViewer, 'market', ask(5))).blocks.map((b) => b.id));
      // The last page: nothing past it, so the count is exact.
      const last = Math.ceil(exact.total / 7);
      const end = await findBlockPage(ctx.ds, clock.now, listViewer, 'market', ask(last), { exactCountUpTo: 20 });
      expect([end.total, end.totalCapped]).toEqual([exact.total, false]);
    }
  });
});

// ——— stored figures, the plans SQLite picks, the migration that fills the figures ———

describe('the figures the market filters on are stored, and are lib\'s', () => {
  it('When blocks are saved, then graze_from/graze_until are grazeSpan and allowable_lb is allowableForage, to the last bit', async () => {
    const stored = await t.dataSource.getRepository(Block).find();
    expect(stored.length).toBe(blocks.length);
    for (const b of stored) {
      const span = grazeSpan(b);
      expect([b.grazeFrom, b.grazeUntil]).toEqual([span.from, span.until]);
      expect(b.allowableLb).toBe(allowableForage({ acres: b.acres, lbDmPerAcre: b.lbDmPerAcre, utilizationPct: b.targetUtilizationPct }).allowableLb);
      // And days of feed in SQL equal lib's capacity → daysForHead for a flock.
      const [{ days }] = await rawQuery<{ days: number }>(t.dataSource, 'SELECT ((allowable_lb / :intake) / :head) AS days FROM blocks WHERE id = :id', { intake: 3.75, head: 600, id: b.id });
      const headDays = capacity({ acres: b.acres, lbDmPerAcre: b.lbDmPerAcre, utilizationPct: b.targetUtilizationPct, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } }).headDays;
      expect(days).toBe(daysForHead(headDays, 600));
    }
  });

  it('When a grower changes acres, forage or a spray record, then the stored figures follow', async () => {
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g, { acres: 80, lbDmPerAcre: 2000, targetUtilizationPct: 45 });
    const patch = await m.api().patch(`/api/blocks/${b.id}`).set(g.auth).send({ acres: 12.5, lbDmPerAcre: 1500, sprayRecords: [{ product: 'Invented copper', appliedOn: '2027-01-01', grazingRestrictionDays: 10, containsCopper: true }] });
    expect(patch.status).toBe(200);
    const row = await t.dataSource.getRepository(Block).findOneByOrFail({ id: b.id });
    expect(row.allowableLb).toBe(allowableForage({ acres: 12.5, lbDmPerAcre: 1500, utilizationPct: 45 }).allowableLb);
    expect([row.grazeFrom, row.grazeUntil]).toEqual(['2027-01-11', '2027-03-01']);
  });
});

describe('block views on a list page', () => {
  it('When owners and graziers list the season, then each block\'s live-bid count (owner) and my live bid (grazier) match the bids table', async () => {
    const live: Array<{ id: string; block_id: string; grazier_id: string }> = await t.dataSource.query(`SELECT id, block_id, grazier_id FROM bids WHERE status = 'live'`);
    expect(live.length).toBeGreaterThan(10);
    let seen = 0;
    for (const viewer of people.viewers) {
      const listed = await listBlocks(ctx, viewer, { view: hasRole(viewer, 'grower') && viewer.activeRole !== 'grazier' ? 'mine' : 'market', pageSize: '50' });
      for (const v of listed.items) {
        const onBlock = live.filter((b) => b.block_id === v.id);
        if (v.viewer.isOwner) expect(v.liveBidCount).toBe(onBlock.length);
        else expect(v.liveBidCount).toBeNull();
        expect(v.viewer.myLiveBidId).toBe(onBlock.find((b) => b.grazier_id === viewer.id)?.id ?? null);
        if (v.viewer.myLiveBidId || (v.liveBidCount ?? 0) > 0) seen += 1;
      }
    }
    expect(seen).toBeGreaterThan(0);
  });
});

// SQLite's own query plans; PostgreSQL's planner picks by table statistics (a few hundred rows here favour a scan),
// so there the same queries are checked for their answers only.
(onPostgres ? describe.skip : describe)('the market\'s SQL uses its indexes (EXPLAIN QUERY PLAN)', () => {
  /** Every SELECT one listBlocks call runs, with the plan SQLite picks for it. */
  async function plans(viewer: Account, query: Record<string, string>) {
    const statements: Array<[string, unknown[]]> = [];
    const ds = t.dataSource as unknown as { logger: { logQuery: (q: string, p?: unknown[]) => void } };
    const logger = ds.logger;
    ds.logger = Object.assign(Object.create(logger), { logQuery: (q: string, p?: unknown[]) => statements.push([q, p ?? []]) });
    try {
      await listBlocks(ctx, viewer, query);
    } finally {
      ds.logger = logger;
    }
    const out = [];
    for (const [sql, params] of statements.filter(([s]) => /^\s*SELECT/i.test(s))) {
      const rows: Array<{ detail: string }> = await t.dataSource.query(`EXPLAIN QUERY PLAN ${sql}`, params);
      out.push({ sql, plan: rows.map((r) => r.detail).join(' | ') });
    }
    return out;
  }

  it('When the market is listed with or without filters, in every order, then no query scans a table: each searches an index, and the count reads a covering index alone', async () => {
    const grazier = people.viewers[0];
    const shapes: Array<Record<string, string>> = [
      { view: 'market' },
      { view: 'market', sort: 'window', page: '3' },
      { view: 'market', sort: 'acres', minAcres: '20' },
      { view: 'market', sort: 'days', minDays: '3', species: 'sheep' },
      { view: 'market', sort: 'newest', from: '2027-01-04', to: '2027-03-01' },
      { view: 'market', maxMiles: '150', minAcres: '20', species: 'sheep', minDays: '2', from: '2026-12-20', sort: 'days' },
    ];
    for (const query of shapes) {
      const found = await plans(grazier, query);
      expect(found.length).toBeGreaterThanOrEqual(4);
      for (const { sql, plan } of found) {
        expect({ sql, plan }).toEqual({ sql, plan: expect.stringMatching(/SEARCH \S+ USING (COVERING )?INDEX/) });
        // "SCAN capped" is the capped count reading its own LIMITed rows (the CO-ROUTINE), not a table.
        expect({ sql, plan }).toEqual({ sql, plan: expect.not.stringMatching(/(^|\| )SCAN (?!capped)/) });
      }
      const count = found.find((x) => /COUNT\(\*\)/.test(x.sql) && /FROM "blocks"/.test(x.sql))!;
      expect(count.plan).toMatch(/USING COVERING INDEX idx_blocks_market_\w+/);
    }
  });

  it('When a grower lists their own blocks, then the owner index serves it', async () => {
    const found = await plans(people.growers[0], { view: 'mine' });
    for (const { plan } of found) expect(plan).not.toMatch(/(^|\| )SCAN (?!capped)/);
    expect(found.some((x) => /idx_blocks_owner_created/.test(x.plan))).toBe(true);
  });
});

// SQLite only: the migration's data step fills blocks that an older SQLite database held. PostgreSQL support came
// after it (1766200000000), so no PostgreSQL database ever held a block before it ran.
(onPostgres ? describe.skip : describe)('migration 1765400000000 fills the figures of blocks stored before it', () => {
  it('When it runs over existing blocks, then each gets lib\'s graze span and allowable take; down() takes the columns away again', async () => {
    const ds = new DataSource({ type: 'better-sqlite3', database: ':memory:', migrations: migrations.filter((mg) => mg !== MarketFigures1765400000000 && mg !== MarketPlaceIndex1766400000000), synchronize: false });
    await ds.initialize();
    try {
      await ds.runMigrations();
      await ds.query(`INSERT INTO accounts (id, email, password_hash, name, roles) VALUES ('a1', 'old@test.example', 'x', 'Old grower', 'grower')`);
      const spray = JSON.stringify([{ product: 'Invented fungicide', appliedOn: '2027-01-02', grazingRestrictionDays: 14, containsCopper: false }]);
      await ds.query(
        `INSERT INTO blocks (id, owner_id, status, name, crop, acres, latitude, longitude, time_zone, forage_method, lb_dm_per_acre, target_utilization_pct, window_start, window_end, out_by, spray_records, water_on_site, perimeter_fence, truck_access, species_allowed, young_plantings)
         VALUES ('b1', 'a1', 'open', 'Old block', 'orchard', 36.5, 39.7, -121.9, 'America/Los_Angeles', 'direct', 2100, 45, '2027-01-04', '2027-03-05', '2027-03-01', ?, 1, 'full', 1, 'sheep', 0)`,
        [spray],
      );
      const runner = ds.createQueryRunner();
      await new MarketFigures1765400000000().up(runner);
      const [row] = await ds.query('SELECT graze_from, graze_until, allowable_lb FROM blocks');
      expect(row).toEqual({ graze_from: '2027-01-16', graze_until: '2027-03-01', allowable_lb: allowableForage({ acres: 36.5, lbDmPerAcre: 2100, utilizationPct: 45 }).allowableLb });
      await new MarketFigures1765400000000().down(runner);
      const columns: Array<{ name: string }> = await ds.query(`PRAGMA table_info('blocks')`);
      expect(columns.map((c) => c.name)).not.toContain('allowable_lb');
      await runner.release();
    } finally {
      await ds.destroy();
    }
  });
});
