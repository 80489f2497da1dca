// Backup and restore of a PostgreSQL database (DATABASE_URL) with PostgreSQL's own tools: pg_dump in its custom
// format (-Fc: compressed, every table, index, function and the migrations table, restorable table by table) and
// pg_restore --clean --if-exists (drops what the dump holds, then makes it again from the dump). `npm run backup`
// and `npm run restore` (scripts/backups/) call these when DATABASE_URL is set, with the uploads, the documents
// and a manifest beside the dump; this file on its own moves the database only.
//
//   node scripts/backup-postgres.mjs dump    postgres://…/fieldfold  backups/fieldfold.dump
//   node scripts/backup-postgres.mjs restore postgres://…/fieldfold  backups/fieldfold.dump
//
// pg_dump must be at least the server's major version: the newest /usr/lib/postgresql/N/bin is used when there is
// one (Debian's postgresql-client), otherwise the pg_dump on PATH. The password, if any, travels in the URL
// (libpq reads it from there) or in PGPASSWORD / ~/.pgpass as usual; it is never printed.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { postgresBin } from './postgres.mjs';

function tool(name) {
  const bin = postgresBin();
  return bin && fs.existsSync(path.join(bin, name)) ? path.join(bin, name) : name;
}

/** The URL without its password, for messages. */
function shown(url) {
  const u = new URL(url);
  if (u.password) u.password = '***';
  return u.toString();
}

function runTool(name, args, url) {
  const r = spawnSync(tool(name), args, { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  if (r.error) throw new Error(`${name} could not run (${r.error.message}): install postgresql-client`);
  if (r.status !== 0) throw new Error(`${name} of ${shown(url)} failed (${r.status}):\n${r.stderr.trim()}`);
  return r;
}

/**
 * Dumps the database at `url` into `file` (custom format), written beside it first and renamed when complete, so a
 * failed dump never leaves a half file under the backup's name. Returns the file's size in bytes.
 * `snapshot`: a snapshot another session exported (pg_export_snapshot()) and holds open, for a dump that sees
 * exactly what that session sees (npm run backup counts the rows in it).
 * @param {string} url @param {string} file @param {{ snapshot?: string }} [options]
 */
export function dumpPostgres(url, file, { snapshot } = {}) {
  fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  const partial = `${file}.partial`;
  try {
    runTool('pg_dump', ['--format=custom', '--no-owner', '--no-privileges', ...(snapshot ? [`--snapshot=${snapshot}`] : []), `--file=${partial}`, `--dbname=${url}`], url);
    fs.renameSync(partial, file);
  } finally {
    fs.rmSync(partial, { force: true });
  }
  return fs.statSync(file).size;
}

/**
 * Reads the whole dump as pg_restore would restore it (every entry, every table's data decompressed, the SQL
 * written to nowhere) and throws when it is no whole custom-format dump: the check npm run backup makes of its copy
 * and npm run restore makes before it touches anything.
 */
export function checkDump(file) {
  if (!fs.existsSync(file)) throw new Error(`no dump at ${file}`);
  const r = spawnSync(tool('pg_restore'), ['--file=/dev/null', file], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
  if (r.error) throw new Error(`pg_restore could not run (${r.error.message}): install postgresql-client`);
  if (r.status !== 0) throw new Error(`${file} is not a whole pg_dump archive: ${r.stderr.trim()}`);
}

/**
 * Restores `file` (a dumpPostgres dump) into the database at `url`: what the dump holds is dropped and made again,
 * in one transaction, so a restore that fails midway leaves the database as it was. Stop the server processes first.
 */
export function restorePostgres(url, file) {
  if (!fs.existsSync(file)) throw new Error(`no dump at ${file}`);
  runTool('pg_restore', ['--clean', '--if-exists', '--no-owner', '--no-privileges', '--single-transaction', '--exit-on-error', `--dbname=${url}`, file], url);
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [command, url, file] = process.argv.slice(2);
  try {
    if (!url || !/^postgres(ql)?:\/\//.test(url) || !file) throw new Error('usage: node scripts/backup-postgres.mjs dump|restore postgres://… FILE');
    if (command === 'dump') console.log(`[fieldfold] ${shown(url)} dumped to ${file} (${dumpPostgres(url, file)} bytes)`);
    else if (command === 'restore') {
      restorePostgres(url, file);
      console.log(`[fieldfold] ${file} restored into ${shown(url)}`);
    } else throw new Error(`unknown command ${JSON.stringify(command)}: dump or restore`);
  } catch (err) {
    console.error(`[fieldfold] ${err.message}`);
    process.exit(1);
  }
}
