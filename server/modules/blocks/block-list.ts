import { Brackets, type DataSource, type SelectQueryBuilder } from 'typeorm';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { ShapedSql } from '../../lib/db/shaped-sql';
import { Block } from './block.entity';
import { distanceMilesSql } from '../../db/sql-functions';
import { boundingBox, distanceMiles, type LatLng, type LatLngBox } from '../../../lib/geo';
import { addDays, todayIn } from '../../../lib/day-keys';
import { GRAZING_SPECIES, type BlockListQuery, type BlockSort, type GrazingSpecies } from '../../../lib/schemas/block';

// GET /api/blocks in SQL: every filter, the sort and the page run in the database on indexed columns, and
// only the page's blocks are loaded. The order is exactly the one the market always had — the sort's figure,
// then the name as people read it (String#localeCompare), then the id — and SQLite cannot sort by the
// locale's collation. So SQL finds the page by the figure alone, and where equal figures straddle the page's
// edges it fetches just those rows' names (a few columns of the tied rows) and JS breaks the tie. The work
// per request is bounded by the page, its tied neighbours and, for "nearest first", a disk holding the page.
//
// The pattern for every list that can grow (bids, contracts' log, invoices): a shared query schema with a
// page-size cap; filters as SQL conditions on stored, indexed columns (derived figures stored on write by
// lib/ functions); a count that stops past the page (EXACT_COUNT_UP_TO); ORDER BY an indexed column +
// LIMIT/OFFSET; load the page's rows by id.

export type ListView = 'mine' | 'market';

export interface ListViewer {
  id: string;
  home: LatLng | null;
  /** The flock's daily intake per head (lib dailyIntakeLb) and head count: days of feed = allowable ÷ intake ÷ head. */
  flock: { intakeLbPerHead: number; headCount: number } | null;
}

export interface ListAsk extends Omit<BlockListQuery, 'view' | 'sort' | 'page' | 'pageSize'> {
  sort: BlockSort;
  page: number;
  pageSize: number;
}

export interface BlockPage {
  blocks: Block[];
  /** How many blocks the list holds; when `totalCapped`, it holds more than this (counting stopped past it). */
  total: number;
  totalCapped: boolean;
}

/**
 * The list counts its blocks exactly up to this many, or to the end of the page asked for if that is further;
 * past it the answer is "more than" ("More than 200 open blocks": ten pages, past which a grazier narrows the
 * filters rather than pages on). Counting every one of 10 000 open blocks cost more than finding and building the
 * page (2–3 ms of a market request on the bench machine), and with filters the count walks the rows that match
 * until it has enough: up to 1 000 it was a quarter of the filtered market's time in-process (2.1 → 1.55 ms at 200).
 */
export const EXACT_COUNT_UP_TO = 200;

type Qb = SelectQueryBuilder<Block>;

/** Rows this far (relative) from a threshold on the allowable column are decided by the exact expression only. */
const LOOSE = 1e-9;

const zonesEndingSoon = new PreparedSelect((em) =>
  em.createQueryBuilder(Block, 'b').select('DISTINCT b.time_zone', 'tz').where("b.status = 'open'").andWhere('b.graze_until >= :utc AND b.graze_until <= :next'),
);
const blocksById = new PreparedSelect((em) => em.createQueryBuilder(Block, 'b').where('b.id IN (:...ids)'));
/** The filtered statements, rendered once per shape of filter (server/lib/db/shaped-sql.ts). */
const shaped = new ShapedSql();
const COUNT_UP_TO = { name: 'count-up-to', sql: (inner: string) => `SELECT COUNT(*) AS n FROM (${inner}) capped` };

const namesById = new PreparedSelect((em) => em.createQueryBuilder(Block, 'b').select('b.id', 'id').addSelect('b.name', 'name').where('b.id IN (:...ids)'));

/**
 * Which zones' "today" decides whether a block whose last day is today or tomorrow in UTC is still in the
 * market. Local dates run from one day before to one day after the UTC date (UTC−12 … UTC+14), so only blocks
 * whose last day is the UTC date or the next depend on their zone: a short index range.
 */
