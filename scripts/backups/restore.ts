import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import { registerRunning, runningProcesses } from '../../server/lib/running-servers';
import { databaseEngine, type DatabaseEngine } from './engine';
import { copyTree, fsyncPath, mismatchedFiles, sha256File } from './files';
import { FILE_FOLDERS, POSTGRES_DUMP_FILE, readManifest, type BackupManifest } from './manifest';
import { dumpPostgres, holdsTables, inspectDump, postgresLabel, restorePostgres, serverSessions } from './postgres';
import { inspectSqlite } from './sqlite';

// npm run restore -- PATH: puts a backup back into DATA_DIR — and, with DATABASE_URL, into that PostgreSQL
// database. A SQLite backup restores only without DATABASE_URL, a PostgreSQL one only with it.
//
// 1. The backup is checked first, before anything is touched: its manifest, the database copy's SHA-256 and
//    soundness (SQLite's integrity check; pg_restore reading the whole dump), and every file's size and SHA-256.
// 2. It refuses while a server runs on DATA_DIR. Each server registers itself in DATA_DIR/running/<pid>.json
//    from start to stop (server/lib/running-servers.ts); a file whose process no longer exists (a server killed
//    with SIGKILL) is stale and does not count. The restore registers itself the same way first, and a server
//    starting meanwhile sees it and does not start. On PostgreSQL it also refuses while any server process, from
//    whichever machine and DATA_DIR, is connected to the database (its sessions carry application_name fieldfold).
// 3. The data it replaces is kept, not deleted: the database (SQLite: the file with its -wal and -shm, which may
//    hold committed transactions; PostgreSQL: a pg_dump of it as it was), uploads/ and documents/ go into
//    DATA_DIR/before-restore-<time>/.
// 4. The files go in first and the database last (SQLite: copied under a temporary name, flushed, renamed;
//    PostgreSQL: pg_restore --clean in one transaction), so a database is in place only once the files it names are.

/** Nothing in DATA_DIR was changed (a server runs on it, or the backup is not sound). */
export class RestoreRefused extends Error {}
/** The restore began and stopped: the replaced data is still whole where it was kept aside. */
export class RestoreStoppedPartWay extends Error {}

export interface RestoreOptions {
  backupPath: string;
  dataDir: string;
  env?: NodeJS.ProcessEnv;
  now?: () => Date;
}

export interface RestoreResult {
  manifest: BackupManifest;
  /** Where the replaced data was put, or null when DATA_DIR held none. */
  keptAside: string | null;
}

function checkBackup(backupPath: string, engine: DatabaseEngine): BackupManifest {
  const manifest = readManifest(backupPath);
  const { database } = manifest;
  if (database.engine === 'sqlite' && engine.kind === 'postgres') {
    throw new RestoreRefused(`${backupPath} holds a SQLite database, and DATABASE_URL names a PostgreSQL one: unset DATABASE_URL to restore it into DATA_DIR`);
  }
  if (database.engine === 'postgres' && engine.kind === 'sqlite') {
    throw new RestoreRefused(`${backupPath} holds a PostgreSQL database (dumped from ${database.from}): set DATABASE_URL to the PostgreSQL database to restore it into`);
  }
  const db = path.join(backupPath, database.file);
  if (!fs.existsSync(db)) throw new RestoreRefused(`${backupPath} has no ${database.file}`);
  if (sha256File(db) !== database.sha256) throw new RestoreRefused(`${db} does not match the SHA-256 in its manifest: the copy is damaged`);
  const integrity = database.engine === 'postgres' ? inspectDump(db) : inspectSqlite(db).integrity;
  if (integrity !== 'ok') throw new RestoreRefused(`${db} fails its integrity check: ${integrity}`);
  for (const folder of FILE_FOLDERS) {
    const bad = mismatchedFiles(path.join(backupPath, folder), manifest.files[folder]?.items ?? []);
    if (bad.length > 0) throw new RestoreRefused(`${bad.length} file(s) in ${folder}/ are missing or differ from the manifest, e.g. ${bad[0]}`);
  }
  return manifest;
}

