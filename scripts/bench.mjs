// npm run bench: prints Fieldfold's speed and size figures. Figures, not pass/fail: compare runs side by side
// on the same machine. Every request goes to servers this script starts on loopback, in bounded loops.
// The first-screen figures put Fieldfold beside a blank two-screen Expo Router app (scripts/bench/blank-app.mjs),
// exported here in single and static output, compressed by the same build step and served by the same server.
//
// npm run bench -- --engines sqlite,postgres runs the season's load figures (scripts/bench/load.mjs) on each engine
// named — PostgreSQL on a throw-away cluster started like npm test's (scripts/postgres.mjs), with its default
// settings — and prints them side by side, one column per engine. Without --engines: everything, on SQLite.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { performance } from 'node:perf_hooks';
import { buildIfStale, buildServer, buildWeb, ensureDependencies, freePort, root, run, runTs, startServer } from './lib.mjs';
import { benchLoad } from './bench/load.mjs';
import { writeBlankApp } from './bench/blank-app.mjs';
import { coldContent, coldLoad, PHONE, UNTHROTTLED } from './bench/cold-load.mjs';
import { startPostgres } from './postgres.mjs';

const enginesArg = process.argv.slice(2).find((a, i, all) => a.startsWith('--engines') && (a.includes('=') || all[i + 1]));
if (enginesArg) {
  const list = (enginesArg.includes('=') ? enginesArg.split('=')[1] : process.argv[process.argv.indexOf(enginesArg) + 1]).split(',').map((e) => e.trim());
  const unknown = list.filter((e) => e !== 'sqlite' && e !== 'postgres');
  if (unknown.length || list.length === 0) {
    console.error(`[fieldfold] --engines takes sqlite, postgres or both (got ${unknown.join(', ') || 'nothing'})`);
    process.exit(1);
  }
  ensureDependencies();
  buildServer();
  process.exitCode = await benchEngines(list);
  process.exit();
}

/** The load figures once per engine, then one table with a column per engine; resolves with the budgets missed. */
async function benchEngines(engines) {
  const columns = {};
  let missed = 0;
  let postgres;
  try {
    for (const engine of engines) {
      console.log(`\n[fieldfold] the season's load on ${engine === 'postgres' ? 'PostgreSQL' : 'SQLite'}…`);
      const figures = new Map();
      // An indented figure belongs to the one above it ("  alone, one request at a time" follows each read).
      let parent = '';
      const collect = (what, figure) => {
        if (!what.startsWith(' ')) parent = what;
        figures.set(what.startsWith(' ') ? `${parent}\n${what}` : what, figure);
        console.log(`${what.padEnd(58)} ${figure}`);
      };
      let databaseUrl = null;
      if (engine === 'postgres') {
        postgres ??= await startPostgres();
        databaseUrl = postgres.createDatabase('fieldfold_bench');
      }
      missed += await benchLoad(collect, { databaseUrl });
      columns[engine] = figures;
    }
  } finally {
    await postgres?.stop();
  }
  // One row per figure, a column per engine; the budget verdicts come after the table, per engine.
  const verdicts = new Set(['budgets', 'budgets missed']);
  const labels = [...new Set(Object.values(columns).flatMap((m) => [...m.keys()]))].filter((l) => !verdicts.has(l));
  const shown = (label) => label.split('\n').pop();
  const head = engines.map((e) => (e === 'postgres' ? 'PostgreSQL' : 'SQLite'));
  const width = Math.max(...labels.map((l) => shown(l).length), 10);
  const colWidth = Math.min(80, Math.max(...labels.flatMap((l) => engines.map((e) => (columns[e].get(l) ?? '—').length)), 12));
  console.log(`\n${'figure'.padEnd(width)} | ${head.map((h) => h.padEnd(colWidth)).join(' | ')}`);
  console.log(`${'-'.repeat(width)}-|-${head.map(() => '-'.repeat(colWidth)).join('-|-')}`);
  for (const label of labels) console.log(`${shown(label).padEnd(width)} | ${engines.map((e) => (columns[e].get(label) ?? '—').padEnd(colWidth)).join(' | ')}`);
  for (const [e, h] of engines.map((e, i) => [e, head[i]])) {
    const m = columns[e];
    console.log(`${h}: ${m.has('budgets missed') ? `budgets missed: ${m.get('budgets missed')}` : m.get('budgets') ?? ''}`);
  }
  return missed ? 1 : 0;
}

// Cold runs per app and profile, taken round-robin; the median is reported.
const RUNS = Number(process.env.BENCH_RUNS ?? 7);
// Acceptance of issue 7, on the phone profile: paint within 1.5× of the blank static export, usable within 1.2× of
// the blank single-output export.
const BUDGET = { paint: 1.5, usable: 1.2 };

ensureDependencies();
buildWeb();
buildServer();

const rows = [];
const row = (what, figure) => {
  rows.push([what, figure]);
  console.log(`${what.padEnd(58)} ${figure}`);
};
const B = (n) => `${Math.round(n).toLocaleString('en-US')} B`;
const kB = (n) => `${(n / 1000).toFixed(1)} kB`;
const ms = (n) => `${Math.round(n).toLocaleString('en-US')} ms`;
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