async function daysLeftCondition(ds: DataSource, nowMs: number): Promise<{ sql: string; params: Record<string, unknown> }> {
  const utc = todayIn('UTC', nowMs);
  const next = addDays(utc, 1);
  const rows = await zonesEndingSoon.raw<{ tz: string }>(ds.manager, { utc, next });
  // A block is in while its last day is after today at the block.
  const zones = rows.map((r) => ({ tz: r.tz, today: todayIn(r.tz, nowMs) }));
  const lastDayTomorrow = zones.filter((z) => z.today < next).map((z) => z.tz);
  const lastDayToday = zones.filter((z) => z.today < utc).map((z) => z.tz);
  const parts = ['b.graze_until > :dlNext'];
  if (lastDayTomorrow.length) parts.push('(b.graze_until = :dlNext AND b.time_zone IN (:...dlTomorrow))');
  if (lastDayToday.length) parts.push('(b.graze_until = :dlUtc AND b.time_zone IN (:...dlToday))');
  return { sql: `(${parts.join(' OR ')})`, params: { dlNext: next, dlUtc: utc, dlTomorrow: lastDayTomorrow, dlToday: lastDayToday } };
}

function whereInBox(qb: Qb, box: LatLngBox, tag: string): void {
  qb.andWhere(`b.latitude >= :${tag}LatMin AND b.latitude <= :${tag}LatMax`, { [`${tag}LatMin`]: box.latMin, [`${tag}LatMax`]: box.latMax });
  if (box.lngRanges.length === 0) return;
  qb.andWhere(
    new Brackets((w) => {
      box.lngRanges.forEach(([west, east], i) => {
        w.orWhere(`(b.longitude >= :${tag}W${i} AND b.longitude <= :${tag}E${i})`, { [`${tag}W${i}`]: west, [`${tag}E${i}`]: east });
      });
    }),
  );
}

/** Blocks within `miles` of home: the box for the index, then lib's exact distance. */
function whereWithin(qb: Qb, home: LatLng, miles: number, tag: string): void {
  const box = boundingBox(home, miles);
  if (box) whereInBox(qb, box, tag);
  qb.andWhere(`${distanceMilesSql('homeLat', 'homeLng')} <= :${tag}Miles`, { homeLat: home.latitude, homeLng: home.longitude, [`${tag}Miles`]: miles });
}

/** Every comma-joined list of distinct species (in any order) that includes `species`. */
function speciesListsWith(species: GrazingSpecies): string[] {
  const lists: string[][] = [[]];
  for (let n = 0; n < GRAZING_SPECIES.length; n++) {
    for (const list of lists.filter((l) => l.length === n)) for (const s of GRAZING_SPECIES) if (!list.includes(s)) lists.push([...list, s]);
  }
  return lists.filter((l) => l.includes(species)).map((l) => l.join(','));
}

/** Days of feed for the viewer's flock, as SQL: the same two divisions, in the same order, as lib's capacity → daysForHead. */
const DAYS_SQL = '((b.allowable_lb / :intake) / :head)';

/** The blocks the list may show, before sorting: one query builder every step clones. */
async function filtered(ds: DataSource, nowMs: number, viewer: ListViewer, view: ListView, q: ListAsk): Promise<Qb> {
  const qb = ds.getRepository(Block).createQueryBuilder('b');
  if (view === 'mine') {
    qb.where('b.owner_id = :me', { me: viewer.id });
    if (q.status) qb.andWhere('b.status = :status', { status: q.status });
  } else {
    const left = await daysLeftCondition(ds, nowMs);
    qb.where("b.status = 'open'").andWhere('b.owner_id != :me', { me: viewer.id }).andWhere(left.sql, left.params);
  }
  if (q.minAcres !== undefined) qb.andWhere('b.acres >= :minAcres', { minAcres: q.minAcres });
  if (q.maxAcres !== undefined) qb.andWhere('b.acres <= :maxAcres', { maxAcres: q.maxAcres });
  // species_allowed is the list as entered ("sheep", "goats,sheep", …): match every list that holds the species.
  if (q.species) qb.andWhere('b.species_allowed IN (:...speciesLists)', { speciesLists: speciesListsWith(q.species) });
  // A stay fits when the two ranges share at least one whole day: max(starts) < min(ends), term by term.
  if (q.from || q.to) {
    qb.andWhere('b.graze_from < b.graze_until');
    if (q.from) qb.andWhere(':from < b.graze_until', { from: q.from });
    if (q.to) qb.andWhere('b.graze_from < :to', { to: q.to });
  }
  if (q.maxMiles !== undefined) whereWithin(qb, viewer.home!, q.maxMiles, 'max');
  if (viewer.flock) qb.setParameters({ intake: viewer.flock.intakeLbPerHead, head: viewer.flock.headCount });
  if (q.minDays !== undefined) {
    // The allowable bound lets the index narrow the rows; the exact expression decides.
    const perDay = viewer.flock!.intakeLbPerHead * viewer.flock!.headCount;
    qb.andWhere('b.allowable_lb >= :minAllowable', { minAllowable: q.minDays * perDay * (1 - LOOSE) });
    qb.andWhere(`${DAYS_SQL} >= :minDays`, { minDays: q.minDays });
  }
  return qb;
}

