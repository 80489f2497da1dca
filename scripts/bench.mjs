// npm run bench: prints Fieldfold's speed and size figures. Figures, not pass/fail: compare runs side by side
// on the same machine. Every request goes to a server this script starts on loopback, in bounded loops.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { performance } from 'node:perf_hooks';
import { buildServer, buildWeb, ensureDependencies, freePort, root, startServer } from './lib.mjs';
import { benchLoad } from './bench/load.mjs';

ensureDependencies();
buildWeb();
buildServer();

const rows = [];
const row = (what, figure) => {
  rows.push([what, figure]);
  console.log(`${what.padEnd(52)} ${figure}`);
};

// 1. Size of what a phone downloads.
const jsDir = path.join(root, 'dist/web/_expo/static/js/web');
for (const f of fs.readdirSync(jsDir).filter((f) => f.endsWith('.js'))) {
  const buf = fs.readFileSync(path.join(jsDir, f));
  row(`web bundle ${f.replace(/-[0-9a-f]+\.js$/, '.js')} raw`, `${buf.length.toLocaleString('en-US')} B`);
  row(`web bundle ${f.replace(/-[0-9a-f]+\.js$/, '.js')} gzip`, `${zlib.gzipSync(buf, { level: 9 }).length.toLocaleString('en-US')} B`);
}
const fontBytes = fs.readdirSync(path.join(root, 'assets/fonts')).filter((f) => f.endsWith('.ttf')).reduce((s, f) => s + fs.statSync(path.join(root, 'assets/fonts', f)).size, 0);
row('fonts shipped (TTF)', `${fontBytes.toLocaleString('en-US')} B`);

// 2. Server start: spawn → /api/health answers (fresh data folder: migrations + demo seed included).
const port = await freePort();
const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-'));
const t0 = performance.now();
const server = await startServer({ PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, NODE_ENV: 'production' }, { quiet: true });
row('server cold start incl. migrations + seed', `${(performance.now() - t0).toFixed(0)} ms`);

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

  // 3. First contentful paint of the sign-in page in headless chromium (cold profile each time).
  if (fs.existsSync('/usr/bin/chromium')) {
    const { chromium } = await import('playwright-core');
    const fcps = [];
    for (let i = 0; i < 5; i++) {
      const profile = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-bench-chromium-'));
      const ctx = await chromium.launchPersistentContext(profile, {
        executablePath: '/usr/bin/chromium',
        headless: true,
        args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      });
      const page = ctx.pages()[0] ?? (await ctx.newPage());
      await page.goto(`${base}/sign-in`, { waitUntil: 'load' });
      await page.getByText('Sign in').first().waitFor();
      const fcp = await page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? NaN);
      fcps.push(fcp);
      await ctx.close();
      fs.rmSync(profile, { recursive: true, force: true });
    }
    fcps.sort((a, b) => a - b);
    row('first contentful paint /sign-in (5 cold runs) median', `${fcps[2].toFixed(0)} ms (min ${fcps[0].toFixed(0)}, max ${fcps[4].toFixed(0)})`);
  } else row('first contentful paint', 'skipped: /usr/bin/chromium missing');
} finally {
  server.kill('SIGTERM');
}
// After a clean shutdown the WAL is checkpointed into the main file; count both in case it was not.
await new Promise((r) => setTimeout(r, 500));
const dbSize = ['fieldfold.sqlite', 'fieldfold.sqlite-wal'].map((f) => path.join(dataDir, f)).filter((f) => fs.existsSync(f)).reduce((s, f) => s + fs.statSync(f).size, 0);
row('demo database on disk (db + WAL)', `${dbSize.toLocaleString('en-US')} B`);

// The season at scale against budgets (scripts/bench/load.mjs): a missed budget makes the run exit non-zero.
if ((await benchLoad(row)) > 0) process.exitCode = 1;
