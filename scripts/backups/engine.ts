import path from 'node:path';
import { DATABASE_FILE } from '../../server/config/env';

// Which database a backup copies and a restore replaces, chosen as the server will choose it: DATABASE_URL names a
// PostgreSQL database; without it the database is the SQLite file in DATA_DIR.

export type DatabaseEngine = { kind: 'sqlite'; file: string } | { kind: 'postgres'; url: string };

export function databaseEngine(env: NodeJS.ProcessEnv, dataDir: string): DatabaseEngine {
  const url = env.DATABASE_URL?.trim();
  if (!url) return { kind: 'sqlite', file: path.join(dataDir, DATABASE_FILE) };
  if (/^postgres(ql)?:\/\//i.test(url)) return { kind: 'postgres', url };
  throw new Error('DATABASE_URL must be a postgres:// URL, or unset for the SQLite file in DATA_DIR');
}
