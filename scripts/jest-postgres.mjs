// The server suite on PostgreSQL: what npm test's PostgreSQL pass runs (POSTGRES_PASS below), and, run as a script,
// the same on a throw-away cluster (scripts/postgres.mjs) for one file or a few while working on them:
//   node scripts/jest-postgres.mjs                                  the whole pass, as npm test runs it
//   node scripts/jest-postgres.mjs __tests__/server/races.test.ts   one file (any jest arguments)
// The cluster is stopped however jest ends.
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { root } from './lib.mjs';
import { startPostgres } from './postgres.mjs';

// Suites that open no database at all (configuration, mail composition, the payments fake, the PDF renderer, the
// read lane, the route table): the SQLite pass has run them already, and they would run the same here.
export const ENGINE_FREE_SUITES = [
  'database-config',
  'mail-compose',
  'mail-config',
  'payments-config',
  'payments-fake',
  'pdf',
  'read-lane',
  'web-routes',
];

/** jest's arguments for the pass: every other file of __tests__/server, two workers. */
export const POSTGRES_PASS = [
  '--ci',
  // Two workers: the tests wait on the database server much of the time, so a second one keeps both cores busy.
  '--maxWorkers=2',
  '--selectProjects',
  'server',
  '--testPathPattern',
  '__tests__/server/',
  '--testPathIgnorePatterns',
  `__tests__/server/(${ENGINE_FREE_SUITES.join('|')})\\.test\\.ts$`,
];

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  // With files named, only they run (engine-free or not); --selectProjects takes every value after it, so it goes last.
  const jestArgs = args.length ? [...args, '--ci', '--maxWorkers=2', '--selectProjects', 'server'] : POSTGRES_PASS;
  // Stopped by a signal (Ctrl-C, a CI timeout): exit, and postgres.mjs's exit hook stops the cluster. While jest runs
  // (spawnSync) the handler waits until jest has ended; the default would leave the cluster running.
  for (const [signal, code] of [['SIGINT', 130], ['SIGTERM', 143]]) process.on(signal, () => process.exit(code));
  const postgres = await startPostgres({ durable: false });
  let status = 1;
  try {
    const r = spawnSync('npx', ['jest', ...jestArgs], { cwd: root, stdio: 'inherit', env: { ...process.env, TEST_DATABASE_URL: postgres.url() } });
    status = r.status ?? 1;
  } finally {
    await postgres.stop();
  }
  process.exit(status);
}
