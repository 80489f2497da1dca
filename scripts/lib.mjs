// Helpers shared by the operator scripts (start, dev, test, bench). Plain Node, no dependencies,
// so `npm start` and `npm test` can run before `node_modules` exists and install it.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', ...opts });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status ?? r.signal}`);
}

/** npm ci when node_modules is missing or older than the lock file. */
export function ensureDependencies() {
  const marker = path.join(root, 'node_modules', '.package-lock.json');
  const lock = path.join(root, 'package-lock.json');
  if (fs.existsSync(marker) && fs.statSync(marker).mtimeMs >= fs.statSync(lock).mtimeMs) return;
  console.log('[fieldfold] installing dependencies (npm ci)…');
  run('npm', ['ci', '--no-audit', '--no-fund']);
}

function newestMtime(entries) {
  let newest = 0;
  const walk = (p) => {
    if (!fs.existsSync(p)) return;
    const st = fs.statSync(p);
    if (st.isDirectory()) {
      for (const name of fs.readdirSync(p)) if (name !== 'node_modules' && !name.startsWith('.')) walk(path.join(p, name));
    } else newest = Math.max(newest, st.mtimeMs);
  };
  for (const e of entries) walk(path.join(root, e));
  return newest;
}

/** Rebuilds `output` (a stamp file) with `build` when any of `sources` changed since the last build. */
export function buildIfStale(label, sources, stamp, build) {
  const stampPath = path.join(root, stamp);
  const built = fs.existsSync(stampPath) ? fs.statSync(stampPath).mtimeMs : 0;
  if (built >= newestMtime(sources)) return false;
  console.log(`[fieldfold] building ${label}…`);
  build();
  fs.mkdirSync(path.dirname(stampPath), { recursive: true });
  fs.writeFileSync(stampPath, new Date().toISOString());
  return true;
}

// The web build also reads the route table the server shares with the service worker, and its own scripts.
const WEB_SOURCES = ['app', 'components', 'hooks', 'lib', 'assets', 'public', 'app.json', 'babel.config.js', 'metro.config.js', 'package.json', 'package-lock.json', 'scripts/build-web.ts', 'scripts/web', 'server/lib/http/web-routes.ts'];
const SERVER_SOURCES = ['server', 'lib', 'package-lock.json'];

/** Runs a TypeScript operator script with the server's tsconfig (decorators, commonjs). */
export function runTs(script, args = [], opts = {}) {
  run('npx', ['tsx', '--tsconfig', 'server/tsconfig.json', script, ...args], opts);
}

export function buildWeb() {
  buildIfStale('the web app (fonts, expo export, manifest, service worker, precompression)', WEB_SOURCES, 'dist/web/.built', () => runTs('scripts/build-web.ts'));
}

export function buildServer() {
  buildIfStale('the server (tsc)', SERVER_SOURCES, 'build/.built', () => run('npx', ['tsc', '-p', 'server/tsconfig.build.json']));
}

export const serverEntry = path.join(root, 'build', 'server', 'index.js');

export function freePort() {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
  });
}

/** Starts the built server with `env` and resolves once /api/health answers. */
export async function startServer(env, { quiet = false, timeoutMs = 90_000 } = {}) {
  const child = spawn(process.execPath, ['--enable-source-maps', serverEntry], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: quiet ? ['ignore', 'pipe', 'pipe'] : 'inherit',
  });
  // The tail of what it printed, for the error below (the access log writes a line per API request).
  let output = '';
  const keep = (d) => (output = (output + d).slice(-65_536));
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  const url = `http://127.0.0.1:${env.PORT}/api/health`;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited early (${child.exitCode}):\n${output}`);
    try {
      const res = await fetch(url);
      if (res.ok) return child;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  child.kill('SIGTERM');
  throw new Error(`server did not answer ${url} within ${timeoutMs / 1000} s:\n${output}`);
}

/** SERVER_PROCESSES as a number from 1 to 64; a clear sentence naming the variable otherwise. */
export function serverProcesses(env = process.env) {
  const raw = env.SERVER_PROCESSES ?? '';
  if (raw === '') return 1;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new Error(`SERVER_PROCESSES must be a whole number from 1 to 64 (got ${JSON.stringify(raw)})`);
  return n;
}

/**
 * Starts `count` server processes on PORT, PORT+1, … with the same `env` otherwise (one database, one DATA_DIR, the
 * same local services), and resolves once each answers /api/health. The first starts alone and migrates and seeds;
 * the others start once it answers, so they find the schema made (on PostgreSQL the advisory lock would also keep
 * them apart, on SQLite this order is what does).
 */
export async function startServers(count, env, options = {}) {
  const base = Number(env.PORT);
  const children = [await startServer({ ...env, PORT: String(base) }, options)];
  try {
    const rest = await Promise.allSettled(Array.from({ length: count - 1 }, (_, i) => startServer({ ...env, PORT: String(base + 1 + i) }, options)));
    for (const r of rest) if (r.status === 'fulfilled') children.push(r.value);
    const failed = rest.find((r) => r.status === 'rejected');
    if (failed) throw failed.reason;
  } catch (err) {
    await stopServers(children);
    throw err;
  }
  return children;
}

/** SIGTERM to each server process, SIGKILL after 5 s; resolves when all have exited. */
export async function stopServers(children) {
  await Promise.all(
    children.map(
      (child) =>
        new Promise((resolve) => {
          if (child.exitCode !== null || child.signalCode !== null) return resolve();
          const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
          child.once('exit', () => {
            clearTimeout(timer);
            resolve();
          });
          child.kill('SIGTERM');
        }),
    ),
  );
}
