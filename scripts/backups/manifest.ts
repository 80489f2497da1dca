import fs from 'node:fs';
import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';
import type { FileRecord } from './files';

// What a backup folder holds, written last (manifest.json) so a folder with a manifest is a finished backup:
//   fieldfold.sqlite   the database as of `database.snapshotAt` (SQLite engine)
//   uploads/           the uploaded photos (block and log photos), as in DATA_DIR/uploads
//   documents/         the stored PDF records (numbered versions by key), as in DATA_DIR/documents
//   manifest.json      this description: counts, sizes and SHA-256 of everything above
// Secrets (token-secret, payments-webhook-secret) are deliberately not in it: a restore keeps the target's own.

export const MANIFEST_FILE = 'manifest.json';
export const MANIFEST_FORMAT = 'fieldfold-backup';
/** The stored-file folders of DATA_DIR that a backup carries. */
export const FILE_FOLDERS = ['uploads', 'documents'] as const;
export type FileFolder = (typeof FILE_FOLDERS)[number];

export interface BackupManifest {
  format: typeof MANIFEST_FORMAT;
  version: 1;
  /** When the command started and finished (ISO). */
  startedAt: string;
  finishedAt: string;
  /** The DATA_DIR it was taken from. */
  source: string;
  database: {
    engine: 'sqlite';
    file: typeof DATABASE_FILE;
    /** When the copy's read snapshot was opened: it holds every transaction committed before this. */
    snapshotAt: string;
    bytes: number;
    sha256: string;
    integrity: string;
    migrations: string[];
    /** Rows per table. */
    tables: Record<string, number>;
  };
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
  if (parsed.database?.engine !== 'sqlite') throw new Error(`${backupPath} holds a ${String(parsed.database?.engine)} backup; this restore handles SQLite backups`);
  return parsed;
}
