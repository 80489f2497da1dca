import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

// Real server processes for the tests that need more than one: the built server (build/server, made by the same
// stale check as npm start and npm test) and the payments fake, each its own Node process on a free loopback port.

const root = path.resolve(__dirname, '../..');

/** Builds the server with tsc when its sources changed since the last build (scripts/lib.mjs buildServer). */
export function buildServerIfStale(): void {
  const r = spawnSync(process.execPath, ['-e', "import('./scripts/lib.mjs').then((m) => m.buildServer())"], { cwd: root, stdio: 'inherit' });
  if (r.status !== 0) throw new Error('the server build failed');
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

export interface RunningProcess {
  url: string;
  child: ChildProcess;
  output: () => string;
  stop: () => Promise<void>;
}

async function waitFor(url: string, child: ChildProcess, output: () => string, timeoutMs = 90_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`exited early (${child.exitCode}):\n${output()}`);
    try {
      if ((await fetch(url)).ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s:\n${output()}`);
}

async function start(entry: string, env: Record<string, string>, health: string, port: number): Promise<RunningProcess> {
  const child = spawn(process.execPath, [path.join(root, 'build', 'server', ...entry.split('/'))], {
    cwd: root,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  // The tail of what it printed (the access log writes a line per API request).
  let out = '';
  const keep = (d: Buffer) => (out = (out + d).slice(-262_144));
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  const output = () => out;
  const stop = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
    await exited;
    clearTimeout(timer);
  };
  try {
    await waitFor(`http://127.0.0.1:${port}${health}`, child, output);
  } catch (err) {
    await stop();
    throw err;
  }
  return { url: `http://127.0.0.1:${port}`, child, output, stop };
}

/** One Fieldfold server process (build/server/index.js) with `env` on `port`. */
export function startServerProcess(port: number, env: Record<string, string>): Promise<RunningProcess> {
  return start('index.js', { NODE_ENV: 'test', HOST: '127.0.0.1', SEED_DEMO: 'false', ...env, PORT: String(port) }, '/api/health', port);
}

/** The payments fake as its own process, delivering its webhooks to `webhookUrl`. */
export function startPaymentsFakeProcess(port: number, dataDir: string, webhookUrl: string): Promise<RunningProcess> {
  return start('fakes/payments/main.js', { PAYMENTS_FAKE_PORT: String(port), PAYMENTS_FAKE_HOST: '127.0.0.1', DATA_DIR: dataDir, PAYMENTS_WEBHOOK_URL: webhookUrl }, '/_fake/health', port);
}

export function builtServerExists(): boolean {
  return fs.existsSync(path.join(root, 'build', 'server', 'index.js'));
}