interface KeyRow {
  id: string;
  name: string;
  k: number | string;
}

/**
 * A sort on one indexed figure. `rank` turns the raw figure into what the reference comparator compares;
 * `between` and `ahead` select rows by figure (inclusive range in list order; strictly ahead of one figure).
 */
interface FigureSort {
  select: string;
  orderBy: string;
  dir: 'ASC' | 'DESC';
  rank: (k: number | string) => number | string;
  /** Negative when `a` comes first. */
  compare: (a: number | string, b: number | string) => number;
  between: (qb: Qb, first: number | string, last: number | string) => void;
  ahead: (qb: Qb, k: number | string) => void;
}

/**
 * A created_at bound in the column's own terms. On SQLite the column is text in UTC: 'YYYY-MM-DD HH:MM:SS.SSS' when
 * TypeORM writes it, without the millis when SQLite's datetime('now') does. On PostgreSQL it is a timestamptz to the
 * millisecond, compared with the instant itself.
 */
function createdAtBound(ds: DataSource, ms: number, end: 'low' | 'high'): string | Date {
  if (ds.options.type === 'postgres') return new Date(ms);
  const iso = new Date(ms).toISOString().replace('T', ' ').replace('Z', '');
  return end === 'low' && iso.endsWith('.000') ? iso.slice(0, -4) : iso;
}

function figureSort(ds: DataSource, sort: Exclude<BlockSort, 'distance'>, viewer: ListViewer): FigureSort {
  const asc = (a: number | string, b: number | string) => (a < b ? -1 : a > b ? 1 : 0);
  const desc = (a: number | string, b: number | string) => (b as number) - (a as number);
  switch (sort) {
    case 'window':
      return {
        select: 'b.graze_from',
        orderBy: 'b.graze_from',
        dir: 'ASC',
        rank: String,
        compare: asc,
        between: (qb, first, last) => qb.andWhere('b.graze_from >= :kFirst AND b.graze_from <= :kLast', { kFirst: first, kLast: last }),
        ahead: (qb, k) => qb.andWhere('b.graze_from < :kAhead', { kAhead: k }),
      };
    case 'acres':
      return {
        select: 'b.acres',
        orderBy: 'b.acres',
        dir: 'DESC',
        rank: Number,
        compare: desc,
        between: (qb, first, last) => qb.andWhere('b.acres <= :kFirst AND b.acres >= :kLast', { kFirst: first, kLast: last }),
        ahead: (qb, k) => qb.andWhere('b.acres > :kAhead', { kAhead: k }),
      };
    case 'days': {
      // Walk the allowable index: days = allowable ÷ a positive constant never reorders it. The allowable
      // bounds let the index narrow the rows; the exact expression decides.
      const perDay = viewer.flock!.intakeLbPerHead * viewer.flock!.headCount;
      return {
        select: DAYS_SQL,
        orderBy: 'b.allowable_lb',
        dir: 'DESC',
        rank: Number,
        compare: desc,
        between: (qb, first, last) =>
          qb
            .andWhere('b.allowable_lb <= :aFirst AND b.allowable_lb >= :aLast', { aFirst: (first as number) * perDay * (1 + LOOSE), aLast: (last as number) * perDay * (1 - LOOSE) })
            .andWhere(`${DAYS_SQL} <= :kFirst AND ${DAYS_SQL} >= :kLast`, { kFirst: first, kLast: last }),
        ahead: (qb, k) => qb.andWhere('b.allowable_lb >= :aAhead', { aAhead: (k as number) * perDay * (1 - LOOSE) }).andWhere(`${DAYS_SQL} > :kAhead`, { kAhead: k }),
      };
    }
    case 'newest': {
      const column = ds.getMetadata(Block).findColumnWithPropertyName('createdAt')!;
      const ms = (k: number | string) => (ds.driver.prepareHydratedValue(k, column) as Date).getTime();
      return {
        select: 'b.created_at',
        orderBy: 'b.created_at',
        dir: 'DESC',
        rank: ms,
        compare: desc,
        between: (qb, first, last) =>
          qb.andWhere('b.created_at <= :kFirst AND b.created_at >= :kLast', { kFirst: createdAtBound(ds, first as number, 'high'), kLast: createdAtBound(ds, last as number, 'low') }),
        ahead: (qb, k) => qb.andWhere('b.created_at > :kAhead', { kAhead: createdAtBound(ds, k as number, 'high') }),
      };
    }
  }
}

