import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import type { FileRecord } from './files';

// What a backup folder holds, written last (manifest.json) so a folder with a manifest is a finished backup:
//   fieldfold.sqlite   the database as of `database.snapshotAt` (SQLite engine), or
//   fieldfold.pgdump   the database as of `database.snapshotAt` (PostgreSQL, DATABASE_URL: pg_dump's custom format)
//   uploads/           the uploaded photos (block and log photos), as in DATA_DIR/uploads
//   documents/         the stored PDF records (numbered versions by key), as in DATA_DIR/documents
//   manifest.json      this description: counts, sizes and SHA-256 of everything above
// Secrets (token-secret, payments-webhook-secret) are deliberately not in it: a restore keeps the target's own.

export const MANIFEST_FILE = 'manifest.json';
export const MANIFEST_FORMAT = 'fieldfold-backup';
/** The stored-file folders of DATA_DIR that a backup carries. */
export const FILE_FOLDERS = ['uploads', 'documents'] as const;
export type FileFolder = (typeof FILE_FOLDERS)[number];
/** The PostgreSQL database's dump in a backup folder. */
export const POSTGRES_DUMP_FILE = 'fieldfold.pgdump';

interface DatabaseCopy {
  /** When the copy's read snapshot was opened: it holds every transaction committed before this. */
  snapshotAt: string;
  bytes: number;
  sha256: string;
  /** 'ok' when sound: SQLite's integrity_check on the copy; on PostgreSQL, pg_restore read the whole dump back. */
  integrity: string;
  migrations: string[];
  /** Rows per table. */
  tables: Record<string, number>;
}

export type DatabaseManifest =
  | (DatabaseCopy & { engine: 'sqlite'; file: typeof DATABASE_FILE })
  /** `from`: host:port/database it was dumped from (no user or password). */
  | (DatabaseCopy & { engine: 'postgres'; file: typeof POSTGRES_DUMP_FILE; from: string });

export interface BackupManifest {
  format: typeof MANIFEST_FORMAT;
  version: 1;
  /** When the command started and finished (ISO). */
  startedAt: string;
  finishedAt: string;
  /** The DATA_DIR it was taken from. */
  source: string;
  database: DatabaseManifest;
  files: Record<FileFolder, { count: number; bytes: number; items: FileRecord[] }>;
}

export function readManifest(backupPath: string): BackupManifest {
  const file = path.join(backupPath, MANIFEST_FILE);
  let parsed: BackupManifest;
  try {
    parsed = JSON.parse(fs.readFileSync(file, 'utf8')) as BackupManifest;
  } catch (err) {
    const why = (err as NodeJS.ErrnoException).code === 'ENOENT' ? 'it has no manifest.json (not a finished Fieldfold backup)' : `its manifest.json cannot be read (${(err as Error).message})`;
    throw new Error(`${backupPath} cannot be restored: ${why}`);
  }
  if (parsed?.format !== MANIFEST_FORMAT || parsed.version !== 1) throw new Error(`${backupPath} cannot be restored: manifest.json is not a Fieldfold backup manifest (version 1)`);
  const db = parsed.database as { engine?: unknown; file?: unknown } | undefined;
  const known = (db?.engine === 'sqlite' && db.file === DATABASE_FILE) || (db?.engine === 'postgres' && db.file === POSTGRES_DUMP_FILE);
  if (!known) throw new Error(`${backupPath} cannot be restored: its manifest names a ${String(db?.engine)} database in ${String(db?.file)}, which is neither a SQLite nor a PostgreSQL backup`);
  return parsed;
}
