// The load part of `npm run bench`: a large invented season in a throw-away data folder, the real server on
// loopback, autocannon against the lists people wait on, and budgets that fail the run when missed.
// Every figure is printed beside its budget; the function resolves with the number of budgets missed.
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createRequire } from 'node:module';
import { performance } from 'node:perf_hooks';
import { spawn } from 'node:child_process';
import { freePort, root, startServer, stopServers } from '../lib.mjs';
import { PASSWORD, seedSeason } from './season.mjs';
export { SEASON } from './season.mjs';

const require = createRequire(import.meta.url);

// The budgets (issue 10). Reads are measured at 20 connections; "alone" is one connection, one request at a time.
export const BUDGETS = {
  readP95Ms: 50,
  ormOverRaw: 3,
  writeUnderLoadP95Ms: 50,
  pdfMs: 150,
};
const CONNECTIONS = 20;
const DURATION_S = 6;


// ——— figures ———

function percentiles(times) {
  const s = [...times].sort((a, b) => a - b);
  const at = (p) => s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)] ?? NaN;
  return { p50: at(50), p95: at(95), p99: at(99), n: s.length };
}
const ms = (x) => `${x.toFixed(x < 10 ? 2 : 1)} ms`;

/**
 * autocannon for `DURATION_S` s at `connections` per run, every run at once in one child process
 * (scripts/bench/cannon.mjs), with every response's time kept (autocannon itself reports no p95).
 */