function stamp(d: Date): string {
  return d.toISOString().replace(/:/g, '-').replace('.', '-');
}

/**
 * Puts what the restore replaces into DATA_DIR/before-restore-<time>/: the SQLite files and the stored-file
 * folders are moved there; a PostgreSQL database that holds anything is dumped there. Null when there was nothing.
 */
async function keepAside(dataDir: string, engine: DatabaseEngine, at: Date): Promise<string | null> {
  const sqlite = engine.kind === 'sqlite' ? [DATABASE_FILE, `${DATABASE_FILE}-wal`, `${DATABASE_FILE}-shm`] : [];
  const names = [...sqlite, ...FILE_FOLDERS].filter((n) => fs.existsSync(path.join(dataDir, n)));
  const database = engine.kind === 'postgres' && (await holdsTables(engine.url));
  if (names.length === 0 && !database) return null;
  const aside = path.join(dataDir, `before-restore-${stamp(at)}`);
  fs.mkdirSync(aside);
  if (database) {
    dumpPostgres(engine.url, path.join(aside, POSTGRES_DUMP_FILE));
    fsyncPath(path.join(aside, POSTGRES_DUMP_FILE));
  }
  for (const n of names) fs.renameSync(path.join(dataDir, n), path.join(aside, n));
  fsyncPath(aside);
  return aside;
}

/** Refuses while anything else uses this DATA_DIR (or, on PostgreSQL, the database). */
async function refuseWhileInUse(dataDir: string, engine: DatabaseEngine): Promise<void> {
  const others = runningProcesses(dataDir);
  const server = others.find((p) => p.role === 'server');
  if (server) {
    throw new RestoreRefused(
      `A Fieldfold server (process ${server.pid}${server.port !== undefined ? `, port ${server.port}` : ''}, started ${server.startedAt}) is running on ${dataDir}. Stop it first; nothing was changed.`,
    );
  }
  const restore = others.find((p) => p.role === 'restore');
  if (restore) throw new RestoreRefused(`Another restore (process ${restore.pid}) is running on ${dataDir}; nothing was changed.`);
  if (engine.kind === 'postgres') {
    const sessions = await serverSessions(engine.url);
    if (sessions.length > 0) {
      const [first] = sessions;
      throw new RestoreRefused(
        `${sessions.length} connection(s) of a Fieldfold server are open on ${postgresLabel(engine.url)} (the first from ${first.client}, since ${first.since}). Stop every server process first; nothing was changed.`,
      );
    }
  }
}

export async function restoreBackup(o: RestoreOptions): Promise<RestoreResult> {
  const now = o.now ?? (() => new Date());
  const backupPath = path.resolve(o.backupPath);
  const engine = databaseEngine(o.env ?? process.env, o.dataDir);
  const manifest = checkBackup(backupPath, engine);

  fs.mkdirSync(o.dataDir, { recursive: true });
  const unregister = registerRunning(o.dataDir, 'restore');
  try {
    await refuseWhileInUse(o.dataDir, engine);
    const keptAside = await keepAside(o.dataDir, engine, now());
    try {
      for (const folder of FILE_FOLDERS) copyTree(path.join(backupPath, folder), path.join(o.dataDir, folder));
      const copy = path.join(backupPath, manifest.database.file);
      if (engine.kind === 'postgres') restorePostgres(engine.url, copy);
      else {
        const target = path.join(o.dataDir, DATABASE_FILE);
        const incoming = `${target}.restoring`;
        fs.copyFileSync(copy, incoming);
        fsyncPath(incoming);
        fs.renameSync(incoming, target);
        fsyncPath(o.dataDir);
      }
    } catch (err) {
      const kept = keptAside ? `; the previous data is untouched in ${keptAside}` : '';
      throw new RestoreStoppedPartWay(`the restore stopped part-way (${err instanceof Error ? err.message : String(err)})${kept}`);
    }
    return { manifest, keptAside };
  } finally {
    unregister();
  }
}
