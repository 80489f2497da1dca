// A throw-away PostgreSQL cluster for npm test and npm run bench: Debian's postgresql (installed with apt-get when
// missing, as ensureChromium does), initdb into a temp folder, pg_ctl on a free loopback port with its socket in
// that folder, trust authentication for the cluster's one superuser. As root, initdb and the server run as the
// `postgres` OS user (PostgreSQL refuses to run as root) and the folder is handed to that user.
// stop() stops the server and deletes the folder; a parent that exits for any reason stops it too.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from './lib.mjs';

const SUPERUSER = 'postgres';

/** The newest installed /usr/lib/postgresql/N/bin, or null. */
export function postgresBin() {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

/** Installs Debian's postgresql when no initdb is found (as root; otherwise says what to run). */
export function ensurePostgres() {
  if (postgresBin()) return postgresBin();
  if (process.getuid?.() !== 0) throw new Error('PostgreSQL is missing (no /usr/lib/postgresql/*/bin/initdb): run  sudo apt-get install -y postgresql');
  console.log('[fieldfold] installing Debian postgresql…');
  for (const args of [['update', '-qq'], ['install', '-y', '-qq', '--no-install-recommends', 'postgresql']]) {
    const r = spawnSync('apt-get', args, { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
    if (r.status !== 0) throw new Error(`apt-get ${args.join(' ')} failed`);
  }
  const bin = postgresBin();
  if (!bin) throw new Error('apt-get installed postgresql but no /usr/lib/postgresql/*/bin/initdb was found');
  return bin;
}

/** Runs a PostgreSQL program, as the postgres OS user when we are root. */
function pgRun(bin, program, args, { asUser, quiet = true } = {}) {
  const cmd = path.join(bin, program);
  const [file, argv] = asUser ? ['runuser', ['-u', asUser, '--', cmd, ...args]] : [cmd, args];
  const r = spawnSync(file, argv, { encoding: 'utf8', stdio: quiet ? 'pipe' : 'inherit', cwd: os.tmpdir() });
  if (r.status !== 0) throw new Error(`${program} ${args.join(' ')} failed (${r.status ?? r.signal}):\n${r.stdout ?? ''}${r.stderr ?? ''}`);
  return r.stdout ?? '';
}

/**
 * Starts a cluster and resolves with its URLs. `settings` are extra `-c name=value` server settings.
 * `durable: false` (tests) turns fsync off: a throw-away cluster need not survive a power cut, and CREATE DATABASE
 * per test file is then quick; the bench keeps PostgreSQL's defaults so its figures mean something.
 * @param {{ durable?: boolean, settings?: Record<string, string> }} [options]
 */
export async function startPostgres({ durable = true, settings = {} } = {}) {
  const bin = ensurePostgres();
  const asUser = process.getuid?.() === 0 ? SUPERUSER : undefined;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-pg-'));
  const dataDir = path.join(dir, 'data');
  const socketDir = path.join(dir, 'socket');
  fs.mkdirSync(socketDir);
  if (asUser) {
    const uid = Number(spawnSync('id', ['-u', asUser], { encoding: 'utf8' }).stdout.trim());
    const gid = Number(spawnSync('id', ['-g', asUser], { encoding: 'utf8' }).stdout.trim());
    fs.chownSync(dir, uid, gid);
    fs.chownSync(socketDir, uid, gid);
  }
  pgRun(bin, 'initdb', ['-D', dataDir, '-U', SUPERUSER, '--auth=trust', '--encoding=UTF8', '--locale=C.UTF-8', '--no-sync'], { asUser });
  const port = await freePort();
  const all = {
    listen_addresses: '127.0.0.1',
    max_connections: '200',
    ...(durable ? {} : { fsync: 'off', synchronous_commit: 'off', full_page_writes: 'off' }),
    ...settings,
  };
  const options = [`-p ${port}`, `-k ${socketDir}`, ...Object.entries(all).map(([k, v]) => `-c ${k}=${v}`)].join(' ');
  const log = path.join(dir, 'server.log');
  let running = false;
  const stop = () => {
    process.off('exit', stopSync);
    if (running) {
      running = false;
      try {
        pgRun(bin, 'pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', 'stop'], { asUser });
      } catch (err) {
        console.error(`[fieldfold] could not stop the PostgreSQL cluster in ${dir}: ${err.message}`);
      }
    }
    fs.rmSync(dir, { recursive: true, force: true });
  };
  const stopSync = () => stop();
  process.on('exit', stopSync);
  try {
    pgRun(bin, 'pg_ctl', ['-D', dataDir, '-l', log, '-o', options, '-w', '-t', '60', 'start'], { asUser });
    running = true;
  } catch (err) {
    const tail = fs.existsSync(log) ? fs.readFileSync(log, 'utf8').slice(-2000) : '';
    stop();
    throw new Error(`${err.message}\n${tail}`);
  }
  const url = (database = 'postgres') => `postgres://${SUPERUSER}@127.0.0.1:${port}/${database}`;
  return {
    port,
    bin,
    /** postgres://… for a database of the cluster (default: the maintenance database `postgres`). */
    url,
    /** Creates a database (or drops and creates it) and resolves with its URL. */
    createDatabase(name) {
      psql(bin, url(), `DROP DATABASE IF EXISTS "${name}"`);
      psql(bin, url(), `CREATE DATABASE "${name}"`);
      return url(name);
    },
    /** Runs SQL through psql against `database`; resolves with its unaligned output. */
    sql: (sql, database = 'postgres') => psql(bin, url(database), sql),
    stop: async () => stop(),
  };
}

function psql(bin, url, sql) {
  const r = spawnSync(path.join(bin, 'psql'), ['-X', '-q', '-A', '-t', '-v', 'ON_ERROR_STOP=1', '-d', url, '-c', sql], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`psql: ${sql}\n${r.stderr}`);
  return r.stdout.trim();
}