async function cannonTogether(runs) {
  const asked = runs.map(({ url, headers = {}, method = 'GET', body, connections = CONNECTIONS, duration = DURATION_S, requests }) => ({ url, headers, method, body, connections, duration, requests }));
  const child = spawn(process.execPath, [path.join(root, 'scripts/bench/cannon.mjs'), JSON.stringify(asked)], { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (err += d));
  const code = await new Promise((resolve) => child.on('close', resolve));
  if (code !== 0) throw new Error(`autocannon against ${asked.map((r) => r.url).join(', ')} exited ${code}: ${err}`);
  return JSON.parse(out).map(({ times, rps, bad }) => ({ ...percentiles(times), times, rps, bad }));
}

const cannon = async (run) => (await cannonTogether([run]))[0];

/** Seconds of the same load, thrown away, before each measured run: the server just started, and V8 is still optimising the route's code. */
const WARM_UP_S = 2;
const warmedCannon = async (run) => {
  await cannon({ ...run, duration: WARM_UP_S });
  return cannon(run);
};

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
  const { DataSource, EntityManager, SelectQueryBuilder } = require(require.resolve('typeorm', { paths: [root] }));
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
  // The lists' shaped statements (server/lib/db/shaped-sql.ts) and the capped count go straight to DataSource#query.
  wrap(DataSource.prototype, 'query');
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

// ——— the run ———

const dayKey = (ms) => new Date(ms).toISOString().slice(0, 10);
const count = (n) => n.toLocaleString('en-US');
const PDF_RUNS = 12;

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
    const season = await seedSeason(dbFile, dataDir);
    const n = season.counts;
    row(
      'season seeded (builders straight into the database, sign-off and invoices through the services)',
      `${count(n.openBlocks)} open blocks, ${count(n.bids)} bids, ${count(n.contracts)} contracts (${Object.entries(n.byStatus).map(([k, v]) => `${v} ${k}`).join(', ')}), ${count(n.logEntries)} log entries, ${count(n.invoices)} invoices (${n.paid} paid; ${n.growerInvoices} to the measured grower) in ${((performance.now() - s0) / 1000).toFixed(1)} s`,
    );

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
    const measured = season.measured.id;

    // The server's own service code in this process, on the same file, to capture each request's SQL.
    const { openDatabase } = require(path.join(root, 'build/server/db/data-source.js'));
    const { registerSqlFunctions } = require(path.join(root, 'build/server/db/sql-functions.js'));
    const { serviceContext } = require(path.join(root, 'build/server/app.js'));
    const { listBlocks } = require(path.join(root, 'build/server/modules/blocks/blocks.service.js'));
    const { listBlockBids } = require(path.join(root, 'build/server/modules/bids/bids.service.js'));
    const { listLog } = require(path.join(root, 'build/server/modules/contracts/contract-log.service.js'));
    const { listInvoices } = require(path.join(root, 'build/server/modules/invoices/invoices.service.js'));
    const { grazingLogPdf, grazingLogPdfData } = require(path.join(root, 'build/server/modules/contracts/contract-documents.js'));
    const { Account } = require(path.join(root, 'build/server/modules/accounts/account.entity.js'));
    const { Contract } = require(path.join(root, 'build/server/modules/contracts/contract.entity.js'));
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
    const ctx = serviceContext({
      dataSource: ds,
      tokens: { secret: 'bench-only-secret-long-enough-to-sign', ttl: '1h' },
      uploadsDir: path.join(dataDir, 'uploads'),
      documentsDir: path.join(dataDir, 'documents'),
      outbox: { kick() {} },
      log: () => {},
      payments: null,
    });
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
      {
        label: "a contract's log with running totals (120 days, first page)",
        path: `/api/contracts/${measured}/log`,
        query: {},
        headers: grazier,
        call: (q) => listLog(ctx, grazierAccount, measured, q),
      },
      {
        label: `the grower's invoice list (first page of ${n.growerInvoices})`,
        path: '/api/invoices',
        query: {},
        headers: grower,
        call: (q) => listInvoices(ctx, growerAccount, q),
        check: (body) => {
          const paged = Array.isArray(body.items) && body.items.length < n.growerInvoices && typeof body.nextCursor === 'string';
          budget('  the invoice list comes a page at a time', `${body.items?.length} of ${n.growerInvoices} on the first page`, paged, 'paged');
        },
      },
    ];
    try {
      // The floor: the cheapest signed-in request (headers, limits, the token, the session and its account, a small
      // JSON answer) at the same 20 connections. No list can answer faster than this on the machine at hand, so a
      // read's p95 is best read beside it. A figure, not a budget.
      {
        const me = await warmedCannon({ url: `${base}/api/me`, headers: grazier });
        row(`floor: GET /api/me (signed in, no list), ${CONNECTIONS} conn (figure only)`, `${me.rps.toFixed(0)} req/s · p50 ${ms(me.p50)} · p95 ${ms(me.p95)} · p99 ${ms(me.p99)}${me.bad ? ` · ${me.bad} failed` : ''}`);
      }
      for (const read of reads) {
        const url = `${base}${read.path ?? '/api/blocks'}?${new URLSearchParams(read.query)}`;
        const first = await fetch(url, { headers: read.headers });
        if (!first.ok) throw new Error(`${url}: ${first.status} ${await first.text()}`);
        const body = await first.json();
        read.check?.(body);
        const one = await alone(150, async () => {
          const res = await fetch(url, { headers: read.headers });
          await res.arrayBuffer();
        });
        const load = await warmedCannon({ url, headers: read.headers });
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
        row(`  alone, one request at a time`, `HTTP p50 ${ms(one.p50)} · p95 ${ms(one.p95)}; the service in-process p50 ${ms(sv.p50)}; ${count(JSON.stringify(body).length)} B of JSON`);
        budget(
          `  in TypeORM vs its SQL statements run by the driver alone`,
          `ORM p50 ${ms(o.p50)} · SQL p50 ${ms(sq.p50)} (${statements.length} statements) · ${(o.p50 / sq.p50).toFixed(1)}×`,
          o.p50 / sq.p50 < BUDGETS.ormOverRaw,
          `ORM over raw < ${BUDGETS.ormOverRaw}×`,
        );
      }

      // The unfiltered market again over two server processes on one database (npm start with SERVER_PROCESSES=2,
      // what a 2-core host would run), the 20 connections split between them as a round-robin balancer would: what
      // the second core buys while autocannon shares the machine. A figure beside the budget, not the budget.
      {
        const port2 = await freePort();
        const second = await startServer({ PORT: String(port2), HOST: '127.0.0.1', DATA_DIR: dataDir, NODE_ENV: 'production', SEED_DEMO: 'false', SERVER_PROCESSES: '2', ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}) }, { quiet: true });
        try {
          const marketPath = `/api/blocks?${new URLSearchParams({ view: 'market' })}`;
          const split = [base, `http://127.0.0.1:${port2}`].map((origin) => ({ url: `${origin}${marketPath}`, headers: grazier, connections: CONNECTIONS / 2 }));
          await cannonTogether(split.map((run) => ({ ...run, duration: WARM_UP_S })));
          const halves = await cannonTogether(split);
          const both = percentiles(halves.flatMap((h) => h.times));
          const bad = halves.reduce((sum, h) => sum + h.bad, 0);
          row(
            `market, no filters, ${CONNECTIONS} conn over 2 server processes (figure only)`,
            `${halves.reduce((sum, h) => sum + h.rps, 0).toFixed(0)} req/s · p50 ${ms(both.p50)} · p95 ${ms(both.p95)} · p99 ${ms(both.p99)}${bad ? ` · ${bad} failed` : ''}   [p95 budget ${BUDGETS.readP95Ms} ms is judged on one process above]`,
          );
        } finally {
          await stopServers([second]);
        }
      }

      // The 120-day log as a PDF. The measured contract is still grazing, so GET …/log.pdf renders a draft on
      // every request (nothing is stored until the head-days are agreed): the render itself in this process over
      // the seeded rows, then the HTTP time of a fresh request; then the finished 120-day stay, whose agreed
      // record was rendered and stored at sign-off and is served from the file store.
      const contract = await ds.getRepository(Contract).findOneByOrFail({ id: measured });
      const made = { version: 0, generatedAt: new Date().toISOString() };
      const dataTimes = [];
      const renderTimes = [];
      let pdfBytes = 0;
      let data;
      for (let i = 0; i < PDF_RUNS + 2; i++) {
        const t0 = performance.now();
        data = await grazingLogPdfData(ctx, contract, made);
        const t1 = performance.now();
        const bytes = await ctx.pdf.renderGrazingLog(data);
        const t2 = performance.now();
        pdfBytes = bytes.length;
        // The first two warm the fonts and the JIT, as the server's first requests would.
        if (i >= 2) {
          dataTimes.push(t1 - t0);
          renderTimes.push(t2 - t1);
        }
      }
      const [pd, pr] = [percentiles(dataTimes), percentiles(renderTimes)];
      budget(
        `120-day log PDF (${data.log.days.length} days, ${count(pdfBytes)} B): render, median of ${PDF_RUNS}`,
        `${ms(pr.p50)} (max ${ms(Math.max(...renderTimes))}); reading its data ${ms(pd.p50)}`,
        pr.p50 < BUDGETS.pdfMs,
        `< ${BUDGETS.pdfMs} ms`,
      );
      const pdfUrl = (id) => `${base}/api/contracts/${id}/log.pdf`;
      const timeGet = async (url) => {
        const t0 = performance.now();
        const res = await fetch(url, { headers: grazier });
        const bytes = (await res.arrayBuffer()).byteLength;
        if (!res.ok) throw new Error(`${url}: ${res.status}`);
        return { t: performance.now() - t0, bytes, version: res.headers.get('x-document-version') };
      };
      const draft = await timeGet(pdfUrl(measured));
      const again = await alone(5, () => timeGet(pdfUrl(measured)));
      row('  GET …/log.pdf of it over HTTP (a draft: rendered per request)', `first ${ms(draft.t)}; next 5 p50 ${ms(again.p50)}`);
      const storedFirst = await timeGet(pdfUrl(season.finishedMeasured.id));
      row(`  GET …/log.pdf of the finished 120-day stay (stored v${storedFirst.version})`, `first ${ms(storedFirst.t)} (${count(storedFirst.bytes)} B from the file store)`);
    } finally {
      await raw.end?.();
      raw.close?.();
      await ds.destroy();
    }

    // Writes while the market is under load: posts go one at a time, 50 ms apart, only while the market load runs.
    const underLoad = async (label, send) => {
      let loading = true;
      const marketLoad = cannon({ url: `${base}/api/blocks?view=market`, headers: grazier }).finally(() => {
        loading = false;
      });
      await new Promise((r) => setTimeout(r, 1000));
      const times = [];
      for (let i = 0; loading && times.length < 400; i++) {
        const s = performance.now();
        await send(i);
        if (loading) times.push(performance.now() - s);
        await new Promise((r) => setTimeout(r, 50));
      }
      const posts = percentiles(times);
      const loaded = await marketLoad;
      budget(`${label} while the market takes ${CONNECTIONS} conn`, `p50 ${ms(posts.p50)} · p95 ${ms(posts.p95)} · p99 ${ms(posts.p99)} (n=${posts.n}; market meanwhile ${loaded.rps.toFixed(0)} req/s, p95 ${ms(loaded.p95)})`, posts.p95 < BUDGETS.writeUnderLoadP95Ms, `p95 < ${BUDGETS.writeUnderLoadP95Ms} ms`);
    };
    const post = async (url, headers, body, want) => {
      const res = await fetch(url, { method: 'POST', headers: { ...headers, 'content-type': 'application/json' }, body: JSON.stringify(body) });
      if (res.status !== want) throw new Error(`POST ${url} under load: ${res.status} ${await res.text()}`);
      await res.arrayBuffer();
    };
    const blockBody = {
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
    };
    await underLoad('block POST (grower, a new draft)', () => post(`${base}/api/blocks`, grower, blockBody, 201));
    // The grazier's morning check from the truck: a new entry (a new client id) each time, timed a minute ago.
    const run = crypto.randomUUID().slice(0, 8);
    await underLoad('log entry POST (grazier, an observation)', (i) =>
      post(`${base}/api/contracts/${measured}/log`, grazier, { clientId: `bench-${run}-${i}`, kind: 'observation', at: new Date(Date.now() - 60_000).toISOString(), paddock: 'Cell 2', waterChecked: true, fenceChecked: true, note: 'Checked under load.' }, 201),
    );

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