const byName = (a: { name: string; id: string }, b: { name: string; id: string }) => a.name.localeCompare(b.name) || a.id.localeCompare(b.id);

/** The page's ids for a sort on one indexed figure. */
async function pageByFigure(ds: DataSource, base: Qb, sort: FigureSort, offset: number, limit: number): Promise<string[]> {
  const keyed = (qb: Qb) => qb.select('b.id', 'id').addSelect('b.name', 'name').addSelect(sort.select, 'k');
  // One row either side of the page tells whether equal figures straddle its edges.
  const start = Math.max(0, offset - 1);
  const raw = await shaped.raw<KeyRow>(ds, keyed(base.clone()).orderBy(sort.orderBy, sort.dir), { limit: limit + 1 + (offset - start), offset: start });
  const rows = raw.map((r) => ({ ...r, k: sort.rank(r.k) }));
  const before = offset > 0 ? rows[0] : undefined;
  const page = rows.slice(offset - start, offset - start + limit);
  const after = rows[offset - start + limit];
  if (page.length === 0) return [];
  const first = page[0].k;
  const last = page[page.length - 1].k;
  const tiedBefore = before !== undefined && sort.compare(before.k, first) === 0;
  const tiedAfter = after !== undefined && sort.compare(after.k, last) === 0;
  const exact = (a: { k: number | string; name: string; id: string }, b: typeof a) => sort.compare(a.k, b.k) || byName(a, b);
  if (!tiedBefore && !tiedAfter) return page.sort(exact).map((r) => r.id);

  // Every row whose figure lies from the first to the last on the page, and how many rows come ahead of them.
  const span = keyed(base.clone());
  sort.between(span, first, last);
  const around = (await shaped.raw<KeyRow>(ds, span)).map((r) => ({ ...r, k: sort.rank(r.k) })).sort(exact);
  let ahead = offset;
  if (tiedBefore) {
    const count = base.clone().select('COUNT(*)', 'n');
    sort.ahead(count, first);
    ahead = Number((await shaped.raw<{ n: number | string }>(ds, count))[0].n);
  }
  return around.slice(offset - ahead, offset - ahead + limit).map((r) => r.id);
}

/** First radius tried for "nearest first", in miles, before any disk has been read; it grows until the disk holds the page. */
const FIRST_RADIUS_MILES = 30;

/**
 * Open blocks per square mile in the last disk that held a page (this process; null before the first). The next
 * "nearest first" starts from the radius that density says holds its page, with half as much again to spare:
 * a disk walks a latitude band as wide as itself, so a radius twice too large reads twice the index it needs, and
 * one too small costs another, wider disk. Only where the search starts depends on it, never what it finds.
 */
let blocksPerSquareMile: number | null = null;

function firstRadius(needed: number): number {
  if (blocksPerSquareMile === null || !(blocksPerSquareMile > 0)) return FIRST_RADIUS_MILES;
  return Math.min(500, Math.max(2, Math.sqrt((1.5 * needed) / (Math.PI * blocksPerSquareMile))));
}

/**
 * The page's ids nearest first: the smallest disk round home holding every block up to the page's end. The disk's
 * rows come from the place index alone (id and place, no table look-ups) and lib's distance decides in JS what
 * lies inside; names are read only for blocks at exactly the same distance as another, which the name orders.
 */
