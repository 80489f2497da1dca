import fs from 'node:fs';
import Database from 'better-sqlite3';
import { fsyncPath } from './files';

// The SQLite side of backup and restore, through better-sqlite3's online backup API (sqlite3_backup_*).
//
// The copy is taken in ONE backup step: the first step opens a read transaction on the live database, and
// copying every page within it makes the copy exactly the database as of that moment — every transaction
// committed before it, none after, whatever the server writes meanwhile (WAL mode lets it keep writing; the
// backup never blocks it). Copying in small steps instead lets a write from the server's process restart the
// backup from the beginning, and under steady load it might never finish.

/** More pages than any database has: the step that follows the first copies all that remain. */
const ALL_PAGES = 0x7fffffff;

export interface SqliteCopyFacts {
  /** `PRAGMA integrity_check`'s answer on the copy ('ok' when sound). */
  integrity: string;
  /** Rows per table in the copy (sqlite's own tables left out). */
  tables: Record<string, number>;
  /** Names of the migrations the copy has run, oldest first. */
  migrations: string[];
  bytes: number;
}

/** Copies the live database at `source` into `dest` (a new file), standalone (rollback journal, not WAL). */
export async function backupSqlite(source: string, dest: string): Promise<void> {
  if (!fs.existsSync(source)) throw new Error(`There is no database at ${source}`);
  const db = new Database(source, { readonly: true, fileMustExist: true });
  try {
    db.pragma('busy_timeout = 5000');
    await db.backup(dest, { progress: () => ALL_PAGES });
  } finally {
    db.close();
  }
  // The copy keeps the source's WAL flag in its header; a backup is one file, so turn it back to a journal.
  const copy = new Database(dest, { fileMustExist: true });
  try {
    copy.pragma('journal_mode = DELETE');
  } finally {
    copy.close();
  }
  fsyncPath(dest);
}

/** Integrity, row counts and migrations of a database file, opened read-only. */
export function inspectSqlite(file: string): SqliteCopyFacts {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = (db.pragma('integrity_check') as Array<{ integrity_check: string }>).map((r) => r.integrity_check).join('; ');
    const names = (db.prepare(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name`).all() as Array<{ name: string }>).map((r) => r.name);
    const tables: Record<string, number> = {};
    // Names come from the database's own catalogue, quoted as identifiers.
    for (const name of names) tables[name] = (db.prepare(`SELECT COUNT(*) AS n FROM "${name.replace(/"/g, '""')}"`).get() as { n: number }).n;
    const migrations = names.includes('migrations') ? (db.prepare('SELECT name FROM migrations ORDER BY timestamp').all() as Array<{ name: string }>).map((r) => r.name) : [];
    return { integrity, tables, migrations, bytes: fs.statSync(file).size };
  } finally {
    db.close();
  }
}
