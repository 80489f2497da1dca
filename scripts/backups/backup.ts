import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import { databaseEngine, type DatabaseEngine } from './engine';
import { copyTree, fsyncPath, sha256File, type FileRecord } from './files';
import { FILE_FOLDERS, MANIFEST_FILE, MANIFEST_FORMAT, POSTGRES_DUMP_FILE, type BackupManifest, type DatabaseManifest, type FileFolder } from './manifest';
import { backupPostgres, postgresLabel } from './postgres';
import { backupSqlite, inspectSqlite } from './sqlite';

// npm run backup: the database first, then the stored files, into BACKUP_DIR/fieldfold-<UTC time>/. The database
// is the SQLite file in DATA_DIR (its online backup API), or with DATABASE_URL the PostgreSQL database (pg_dump in
// one exported snapshot, scripts/backups/postgres.ts); the files are DATA_DIR's either way.
//
// Why that order: the services write a file (photo, PDF) before the row that names it commits, and never
// rewrite a file in place. So every row in the database copy names a file that already existed when the copy
// was taken, and the file copy, made afterwards, has it — unless it was deleted in between (a photo removed
// meanwhile), which the row deletion that goes with it makes harmless. Files newer than the snapshot are copied
// too and are simply unreferenced in the copy.
//
// The folder is built under a ".partial" name and renamed when complete, so a backup interrupted half-way is
// never mistaken for one; the manifest is the last file written.

export interface BackupOptions {
  dataDir: string;
  backupDir: string;
  env?: NodeJS.ProcessEnv;
  now?: () => Date;
}

/** "2026-12-01T20-00-00-123Z": sortable, and legal in every file system's names. */
function stamp(d: Date): string {
  return d.toISOString().replace(/:/g, '-').replace('.', '-');
}

function totals(items: FileRecord[]) {
  return { count: items.length, bytes: items.reduce((n, f) => n + f.bytes, 0), items };
}

/** Copies the database into the backup folder `work` and describes the copy. */
async function copyDatabase(engine: DatabaseEngine, work: string, now: () => Date): Promise<DatabaseManifest> {
  if (engine.kind === 'postgres') {
    const file = path.join(work, POSTGRES_DUMP_FILE);
    const facts = await backupPostgres(engine.url, file);
    fsyncPath(file);
    return { engine: 'postgres', file: POSTGRES_DUMP_FILE, from: postgresLabel(engine.url), sha256: sha256File(file), ...facts };
  }
  const snapshotAt = now();
  const dbCopy = path.join(work, DATABASE_FILE);
  await backupSqlite(engine.file, dbCopy);
  const facts = inspectSqlite(dbCopy);
  if (facts.integrity !== 'ok') throw new Error(`The database copy failed its integrity check: ${facts.integrity}`);
  return { engine: 'sqlite', file: DATABASE_FILE, snapshotAt: snapshotAt.toISOString(), bytes: facts.bytes, sha256: sha256File(dbCopy), integrity: facts.integrity, migrations: facts.migrations, tables: facts.tables };
}

export async function takeBackup(o: BackupOptions): Promise<{ path: string; manifest: BackupManifest }> {
  const now = o.now ?? (() => new Date());
  const engine = databaseEngine(o.env ?? process.env, o.dataDir);
  if (engine.kind === 'sqlite' && !fs.existsSync(engine.file)) throw new Error(`There is no Fieldfold database at ${engine.file} (check DATA_DIR)`);

  const startedAt = now();
  fs.mkdirSync(o.backupDir, { recursive: true });
  const finalPath = path.join(o.backupDir, `fieldfold-${stamp(startedAt)}`);
  const work = `${finalPath}.partial`;
  if (fs.existsSync(finalPath) || fs.existsSync(work)) throw new Error(`${finalPath} exists already; try again in a moment`);
  fs.mkdirSync(work);
  try {
    const database = await copyDatabase(engine, work, now);
    const files = {} as BackupManifest['files'];
    for (const folder of FILE_FOLDERS) files[folder as FileFolder] = totals(copyTree(path.join(o.dataDir, folder), path.join(work, folder)));

    const manifest: BackupManifest = {
      format: MANIFEST_FORMAT,
      version: 1,
      startedAt: startedAt.toISOString(),
      finishedAt: now().toISOString(),
      source: o.dataDir,
      database,
      files,
    };
    const manifestFile = path.join(work, MANIFEST_FILE);
    fs.writeFileSync(manifestFile, `${JSON.stringify(manifest, null, 2)}\n`);
    fsyncPath(manifestFile);
    fsyncPath(work);
    fs.renameSync(work, finalPath);
    fsyncPath(o.backupDir);
    return { path: finalPath, manifest };
  } catch (err) {
    fs.rmSync(work, { recursive: true, force: true });
    throw err;
  }
}
