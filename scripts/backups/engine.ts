import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';

// Which database a backup copies, chosen as the server will choose it: DATABASE_URL names a PostgreSQL server;
// without it the database is the SQLite file in DATA_DIR.

export type DatabaseEngine = { kind: 'sqlite'; file: string } | { kind: 'postgres'; url: string };

export function databaseEngine(env: NodeJS.ProcessEnv, dataDir: string): DatabaseEngine {
  const url = env.DATABASE_URL?.trim();
  if (!url) return { kind: 'sqlite', file: path.join(dataDir, DATABASE_FILE) };
  if (/^postgres(ql)?:\/\//i.test(url)) return { kind: 'postgres', url };
  throw new Error('DATABASE_URL must be a postgres:// URL, or unset for the SQLite file in DATA_DIR');
}

/**
 * The PostgreSQL branch, still to be built (it comes with PostgreSQL support): `pg_dump --format=custom
 * --file=<backup>/fieldfold.pgdump "$DATABASE_URL"` (a consistent snapshot in one transaction, like the SQLite
 * copy), its SHA-256 and per-table counts in the manifest, and `pg_restore --clean --if-exists --single-transaction`
 * in restore. Until then both commands stop here with this sentence rather than copy the wrong thing.
 */
export function postgresNotYet(what: 'backup' | 'restore'): never {
  throw new Error(`DATABASE_URL names a PostgreSQL database: the ${what} of PostgreSQL (pg_dump / pg_restore) is not built yet. Unset DATABASE_URL to ${what} the SQLite file in DATA_DIR.`);
}
