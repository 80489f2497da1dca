import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';

// The real server (server/index.ts: config → migrations → listen → graceful shutdown) as a child process,
// for the tests that kill it, restart it, back it up under load, or run several on one database. It runs
// through tsx's loader in ONE node process (`node --import tsx`), so a SIGKILL hits the server itself, not a
// wrapper that would leave it running.

export const ROOT = path.resolve(__dirname, '..', '..');

/** A token secret shared by every server a test starts on one database (a token from one must pass on another). */
export const PROCESS_TOKEN_SECRET = 'server-process-tests-token-secret-long-enough';

export interface ServerProcess {
  url: string;
  port: number;
  pid: number;
  /** The last 256 kB it printed (stdout and stderr). */
  output(): string;
  /** Sends SIGKILL and resolves once the process is gone. */
  kill(): Promise<void>;
  /** SIGTERM (its graceful shutdown) and resolves once it exited; SIGKILL after `graceMs`. */
  stop(graceMs?: number): Promise<number | null>;
  exited(): boolean;
}

const started = new Set<ServerProcess>();

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

// Variables a developer's shell may hold that would send a test server to real services.
const INHERITED_OUT = ['DATABASE_URL', 'SMTP_PORT', 'SMTP_HOST', 'MAIL_UI_PORT', 'PAYMENTS_SECRET_KEY', 'PAYMENTS_API_URL', 'PAYMENTS_WEBHOOK_SECRET', 'PAYMENTS_WEBHOOK_URL', 'CORS_ORIGIN', 'PUBLIC_URL', 'PORT', 'DATA_DIR'];

function exitOf(child: ChildProcess): Promise<number | null> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(child.exitCode);
  return new Promise((resolve) => child.once('exit', (code) => resolve(code)));
}

/** Starts server/index.ts on `dataDir` and resolves once /api/health answers. */
export async function startServerProcess(opts: { dataDir: string; env?: Record<string, string>; port?: number; timeoutMs?: number }): Promise<ServerProcess> {
  const port = opts.port ?? (await freePort());
  const env: NodeJS.ProcessEnv = { ...process.env };
  for (const k of INHERITED_OUT) delete env[k];
  Object.assign(env, {
    TSX_TSCONFIG_PATH: path.join(ROOT, 'server', 'tsconfig.json'),
    PORT: String(port),
    HOST: '127.0.0.1',
    DATA_DIR: opts.dataDir,
    SEED_DEMO: 'false',
    NODE_ENV: 'test',
    TOKEN_SECRET: PROCESS_TOKEN_SECRET,
    // Thousands of requests from 127.0.0.1 in seconds: limits no test reaches (the limits' own tests use createApp).
    RATE_LIMIT_MULTIPLIER: '100000',
    // Nothing listens here unless a test starts the payments fake and says where it is.
    PAYMENTS_API_URL: 'http://127.0.0.1:9',
    ...opts.env,
  });
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server', 'index.ts')], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
  // The tail of what it printed (the access log writes a line per API request).
  let output = '';
  const keep = (d: Buffer) => (output = (output + d).slice(-262_144));
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  const url = `http://127.0.0.1:${port}`;
  const proc: ServerProcess = {
    url,
    port,
    pid: child.pid!,
    output: () => output,
    exited: () => child.exitCode !== null || child.signalCode !== null,
    kill: async () => {
      const gone = exitOf(child);
      child.kill('SIGKILL');
      await gone;
      started.delete(proc);
    },
    stop: async (graceMs = 10_000) => {
      const gone = exitOf(child);
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), graceMs);
      const code = await gone;
      clearTimeout(timer);
      started.delete(proc);
      return code;
    },
  };
  started.add(proc);
  const deadline = Date.now() + (opts.timeoutMs ?? 60_000);
  while (Date.now() < deadline) {
    if (proc.exited()) {
      started.delete(proc);
      throw new Error(`the server exited before answering (${child.exitCode ?? child.signalCode}):\n${output}`);
    }
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) return proc;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await proc.kill();
  throw new Error(`the server did not answer ${url}/api/health in time:\n${output}`);
}

/** For afterAll: kills whatever a test left running (a failed assertion between start and stop). */
export async function killStartedServers(): Promise<void> {
  await Promise.all([...started].map((p) => p.kill()));
}
