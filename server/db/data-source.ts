import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { Account, Session } from '../modules/accounts/account.entity';
import { Accounts1764600000000 } from './migrations/1764600000000-accounts';

export const entities = [Account, Session];
export const migrations = [Accounts1764600000000];

/** `database` is a file path, or ':memory:' for tests. Migrations only; never synchronize. */
export function createDataSource(database: string): DataSource {
  return new DataSource({
    type: 'better-sqlite3',
    database,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    logging: false,
    // WAL lets the PDF and mail work read while a request writes; the busy timeout waits out a short lock
    // instead of failing with SQLITE_BUSY.
    prepareDatabase: (db: { pragma: (s: string) => unknown }) => {
      if (database !== ':memory:') db.pragma('journal_mode = WAL');
      db.pragma('busy_timeout = 5000');
      db.pragma('foreign_keys = ON');
    },
  });
}

export async function openDatabase(database: string): Promise<DataSource> {
  const ds = createDataSource(database);
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  return ds;
}
