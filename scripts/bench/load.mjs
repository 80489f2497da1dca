// The load part of `npm run bench`: a large invented season in a throw-away data folder, the real server on
// loopback, autocannon against the lists people wait on, and budgets that fail the run when missed.
// Every figure is printed beside its budget; the function resolves with the number of budgets missed.
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createRequire } from 'node:module';
import { performance } from 'node:perf_hooks';
import autocannon from 'autocannon';
import { freePort, root, startServer } from '../lib.mjs';

const require = createRequire(import.meta.url);

// The budgets (issue 10). Reads are measured at 20 connections; "alone" is one connection, one request at a time.
export const BUDGETS = {
  readP95Ms: 50,
  ormOverRaw: 3,
  writeUnderLoadP95Ms: 50,
};
const CONNECTIONS = 20;
const DURATION_S = 6;

export const SEASON = { openBlocks: 10_000, otherBlocks: 2_000, bids: 50_000, contracts: 1_000, logEntries: 100_000, growers: 400, graziers: 300 };
const PASSWORD = 'bench-season-password';

// ——— figures ———

function percentiles(times) {
  const s = [...times].sort((a, b) => a - b);
  const at = (p) => s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] ?? NaN;
  return { p50: at(50), p95: at(95), p99: at(99), n: s.length };
}
const ms = (x) => `${x.toFixed(x < 10 ? 2 : 1)} ms`;

/** autocannon for `DURATION_S` s at `connections`, with every response's time kept (autocannon itself reports no p95). */
async function cannon({ url, headers = {}, method = 'GET', body, connections = CONNECTIONS, duration = DURATION_S, requests }) {
  const times = [];
  let bad = 0;
  const instance = autocannon({ url, method, headers: { ...headers, ...(body ? { 'content-type': 'application/json' } : {}) }, body, connections, duration, requests });
  instance.on('response', (_client, status, _bytes, t) => {
    if (status >= 400) bad += 1;
    times.push(t);
  });
  const result = await instance;
  return { ...percentiles(times), rps: result.requests.average, bad: bad + result.errors + result.timeouts };
}

/** One request at a time, `n` times (the server alone, nothing else waiting). */
async function alone(n, fn) {
  const times = [];
  for (let i = 0; i < n; i++) {
    const s = performance.now();
    await fn(i);
    times.push(performance.now() - s);
  }
  return percentiles(times);
}

// ——— the same statements, straight on the database ———

/**
 * The SQL one call of a service makes, captured through TypeORM's logger in this process (the same compiled
 * service code the server runs, on the same database file), so "raw" replays exactly the server's queries.
 */
async function capturedStatements(ds, call) {
  const statements = [];
  const logger = ds.logger;
  ds.logger = { ...logger, logQuery: (query, parameters) => statements.push([query, parameters ?? []]), logQueryError() {}, logQuerySlow() {}, logSchemaBuild() {}, logMigration() {}, log() {} };
  try {
    await call();
  } finally {
    ds.logger = logger;
  }
  return statements;
}

/**
 * Time spent inside TypeORM during one call: from the first ORM call to its last, counting overlaps once
 * (query building, the driver, hydration into entities). Wraps the entry points the services use.
 */
function ormClock() {
  const { EntityManager, SelectQueryBuilder } = require(require.resolve('typeorm', { paths: [root] }));
  let depth = 0;
  let since = 0;
  let spent = 0;
  const wrapped = [];
  const wrap = (proto, name) => {
    const original = proto[name];
    wrapped.push(() => (proto[name] = original));
    proto[name] = async function (...args) {
      if (depth++ === 0) since = performance.now();
      try {
        return await original.apply(this, args);
      } finally {
        if (--depth === 0) spent += performance.now() - since;
      }
    };
  };
  for (const name of ['getMany', 'getOne', 'getRawMany', 'getRawOne', 'getCount', 'getExists']) wrap(SelectQueryBuilder.prototype, name);
  for (const name of ['find', 'findBy', 'findOne', 'findOneBy', 'count', 'countBy', 'exists', 'existsBy', 'query']) wrap(EntityManager.prototype, name);
  return {
    take: () => {
      const t = spent;
      spent = 0;
      return t;
    },
    restore: () => wrapped.forEach((undo) => undo()),
  };
}