async function pageByDistance(ds: DataSource, base: Qb, home: LatLng, maxMiles: number | undefined, total: number, offset: number, limit: number): Promise<string[]> {
  const needed = offset + limit;
  const widest = maxMiles ?? Number.POSITIVE_INFINITY;
  let miles = needed >= total ? widest : Math.min(widest, firstRadius(needed));
  let rows: Array<{ id: string; d: number }>;
  for (;;) {
    const qb = base.clone().select('b.id', 'id').addSelect('b.latitude', 'latitude').addSelect('b.longitude', 'longitude');
    const disk = Number.isFinite(miles) && miles !== maxMiles;
    const box = disk ? boundingBox(home, miles) : null;
    if (box) whereInBox(qb, box, 'disk');
    const found = await shaped.raw<{ id: string; latitude: number; longitude: number }>(ds, qb);
    rows = found.map((r) => ({ id: r.id, d: distanceMiles(home, r) }));
    if (disk) rows = rows.filter((r) => r.d <= miles);
    if (disk && rows.length >= needed) blocksPerSquareMile = rows.length / (Math.PI * miles * miles);
    if (rows.length >= needed || !Number.isFinite(miles) || miles >= widest) break;
    // Grow by the area still missing (blocks per square mile so far), at least doubling.
    miles = Math.min(widest, miles * Math.max(2, 1.25 * Math.sqrt(needed / Math.max(1, rows.length))));
    if (miles > 13_000) miles = widest;
  }
  rows.sort((a, b) => a.d - b.d);
  // Blocks at equal distances, in a run that starts within the page or at its end, are put in order by name, then id.
  const tied: string[] = [];
  for (let i = 0; i < rows.length && i <= needed; ) {
    let j = i + 1;
    while (j < rows.length && rows[j].d === rows[i].d) j++;
    if (j - i > 1) for (let k = i; k < j; k++) tied.push(rows[k].id);
    i = j;
  }
  const names = new Map<string, string>();
  for (let i = 0; i < tied.length; i += 500) {
    for (const r of await namesById.raw<{ id: string; name: string }>(ds.manager, { ids: tied.slice(i, i + 500) })) names.set(r.id, r.name);
  }
  return rows
    .map((r) => ({ ...r, name: names.get(r.id) ?? '' }))
    .sort((a, b) => a.d - b.d || byName(a, b))
    .slice(offset, offset + limit)
    .map((r) => r.id);
}

/** How many rows `base` selects, counting no further than `limit`. */
async function countUpTo(ds: DataSource, base: Qb, limit: number): Promise<number> {
  const [row] = await shaped.raw<{ n: number | string }>(ds, base.clone().select('1', 'one'), { limit, wrap: COUNT_UP_TO });
  return Number(row.n);
}

/** The blocks of one page of the list and how many the list holds (exactly up to `exactCountUpTo`). */
export async function findBlockPage(
  ds: DataSource,
  nowMs: number,
  viewer: ListViewer,
  view: ListView,
  q: ListAsk,
  { exactCountUpTo = EXACT_COUNT_UP_TO } = {},
): Promise<BlockPage> {
  // From on or after To leaves no whole day to share with any block.
  if (q.from && q.to && !(q.from < q.to)) return { blocks: [], total: 0, totalCapped: false };
  const base = await filtered(ds, nowMs, viewer, view, q);
  const offset = (q.page - 1) * q.pageSize;
  const upTo = Math.max(exactCountUpTo, offset + q.pageSize);
  const counted = await countUpTo(ds, base, upTo + 1);
  const totalCapped = counted > upTo;
  const total = Math.min(counted, upTo);
  if (offset >= total) return { blocks: [], total, totalCapped };
  const ids =
    q.sort === 'distance'
      ? await pageByDistance(ds, base, viewer.home!, q.maxMiles, totalCapped ? Number.POSITIVE_INFINITY : total, offset, q.pageSize)
      : await pageByFigure(ds, base, figureSort(ds, q.sort, viewer), offset, q.pageSize);
  const found = ids.length ? await blocksById.many(ds.manager, { ids }) : [];
  const byId = new Map(found.map((b) => [b.id, b]));
  return { blocks: ids.map((id) => byId.get(id)!).filter(Boolean), total, totalCapped };
}