// The blank app, exported once per output mode and kept in dist/bench until the dependencies or this script change.
function buildBlank(output) {
  const out = path.join('dist/bench', `blank-${output}`);
  buildIfStale(`the blank Expo Router app (${output} output)`, ['package-lock.json', 'scripts/bench/blank-app.mjs'], path.join(out, '.built'), () => {
    const dir = writeBlankApp(root, output);
    run('npx', ['expo', 'export', '--platform', 'web', '--output-dir', path.join(root, out)], { cwd: dir, env: { ...process.env, CI: '1' } });
    runTs('scripts/web/precompress.ts', [out]);
    fs.rmSync(dir, { recursive: true, force: true });
  });
  return path.join(root, out);
}
const blankSingle = buildBlank('single');
const blankStatic = buildBlank('static');

// 1. Size of what a phone downloads.
const webDir = path.join(root, 'dist/web');
const jsDir = path.join(webDir, '_expo/static/js/web');
const jsFiles = fs.readdirSync(jsDir).filter((f) => f.endsWith('.js'));
const sizes = (files) =>
  files.reduce(
    (s, f) => {
      const buf = fs.readFileSync(f);
      return { raw: s.raw + buf.length, gzip: s.gzip + zlib.gzipSync(buf, { level: 9 }).length, br: s.br + (fs.existsSync(`${f}.br`) ? fs.statSync(`${f}.br`).size : buf.length) };
    },
    { raw: 0, gzip: 0, br: 0 },
  );
const all = sizes(jsFiles.map((f) => path.join(jsDir, f)));
row(`web bundle, all ${jsFiles.length} chunks raw / gzip / brotli`, `${B(all.raw)} / ${B(all.gzip)} / ${B(all.br)}`);
for (const f of jsFiles.filter((f) => /^(entry|__common)-/.test(f))) {
  const s = sizes([path.join(jsDir, f)]);
  row(`web bundle ${f.replace(/-[0-9a-f]+\.js$/, '.js')} raw / gzip / brotli`, `${B(s.raw)} / ${B(s.gzip)} / ${B(s.br)}`);
}
const signInScripts = [...fs.readFileSync(path.join(webDir, 'sign-in.html'), 'utf8').matchAll(/<script src="([^"]+)"/g)].map((m) => path.join(webDir, m[1]));
const first = sizes(signInScripts);
row(`/sign-in's ${signInScripts.length} scripts raw / brotli`, `${B(first.raw)} / ${B(first.br)}`);
const blankJs = path.join(blankSingle, '_expo/static/js/web');
const blank = sizes(fs.readdirSync(blankJs).filter((f) => f.endsWith('.js')).map((f) => path.join(blankJs, f)));
row('blank export (single) bundle raw / brotli', `${B(blank.raw)} / ${B(blank.br)}`);
const fontSize = (dir, ext) => fs.readdirSync(path.join(root, dir)).filter((f) => f.endsWith(ext)).reduce((s, f) => s + fs.statSync(path.join(root, dir, f)).size, 0);
row('web fonts, 5 faces × core + accented-Latin WOFF2', `${B(fontSize('assets/fonts/web', '.woff2'))} (core only: ${B(fontSize('assets/fonts/web', '.core.woff2'))})`);
row('fonts kept for the PDF renderer (TTF)', B(fontSize('assets/fonts', '.ttf')));

// 2. Server start: spawn → /api/health answers (fresh data folder: migrations + demo seed included).
const port = await freePort();
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-'));
const t0 = performance.now();
const server = await startServer({ PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, NODE_ENV: 'production' }, { quiet: true });
row('server cold start incl. migrations + seed', ms(performance.now() - t0));
const yardsticks = [];

const base = `http://127.0.0.1:${port}`;
async function latency(label, n, fn) {
  const times = [];
  for (let i = 0; i < n; i++) {
    const s = performance.now();
    await fn(i);
    times.push(performance.now() - s);
  }
  times.sort((a, b) => a - b);
  const pct = (p) => times[Math.min(times.length - 1, Math.floor((p / 100) * times.length))].toFixed(2);
  row(`${label} (n=${n}) p50 / p95`, `${pct(50)} / ${pct(95)} ms`);
}