/** p50 of replaying `statements` on PostgreSQL with a pg client of its own (the driver TypeORM uses, without TypeORM). */
async function replayPostgres(client, statements, n = 300) {
  const run = async () => {
    for (const [sql, params] of statements) await client.query(sql, params);
  };
  if (n > 1) await run();
  const times = [];
  for (let i = 0; i < n; i++) {
    const s = performance.now();
    await run();
    times.push(performance.now() - s);
  }
  return percentiles(times);
}

/** p50 of replaying `statements` with better-sqlite3 directly (prepared once, as TypeORM's statement cache does). */
const preparedCache = new WeakMap();
function replay(db, statements, n = 300) {
  if (!preparedCache.has(statements)) preparedCache.set(statements, statements.map(([sql, params]) => [db.prepare(sql), params]));
  const prepared = preparedCache.get(statements);
  const run = () => {
    for (const [stmt, params] of prepared) stmt.reader ? stmt.all(...params) : stmt.run(...params);
  };
  if (n > 1) run();
  const times = [];
  for (let i = 0; i < n; i++) {
    const s = performance.now();
    run();
    times.push(performance.now() - s);
  }
  return percentiles(times);
}

// ——— the season ———

function dayKey(ms) {
  return new Date(ms).toISOString().slice(0, 10);
}
function sqlTime(ms) {
  return new Date(ms).toISOString().replace('T', ' ').replace('Z', '');
}

/** Deterministic pseudo-random numbers (mulberry32). */
function prng(seed) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return { next, int: (lo, hi) => lo + Math.floor(next() * (hi - lo + 1)), pick: (xs) => xs[Math.floor(next() * xs.length)] };
}

/** An INSERT for `entity` built from TypeORM's own metadata and value conversion, so the bench never drifts from the schema. */
function inserter(ds, db, entity) {
  const meta = ds.getMetadata(entity);
  const cols = meta.columns;
  const stmt = db.prepare(`INSERT INTO "${meta.tableName}" (${cols.map((c) => `"${c.databaseName}"`).join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`);
  return (row) => stmt.run(cols.map((c) => ds.driver.preparePersistentValue(row[c.propertyName], c) ?? null));
}

/**
 * Writes the season straight into the database: migrations through the server's own data source, then on SQLite one
 * prepared statement per table inside one transaction, on PostgreSQL multi-row INSERTs of 500 rows in one
 * transaction. Block columns come from the service's own record builder. `target` is a SQLite file or a postgres:// URL.
 */
