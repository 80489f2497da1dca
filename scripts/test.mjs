// npm test: the one command that runs every suite on a fresh Debian machine.
// 1. installs dependencies (npm ci) and Debian's chromium when missing;
// 2. jest: the app project (jest-expo) and the server project (supertest on createApp, lib checks), on SQLite;
//    then the server suite again on PostgreSQL: Debian's postgresql (installed when missing), a throw-away cluster
//    on a free port (scripts/postgres.mjs), TEST_DATABASE_URL pointing at it (each test app gets its own database),
//    the authorisation matrix, hostile input, the races (two apps, and two real server processes, on one
//    database), two-processes.test.ts, restart and backup/restore among them; the suites that open no database
//    are left to the SQLite pass (scripts/jest-postgres.mjs); the cluster stops at the end;
// 3. builds the web app and server, starts the local services (mail sink) and the real server on free
//    ports with a throw-away DATA_DIR, and runs the browser suite (playwright-core driving /usr/bin/chromium);
// 4. prints one closing line totalling every suite: "N passed, N failed", after a line per suite.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { buildServer, buildWeb, ensureDependencies, freePort, root, startServer } from './lib.mjs';
import { startLocalServices } from './local-services.mjs';
import { POSTGRES_PASS } from './jest-postgres.mjs';
import { startPostgres } from './postgres.mjs';

const CHROMIUM = '/usr/bin/chromium';
const artifacts = path.join(root, 'artifacts');
fs.mkdirSync(artifacts, { recursive: true });

function ensureChromium() {
  if (fs.existsSync(CHROMIUM) && fs.existsSync('/usr/bin/pdftotext')) return;
  if (process.getuid?.() !== 0) {
    throw new Error(`${CHROMIUM} or pdftotext is missing: run  sudo apt-get install -y chromium poppler-utils`);
  }
  console.log('[fieldfold] installing Debian chromium and poppler-utils…');
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', 'chromium', 'poppler-utils']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed`);
  }
}

function jest(args, jsonName, env = {}) {
  const out = path.join(artifacts, jsonName);
  fs.rmSync(out, { force: true });
  const r = spawnSync('npx', ['jest', ...args, '--json', `--outputFile=${out}`], { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
  let passed = 0;
  let failed = 0;
  if (fs.existsSync(out)) {
    const j = JSON.parse(fs.readFileSync(out, 'utf8'));
    passed = j.numPassedTests;
    failed = j.numFailedTests + (j.numRuntimeErrorTestSuites ?? 0);
  } else failed = 1;
  if (r.status !== 0 && failed === 0) failed = 1; // jest itself failed (config, crash)
  return { passed, failed };
}

const totals = { passed: 0, failed: 0 };
const add = (name, r) => {
  totals.passed += r.passed;
  totals.failed += r.failed;
  console.log(`[fieldfold] ${name}: ${r.passed} passed, ${r.failed} failed`);
};

let server;
let services;
let postgres;
try {
  ensureDependencies();
  ensureChromium();
  add('jest (app + server + lib)', jest(['--ci'], 'jest-unit.json'));

  try {
    postgres = await startPostgres({ durable: false });
    // The server suite but the suites that open no database (scripts/jest-postgres.mjs says which).
    add('server suite on PostgreSQL', jest(POSTGRES_PASS, 'jest-postgres.json', { TEST_DATABASE_URL: postgres.url() }));
  } catch (err) {
    console.error(`[fieldfold] the PostgreSQL pass could not run: ${err.message}`);
    add('server suite on PostgreSQL', { passed: 0, failed: 1 });
  } finally {
    await postgres?.stop();
    postgres = undefined;
  }

  buildWeb();
  buildServer();
  const port = await freePort();
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-e2e-'));
  services = await startLocalServices({ dataDir, appPort: port, quiet: true });
  server = await startServer({ PORT: String(port), HOST: '127.0.0.1', DATA_DIR: dataDir, NODE_ENV: 'test', ...services.env }, { quiet: true });
  // E2E_DATA_DIR: the browser suite may put a contract into a state whose own flow is not its subject (invoices).
  const e2eEnv = { E2E_BASE_URL: `http://127.0.0.1:${port}`, E2E_MAIL_UI_URL: services.mailSink.url, E2E_PAYMENTS_URL: services.payments?.url ?? '', E2E_DATA_DIR: dataDir };
  add('browser suite (chromium)', jest(['--config', 'jest.e2e.config.js', '--runInBand', '--ci'], 'jest-e2e.json', e2eEnv));
} catch (err) {
  console.error(`[fieldfold] test run stopped: ${err.message}`);
  totals.failed += 1;
} finally {
  server?.kill('SIGTERM');
  await services?.stop();
  await postgres?.stop();
}

console.log(`${totals.passed} passed, ${totals.failed} failed`);
process.exit(totals.failed ? 1 : 0);