try {
  const post = (p, body, headers = {}) => fetch(base + p, { method: 'POST', headers: { 'Content-Type': 'application/json', ...headers }, body: JSON.stringify(body) });
  await latency('POST /api/calc/capacity', 300, async () => {
    const r = await post('/api/calc/capacity', { acres: 80, lbDmPerAcre: 2000, utilizationPct: 45, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } });
    await r.json();
  });
  const moves = Array.from({ length: 120 }, (_, i) => ({ at: new Date(Date.UTC(2027, 0, 1) + i * 6 * 3600_000).toISOString(), change: i % 2 === 0 ? 50 : -20 }));
  await latency('POST /api/calc/head-days (120 moves, LA zone)', 200, async () => {
    const r = await post('/api/calc/head-days', { moves, until: '2027-02-15T00:00:00Z', timeZone: 'America/Los_Angeles' });
    await r.json();
  });
  await latency('POST /api/auth/login (bcrypt cost 10)', 20, async () => {
    const r = await post('/api/auth/login', { email: 'wade@calder.example', password: 'calder-valley-demo' });
    await r.json();
  });

  // 3. The first screen, /sign-in, cold, in headless chromium: Fieldfold and the blank exports side by side,
  //    each served by the same server code (build/server) with the same compression and caching.
  if (fs.existsSync('/usr/bin/chromium')) {
    const { chromium } = await import('playwright-core');
    const apps = [{ key: 'fieldfold', label: 'Fieldfold', base }];
    for (const [key, label, dir] of [
      ['single', 'blank export, single output', blankSingle],
      ['static', 'blank export, static output', blankStatic],
    ]) {
      const p = await freePort();
      const d = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-blank-data-'));
      yardsticks.push(await startServer({ PORT: String(p), HOST: '127.0.0.1', DATA_DIR: d, WEB_DIR: dir, SEED_DEMO: 'false', NODE_ENV: 'production' }, { quiet: true }));
      apps.push({ key, label, base: `http://127.0.0.1:${p}` });
    }
    const results = {};
    for (const profile of [UNTHROTTLED, PHONE]) {
      for (const app of apps) results[`${profile.name}:${app.key}`] = [];
      // Round-robin, so a slow moment on the shared machine falls on every app alike.
      for (let i = 0; i < RUNS; i++) {
        for (const app of apps) results[`${profile.name}:${app.key}`].push(await coldLoad(chromium, `${app.base}/sign-in`, profile));
      }
      console.log(`\n/sign-in, ${profile.label}, medians of ${RUNS} cold runs: bytes until usable · first contentful paint · usable`);
      for (const app of apps) {
        const r = results[`${profile.name}:${app.key}`];
        const m = { bytes: median(r.map((x) => x.bytes)), fcp: median(r.map((x) => x.fcp)), usable: median(r.map((x) => x.usable)) };
        results[`${profile.name}:${app.key}:median`] = m;
        const spread = `usable ${ms(Math.min(...r.map((x) => x.usable)))}–${ms(Math.max(...r.map((x) => x.usable)))}`;
        row(`  ${profile.name} · ${app.label}`, `${kB(m.bytes)} · ${ms(m.fcp)} · ${ms(m.usable)}  (${spread})`);
      }
    }
    const phone = (k) => results[`phone:${k}:median`];
    const paintRatio = phone('fieldfold').fcp / phone('static').fcp;
    const usableRatio = phone('fieldfold').usable / phone('single').usable;
    console.log('');
    const verdict = (r, budget) => `${r.toFixed(2)}× (budget ≤ ${budget}×: ${r <= budget ? 'within' : 'OVER'})`;
    row('phone: Fieldfold paint ÷ blank static paint', verdict(paintRatio, BUDGET.paint));
    row('phone: Fieldfold usable ÷ blank single usable', verdict(usableRatio, BUDGET.usable));

    // The grazing log from the truck, cold: the grazier signed in earlier (the token and account where the app
    // keeps them, hooks/auth/token-storage.web.ts), nothing else cached, the demo's stay grazing now. First content
    // = the first log row, or the "no entries yet" text.
    const signIn = await (await post('/api/auth/login', { email: 'wade@calder.example', password: 'calder-valley-demo' })).json();
    const mine = await (await fetch(`${base}/api/contracts`, { headers: { Authorization: `Bearer ${signIn.token}` } })).json();
    const grazing = mine.items.find((c) => c.status === 'grazing');
    if (!grazing) throw new Error('bench: the demo has no contract grazing now');
    const storage = { 'fieldfold.token': signIn.token, 'fieldfold.account': JSON.stringify(signIn.user) };
    const logRuns = [];
    for (let i = 0; i < RUNS; i++) {
      logRuns.push(await coldContent(chromium, `${base}/contracts/${grazing.id}/log`, PHONE, { storage, selector: '[data-testid^="log-entry-"], [data-testid="log-empty"]' }));
    }
    const firstContent = logRuns.map((x) => x.content);
    row(
      `phone: the log screen cold, time to first content (median of ${RUNS})`,
      `${ms(median(firstContent))} (${ms(Math.min(...firstContent))}–${ms(Math.max(...firstContent))}; ${kB(median(logRuns.map((x) => x.bytes)))} received)`,
    );
  } else row('first screen figures', 'skipped: /usr/bin/chromium missing');
} finally {
  server.kill('SIGTERM');
  for (const s of yardsticks) s.kill('SIGTERM');
}
// After a clean shutdown the WAL is checkpointed into the main file; count both in case it was not.
await new Promise((r) => setTimeout(r, 500));
const dbSize = ['fieldfold.sqlite', 'fieldfold.sqlite-wal'].map((f) => path.join(dataDir, f)).filter((f) => fs.existsSync(f)).reduce((s, f) => s + fs.statSync(f).size, 0);
row('demo database on disk (db + WAL)', B(dbSize));

// The season at scale against budgets (scripts/bench/load.mjs): a missed budget makes the run exit non-zero.
if ((await benchLoad(row)) > 0) process.exitCode = 1;