export async function seedSeason(target, today) {
  const dbFile = target;
  const { openDatabase } = require(path.join(root, 'build/server/db/data-source.js'));
  const { validBlockRecord } = require(path.join(root, 'build/server/modules/blocks/blocks.service.js'));
  const { Account } = require(path.join(root, 'build/server/modules/accounts/account.entity.js'));
  const { Block } = require(path.join(root, 'build/server/modules/blocks/block.entity.js'));
  const { Bid } = require(path.join(root, 'build/server/modules/bids/bid.entity.js'));
  const { Contract } = require(path.join(root, 'build/server/modules/contracts/contract.entity.js'));
  const bcrypt = require('bcryptjs');
  const ds = await openDatabase(dbFile);
  const postgres = ds.options.type === 'postgres';
  const db = postgres ? null : ds.driver.databaseConnection;
  const r = prng(10_000);
  const t0 = Date.parse(`${today}T12:00:00Z`);
  const day = 86_400_000;
  const hash = bcrypt.hashSync(PASSWORD, 10);

  const accounts = [];
  const person = (i, roles, extra = {}) => ({
    id: crypto.randomUUID(),
    email: `season-${i}@bench.example`,
    passwordHash: hash,
    name: `Season ${roles} ${i}`,
    roles,
    activeRole: null,
    businessName: `Invented ${roles} ${i}`,
    phone: null,
    homePlace: null,
    homeLatitude: null,
    homeLongitude: null,
    flockSpecies: null,
    flockClass: null,
    flockHeadCount: null,
    flockBodyWeightLb: null,
    createdAt: new Date(t0 - 400 * day),
    updatedAt: new Date(t0 - 400 * day),
    ...extra,
  });
  const growers = Array.from({ length: SEASON.growers }, (_, i) => person(i, 'grower'));
  const graziers = Array.from({ length: SEASON.graziers }, (_, i) =>
    person(SEASON.growers + i, 'grazier', {
      homePlace: 'Yards',
      homeLatitude: 34 + r.next() * 8,
      homeLongitude: -123.5 + r.next() * 7,
      flockSpecies: r.pick(['sheep', 'goats', 'mixed']),
      flockClass: r.pick(['dry ewes', 'wethers', 'ewes with lambs']),
      flockHeadCount: r.int(80, 2500),
      flockBodyWeightLb: r.int(90, 170),
    }),
  );
  // The two whose requests are measured: a grazier in the middle of the district with 600 dry ewes, and a grower.
  graziers[0] = { ...graziers[0], email: 'grazier@bench.example', homeLatitude: 38, homeLongitude: -120, flockSpecies: 'sheep', flockClass: 'dry ewes', flockHeadCount: 600, flockBodyWeightLb: 150 };
  growers[0] = { ...growers[0], email: 'grower@bench.example' };
  accounts.push(...growers, ...graziers);

  const blocks = [];
  const total = SEASON.openBlocks + SEASON.otherBlocks;
  for (let i = 0; i < total; i++) {
    const start = t0 + r.int(-20, 150) * day;
    const windowStart = dayKey(start);
    const windowEnd = dayKey(start + r.int(14, 90) * day);
    const outBy = dayKey(start + r.int(10, 100) * day);
    const sprays = r.next() < 0.3 ? [{ product: 'Invented fungicide', appliedOn: dayKey(start - r.int(0, 30) * day), grazingRestrictionDays: r.pick([0, 7, 14, 21]), containsCopper: r.next() < 0.3 }] : [];
    const body = {
      name: `${r.pick(['North', 'South', 'River', 'Upper', 'Lower', 'Bench', 'Creek'])} ${r.pick(['walnut', 'almond', 'vineyard', 'cover crop', 'fallow', 'prune'])} block ${i}`,
      crop: r.pick(['orchard', 'vineyard', 'row-crop cover', 'fallow', 'pasture']),
      acres: r.pick([5, 10, 20, 36, 40, 80, 120, 160, 300]) + r.int(0, 9) / 4,
      placeName: 'Invented district',
      latitude: Number((34 + r.next() * 8).toFixed(5)),
      longitude: Number((-123.5 + r.next() * 7).toFixed(5)),
      timeZone: 'America/Los_Angeles',
      forageMethod: 'direct',
      lbDmPerAcre: r.int(600, 3500),
      targetUtilizationPct: r.pick([35, 40, 45, 50]),
      windowStart,
      windowEnd,
      outBy: outBy > windowStart ? outBy : windowEnd,
      harvestDate: null,
      sprayRecords: sprays,
      waterOnSite: r.next() < 0.6,
      perimeterFence: r.pick(['none', 'partial', 'full']),
      truckAccess: r.next() < 0.8,
      speciesAllowed: r.pick([['sheep'], ['goats'], ['sheep', 'goats']]),
      youngPlantings: r.next() < 0.2,
    };
    const record = await validBlockRecord(body);
    const created = t0 - r.int(1, 60 * 24 * 3600) * 1000;
    const status = i < SEASON.openBlocks ? 'open' : i < SEASON.openBlocks + SEASON.contracts ? 'awarded' : r.pick(['draft', 'withdrawn']);
    // The measured grower owns 25 blocks; the others share the rest.
    const owner = i < 25 ? growers[0] : growers[1 + (i % (growers.length - 1))];
    blocks.push({ id: crypto.randomUUID(), ownerId: owner.id, status, ...record, publishedAt: status === 'draft' ? null : new Date(created), awardedAt: status === 'awarded' ? new Date(t0) : null, withdrawnAt: null, createdAt: new Date(created), updatedAt: new Date(created) });
  }

  const bids = [];
  const contracts = [];
  const open = blocks.filter((b) => b.status === 'open');
  const awarded = blocks.filter((b) => b.status === 'awarded');
  const bidOn = (block, grazier, status) => {
    const created = block.createdAt.getTime() + r.int(1, 3600 * 48) * 1000;
    return {
      id: crypto.randomUUID(),
      blockId: block.id,
      grazierId: grazier.id,
      status,
      basis: r.pick(['head-day', 'acre', 'flat']),
      rate: r.pick(['0.18', '0.2', '0.25', '35', '1200']),
      headCount: r.int(100, 1500),
      species: block.speciesAllowed[0],
      animalClass: block.speciesAllowed[0] === 'sheep' ? 'dry ewes' : 'wethers',
      bodyWeightLb: r.int(100, 160),
      startDate: block.windowStart,
      endDate: block.windowEnd < block.outBy ? block.windowEnd : block.outBy,
      services: ['fencing'],
      note: null,
      decidedAt: null,
      createdAt: new Date(created),
      updatedAt: new Date(created),
    };
  };
  // The first open block of the measured grower carries 40 bids: the comparison a grower waits on.
  const perBlock = (k) => (k === 0 ? 40 : 0);
  let k = 0;
  while (bids.length < SEASON.bids - SEASON.contracts) {
    const block = open[k % open.length];
    const round = Math.floor(k / open.length);
    const n = perBlock(k) || 1;
    for (let j = 0; j < n; j++) bids.push(bidOn(block, graziers[(k * 7 + round * 13 + j) % graziers.length], round === 0 || r.next() < 0.6 ? 'live' : r.pick(['declined', 'withdrawn'])));
    k += 1;
  }
  for (let c = 0; c < SEASON.contracts; c++) {
    const block = awarded[c];
    const grazier = graziers[c % graziers.length];
    const bid = { ...bidOn(block, grazier, 'accepted'), decidedAt: new Date(t0) };
    bids.push(bid);
    contracts.push({
      id: crypto.randomUUID(),
      blockId: block.id,
      bidId: bid.id,
      growerId: block.ownerId,
      grazierId: grazier.id,
      status: 'to-sign',
      basis: bid.basis,
      rate: bid.rate,
      headCount: bid.headCount,
      species: bid.species,
      animalClass: bid.animalClass,
      bodyWeightLb: bid.bodyWeightLb,
      startDate: bid.startDate,
      endDate: bid.endDate,
      outBy: block.outBy,
      services: bid.services,
      acres: block.acres,
      lbDmPerAcre: block.lbDmPerAcre,
      targetUtilizationPct: block.targetUtilizationPct,
      timeZone: block.timeZone,
      // Columns the contract-signing migration added (NOT NULL with a default the prepared INSERT would not apply).
      termsVersion: 1,
      revision: 0,
      createdAt: new Date(t0),
      updatedAt: new Date(t0),
    });
  }
  // Live bids must be one per grazier per block (a unique index holds it): drop repeats the rounds made.
  const seen = new Set();
  const uniqueBids = bids.filter((b) => {
    if (b.status !== 'live') return true;
    const key = `${b.blockId}/${b.grazierId}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });

  const count = async (sql) => Number((await ds.query(sql))[0].n);
  if (postgres) {
    await ds.transaction(async (tx) => {
      for (const [entity, rows] of [[Account, accounts], [Block, blocks], [Bid, uniqueBids], [Contract, contracts]]) {
        for (let i = 0; i < rows.length; i += 500) await tx.createQueryBuilder().insert().into(entity).values(rows.slice(i, i + 500)).updateEntity(false).execute();
      }
    });
    await ds.query('ANALYZE');
  } else {
    const insert = {
      account: inserter(ds, db, Account),
      block: inserter(ds, db, Block),
      bid: inserter(ds, db, Bid),
      contract: inserter(ds, db, Contract),
    };
    db.transaction(() => {
      accounts.forEach(insert.account);
      blocks.forEach(insert.block);
      uniqueBids.forEach(insert.bid);
      contracts.forEach(insert.contract);
    })();
    db.pragma('wal_checkpoint(TRUNCATE)');
  }
  const counts = {
    openBlocks: await count(`SELECT COUNT(*) AS n FROM blocks WHERE status = 'open'`),
    bids: await count('SELECT COUNT(*) AS n FROM bids'),
    contracts: await count('SELECT COUNT(*) AS n FROM contracts'),
  };
  const logTable = postgres
    ? (await ds.query(`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_name LIKE '%log%'`)).map((x) => x.name)
    : db.prepare(`SELECT name FROM sqlite_master WHERE type = 'table' AND name LIKE '%log%'`).all().map((x) => x.name);
  await ds.destroy();
  return { counts, logTable, grower: growers[0], grazier: graziers[0], bidBlock: open[0] };
}

// ——— the run ———

/**
 * The season's load figures on one engine: SQLite in a throw-away DATA_DIR (the default), or PostgreSQL when
 * `databaseUrl` names an empty database (npm run bench -- --engines sqlite,postgres makes one on a throw-away cluster).
 */
export async function benchLoad(row, { databaseUrl = null } = {}) {
  const misses = [];
  const budget = (what, figure, ok, rule) => {
    row(what, `${figure}   [${rule}: ${ok ? 'ok' : 'MISSED'}]`);
    if (!ok) misses.push(what);
  };
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-load-'));
  const today = new Date().toISOString().slice(0, 10);
  let server;
  try {
    const s0 = performance.now();
    const dbFile = databaseUrl ?? path.join(dataDir, 'fieldfold.sqlite');
    const season = await seedSeason(dbFile, today);
    row('season seeded (straight into the database)', `${season.counts.openBlocks.toLocaleString('en-US')} open blocks, ${season.counts.bids.toLocaleString('en-US')} bids, ${season.counts.contracts.toLocaleString('en-US')} contracts in ${((performance.now() - s0) / 1000).toFixed(1)} s`);

    const port = await freePort();
    server = await startServer({ PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, NODE_ENV: 'production', SEED_DEMO: 'false', ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}) }, { quiet: true });
    const base = `http://127.0.0.1:${port}`;
    const login = async (email) => {
      const res = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: PASSWORD }) });
      if (!res.ok) throw new Error(`bench login ${email}: ${res.status} ${await res.text()}`);
      return { authorization: `Bearer ${(await res.json()).token}` };
    };
    const grazier = await login('grazier@bench.example');
    const grower = await login('grower@bench.example');

    // The server's own service code in this process, on the same file, to capture each request's SQL.
    const { openDatabase } = require(path.join(root, 'build/server/db/data-source.js'));
    const { registerSqlFunctions } = require(path.join(root, 'build/server/db/sql-functions.js'));
    const { listBlocks } = require(path.join(root, 'build/server/modules/blocks/blocks.service.js'));
    const { listBlockBids } = require(path.join(root, 'build/server/modules/bids/bids.service.js'));
    const { Account } = require(path.join(root, 'build/server/modules/accounts/account.entity.js'));
    const ds = await openDatabase(dbFile);
    let raw;
    let replayRaw;
    if (databaseUrl) {
      const { Client } = require('pg');
      raw = new Client({ connectionString: databaseUrl });
      await raw.connect();
      replayRaw = (statements) => replayPostgres(raw, statements, 1);
    } else {
      const Database = require('better-sqlite3');
      raw = new Database(dbFile, { readonly: true });
      registerSqlFunctions(raw);
      replayRaw = async (statements) => replay(raw, statements, 1);
    }
    const ctx = { ds, now: Date.now, tokenSecret: 'bench-only-secret-long-enough-to-sign', log: () => {}, links: null, outbox: null, photos: null };
    const account = (email) => ds.getRepository(Account).findOneByOrFail({ email });
    const [grazierAccount, growerAccount] = [await account('grazier@bench.example'), await account('grower@bench.example')];

    const filters = { view: 'market', maxMiles: '150', minAcres: '20', species: 'sheep', minDays: '2', from: today, sort: 'days' };
    const reads = [
      { label: 'market, no filters (nearest first)', query: { view: 'market' }, headers: grazier, call: (q) => listBlocks(ctx, grazierAccount, q) },
      { label: 'market, filtered (150 mi, acres, sheep, days, dates)', query: filters, headers: grazier, call: (q) => listBlocks(ctx, grazierAccount, q) },
      {
        label: "a block's bids, compared (grower, 40 bids)",
        path: `/api/blocks/${season.bidBlock.id}/bids`,
        query: {},
        headers: grower,
        call: (q) => listBlockBids(ctx, growerAccount, season.bidBlock.id, q),
      },
    ];
    try {
      for (const read of reads) {
        const url = `${base}${read.path ?? '/api/blocks'}?${new URLSearchParams(read.query)}`;
        const check = await fetch(url, { headers: read.headers });
        if (!check.ok) throw new Error(`${url}: ${check.status} ${await check.text()}`);
        await check.arrayBuffer();
        const one = await alone(150, async () => {
          const res = await fetch(url, { headers: read.headers });
          await res.arrayBuffer();
        });
        const load = await cannon({ url, headers: read.headers });
        budget(
          `${read.label}, ${CONNECTIONS} conn`,
          `${load.rps.toFixed(0)} req/s · p50 ${ms(load.p50)} · p95 ${ms(load.p95)} · p99 ${ms(load.p99)}${load.bad ? ` · ${load.bad} failed` : ''}`,
          load.p95 < BUDGETS.readP95Ms && load.bad === 0,
          `p95 < ${BUDGETS.readP95Ms} ms`,
        );
        // ORM over raw, in this process: the service's time inside TypeORM against the same statements run
        // with better-sqlite3 directly, interleaved so both meet the same machine.
        const statements = await capturedStatements(ds, () => read.call({ ...read.query }));
        const clock = ormClock();
        const orm = [];
        const service = [];
        const sqlTimes = [];
        try {
          for (let i = 0; i < 120; i++) {
            const s0 = performance.now();
            await read.call({ ...read.query });
            service.push(performance.now() - s0);
            orm.push(clock.take());
            sqlTimes.push((await replayRaw(statements)).p50);
          }
        } finally {
          clock.restore();
        }
        const [o, sv, sq] = [percentiles(orm.slice(20)), percentiles(service.slice(20)), percentiles(sqlTimes.slice(20))];
        row(`  alone, one request at a time`, `HTTP p50 ${ms(one.p50)} · p95 ${ms(one.p95)}; the service in-process p50 ${ms(sv.p50)}`);
        budget(
          `  in TypeORM vs its SQL statements run by the driver alone`,
          `ORM p50 ${ms(o.p50)} · SQL p50 ${ms(sq.p50)} (${statements.length} statements) · ${(o.p50 / sq.p50).toFixed(1)}×`,
          o.p50 / sq.p50 < BUDGETS.ormOverRaw,
          `ORM over raw < ${BUDGETS.ormOverRaw}×`,
        );
      }
    } finally {
      await raw.end?.();
      raw.close?.();
      await ds.destroy();
    }
    row("a contract's log with running totals", season.logTable.length ? `not measured: log table ${season.logTable.join(', ')} has no seeder here yet` : 'not measured: no log table yet');
    row('invoice list', 'not measured: no invoices yet');

    // A write while the market is under load: a grower posting a block draft (the log POST once the log exists).
    // Posts go one at a time, 50 ms apart, only while the market load runs.
    let loading = true;
    const marketLoad = cannon({ url: `${base}/api/blocks?view=market`, headers: grazier }).finally(() => {
      loading = false;
    });
    await new Promise((r) => setTimeout(r, 1000));
    const blockBody = JSON.stringify({
      name: 'Posted under load',
      crop: 'orchard',
      acres: 40,
      latitude: 38.1,
      longitude: -120.2,
      forageMethod: 'direct',
      lbDmPerAcre: 1800,
      targetUtilizationPct: 45,
      windowStart: today,
      windowEnd: dayKey(Date.now() + 60 * 86_400_000),
      outBy: dayKey(Date.now() + 50 * 86_400_000),
      waterOnSite: true,
      perimeterFence: 'full',
      truckAccess: true,
      speciesAllowed: ['sheep'],
      youngPlantings: false,
    });
    const postTimes = [];
    while (loading && postTimes.length < 400) {
      const s = performance.now();
      const res = await fetch(`${base}/api/blocks`, { method: 'POST', headers: { ...grower, 'content-type': 'application/json' }, body: blockBody });
      if (res.status !== 201) throw new Error(`block POST under load: ${res.status} ${await res.text()}`);
      await res.arrayBuffer();
      if (loading) postTimes.push(performance.now() - s);
      await new Promise((r) => setTimeout(r, 50));
    }
    const posts = percentiles(postTimes);
    const loaded = await marketLoad;
    budget(`block POST while the market takes ${CONNECTIONS} conn`, `p50 ${ms(posts.p50)} · p95 ${ms(posts.p95)} · p99 ${ms(posts.p99)} (n=${posts.n}; market meanwhile ${loaded.rps.toFixed(0)} req/s, p95 ${ms(loaded.p95)})`, posts.p95 < BUDGETS.writeUnderLoadP95Ms, `p95 < ${BUDGETS.writeUnderLoadP95Ms} ms`);
    row('log entry POST while the market is loaded', 'not measured: no log table yet');

    const rss = fs.readFileSync(`/proc/${server.pid}/status`, 'utf8').match(/VmRSS:\s+(\d+) kB/);
    row('server memory at the end (RSS)', rss ? `${(Number(rss[1]) / 1024).toFixed(0)} MB` : 'unknown');
  } finally {
    server?.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 300));
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
  if (misses.length) row('budgets missed', misses.join('; '));
  else row('budgets', 'all met');
  return misses.length;
}
