import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import { registerRunning, runningProcesses } from '../../server/lib/running-servers';
import { databaseEngine, postgresNotYet } from './engine';
import { copyTree, fsyncPath, mismatchedFiles, sha256File } from './files';
import { FILE_FOLDERS, readManifest, type BackupManifest } from './manifest';
import { inspectSqlite } from './sqlite';

// npm run restore -- PATH: puts a backup back into DATA_DIR.
//
// 1. The backup is checked first, before anything in DATA_DIR is touched: its manifest, the database copy's
//    SHA-256 and integrity check, and every file's size and SHA-256.
// 2. It refuses while a server runs on DATA_DIR. Each server registers itself in DATA_DIR/running/<pid>.json
//    from start to stop (server/lib/running-servers.ts); a file whose process no longer exists (a server killed
//    with SIGKILL) is stale and does not count. The restore registers itself the same way first, and a server
//    starting meanwhile sees it and does not start.
// 3. The data it replaces is kept, not deleted: the database (with its -wal and -shm, which may hold committed
//    transactions), uploads/ and documents/ are renamed into DATA_DIR/before-restore-<time>/.
// 4. The files go in first and the database last (copied under a temporary name, flushed, renamed), so a
//    database is in place only once the files it names are.

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

function checkBackup(backupPath: string): BackupManifest {
  const manifest = readManifest(backupPath);
  const db = path.join(backupPath, manifest.database.file);
  if (!fs.existsSync(db)) throw new RestoreRefused(`${backupPath} has no ${manifest.database.file}`);
  if (sha256File(db) !== manifest.database.sha256) throw new RestoreRefused(`${db} does not match the SHA-256 in its manifest: the copy is damaged`);
  const facts = inspectSqlite(db);
  if (facts.integrity !== 'ok') throw new RestoreRefused(`${db} fails its integrity check: ${facts.integrity}`);
  for (const folder of FILE_FOLDERS) {
    const bad = mismatchedFiles(path.join(backupPath, folder), manifest.files[folder]?.items ?? []);
    if (bad.length > 0) throw new RestoreRefused(`${bad.length} file(s) in ${folder}/ are missing or differ from the manifest, e.g. ${bad[0]}`);
  }
  return manifest;
}

function stamp(d: Date): string {
  return d.toISOString().replace(/:/g, '-').replace('.', '-');
}

/** Renames what the restore replaces into DATA_DIR/before-restore-<time>/; null when there was nothing. */
function keepAside(dataDir: string, at: Date): string | null {
  const names = [DATABASE_FILE, `${DATABASE_FILE}-wal`, `${DATABASE_FILE}-shm`, ...FILE_FOLDERS].filter((n) => fs.existsSync(path.join(dataDir, n)));
  if (names.length === 0) return null;
  const aside = path.join(dataDir, `before-restore-${stamp(at)}`);
  fs.mkdirSync(aside);
  for (const n of names) fs.renameSync(path.join(dataDir, n), path.join(aside, n));
  fsyncPath(aside);
  return aside;
}

export function restoreBackup(o: RestoreOptions): RestoreResult {
  const now = o.now ?? (() => new Date());
  const backupPath = path.resolve(o.backupPath);
  if (databaseEngine(o.env ?? process.env, o.dataDir).kind === 'postgres') postgresNotYet('restore');
  const manifest = checkBackup(backupPath);

  fs.mkdirSync(o.dataDir, { recursive: true });
  const unregister = registerRunning(o.dataDir, 'restore');
  try {
    const others = runningProcesses(o.dataDir);
    const server = others.find((p) => p.role === 'server');
    if (server) {
      throw new RestoreRefused(
        `A Fieldfold server (process ${server.pid}${server.port !== undefined ? `, port ${server.port}` : ''}, started ${server.startedAt}) is running on ${o.dataDir}. Stop it first; nothing was changed.`,
      );
    }
    const restore = others.find((p) => p.role === 'restore');
    if (restore) throw new RestoreRefused(`Another restore (process ${restore.pid}) is running on ${o.dataDir}; nothing was changed.`);

    const keptAside = keepAside(o.dataDir, now());
    try {
      for (const folder of FILE_FOLDERS) copyTree(path.join(backupPath, folder), path.join(o.dataDir, folder));
      const target = path.join(o.dataDir, DATABASE_FILE);
      const incoming = `${target}.restoring`;
      fs.copyFileSync(path.join(backupPath, manifest.database.file), incoming);
      fsyncPath(incoming);
      fs.renameSync(incoming, target);
      fsyncPath(o.dataDir);
    } catch (err) {
      const kept = keptAside ? `; the previous data is untouched in ${keptAside}` : '';
      throw new RestoreStoppedPartWay(`the restore stopped part-way (${err instanceof Error ? err.message : String(err)})${kept}`);
    }
    return { manifest, keptAside };
  } finally {
    unregister();
  }
}
