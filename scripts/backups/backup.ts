import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import { databaseEngine, postgresNotYet } from './engine';
import { copyTree, fsyncPath, sha256File, type FileRecord } from './files';
import { FILE_FOLDERS, MANIFEST_FILE, MANIFEST_FORMAT, type BackupManifest, type FileFolder } from './manifest';
import { backupSqlite, inspectSqlite } from './sqlite';

// npm run backup: the database first, then the stored files, into BACKUP_DIR/fieldfold-<UTC time>/.
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

export async function takeBackup(o: BackupOptions): Promise<{ path: string; manifest: BackupManifest }> {
  const now = o.now ?? (() => new Date());
  const engine = databaseEngine(o.env ?? process.env, o.dataDir);
  if (engine.kind === 'postgres') postgresNotYet('backup');
  if (!fs.existsSync(engine.file)) throw new Error(`There is no Fieldfold database at ${engine.file} (check DATA_DIR)`);

  const startedAt = now();
  fs.mkdirSync(o.backupDir, { recursive: true });
  const finalPath = path.join(o.backupDir, `fieldfold-${stamp(startedAt)}`);
  const work = `${finalPath}.partial`;
  if (fs.existsSync(finalPath) || fs.existsSync(work)) throw new Error(`${finalPath} exists already; try again in a moment`);
  fs.mkdirSync(work);
  try {
    const snapshotAt = now();
    const dbCopy = path.join(work, DATABASE_FILE);
    await backupSqlite(engine.file, dbCopy);
    const facts = inspectSqlite(dbCopy);
    if (facts.integrity !== 'ok') throw new Error(`The database copy failed its integrity check: ${facts.integrity}`);

    const files = {} as BackupManifest['files'];
    for (const folder of FILE_FOLDERS) files[folder as FileFolder] = totals(copyTree(path.join(o.dataDir, folder), path.join(work, folder)));

    const manifest: BackupManifest = {
      format: MANIFEST_FORMAT,
      version: 1,
      startedAt: startedAt.toISOString(),
      finishedAt: now().toISOString(),
      source: o.dataDir,
      database: { engine: 'sqlite', file: DATABASE_FILE, snapshotAt: snapshotAt.toISOString(), bytes: facts.bytes, sha256: sha256File(dbCopy), integrity: facts.integrity, migrations: facts.migrations, tables: facts.tables },
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
