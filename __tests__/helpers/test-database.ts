import crypto from 'node:crypto';
import { Client } from 'pg';
import type { DataSource } from 'typeorm';
import { migrations, openDatabase } from '../../server/db/data-source';

// Where a test's data lives. By default a fresh in-memory SQLite that ran the real migrations. With
// TEST_DATABASE_URL=postgres://… (npm test sets it for its PostgreSQL pass, on a throw-away cluster) each test app
// gets a database of its own on that server, copied from a template that ran the same migrations once: CREATE
// DATABASE … TEMPLATE takes a few tens of milliseconds, the migrations far longer.

/** The PostgreSQL server the suite runs on, or null for SQLite. */
export const TEST_DATABASE_URL = process.env.TEST_DATABASE_URL || null;

/** True when the suite runs on PostgreSQL (for the few checks that are one engine's own, like SQLite's query plans). */
export const onPostgres = TEST_DATABASE_URL !== null;

export interface TestDatabase {
  /** What openDatabase / createDataSource take: ':memory:' or a postgres:// URL. */
  target: string;
  /** Drops the database (PostgreSQL); call after the data source is destroyed. */
  drop(): Promise<void>;
}

let made = 0;
let template: Promise<string> | null = null;

function urlFor(database: string): string {
  const u = new URL(TEST_DATABASE_URL!);
  u.pathname = `/${database}`;
  return u.toString();
}

async function admin<T>(work: (c: Client) => Promise<T>): Promise<T> {
  const c = new Client({ connectionString: TEST_DATABASE_URL! });
  await c.connect();
  try {
    return await work(c);
  } finally {
    await c.end();
  }
}

/** The migrated template for this set of migrations, made once per cluster (jest workers take turns by advisory lock). */
function templateDatabase(): Promise<string> {
  template ??= (async () => {
    const key = crypto.createHash('sha256').update(migrations.map((m) => m.name).join(',')).digest('hex').slice(0, 12);
    const name = `fieldfold_template_${key}`;
    await admin(async (c) => {
      await c.query('SELECT pg_advisory_lock(4242)');
      try {
        const found = await c.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
        if (found.rowCount) return;
        // Built under another name and renamed when complete, so a crash never leaves a half-made template.
        const building = `${name}_building`;
        await c.query(`DROP DATABASE IF EXISTS "${building}"`);
        await c.query(`CREATE DATABASE "${building}"`);
        const ds = await openDatabase(urlFor(building));
        await ds.destroy();
        await c.query(`ALTER DATABASE "${building}" RENAME TO "${name}"`);
      } finally {
        await c.query('SELECT pg_advisory_unlock(4242)');
      }
    });
    return name;
  })();
  return template;
}

/**
 * A fresh database for one test app: migrated (copied from the template), or with `migrated: false` an empty one
 * (PostgreSQL only), for the tests whose servers run the migrations themselves as a new deployment does.
 */
export async function freshTestDatabase({ migrated = true }: { migrated?: boolean } = {}): Promise<TestDatabase> {
  if (!TEST_DATABASE_URL) {
    if (!migrated) throw new Error('freshTestDatabase({ migrated: false }) needs TEST_DATABASE_URL (an empty SQLite database is a new file)');
    return { target: ':memory:', drop: async () => undefined };
  }
  const tpl = migrated ? await templateDatabase() : 'template0';
  made += 1;
  const name = `fieldfold_test_${process.pid}_${made}_${crypto.randomBytes(3).toString('hex')}`;
  await admin((c) => c.query(`CREATE DATABASE "${name}" TEMPLATE "${tpl}"`));
  return {
    target: urlFor(name),
    drop: () => admin((c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)).then(() => undefined),
  };
}

/**
 * A raw query written once for both engines: `:name` parameters become SQLite's `?` or PostgreSQL's `$1` (TypeORM's
 * own conversion), and the rows come back as the driver gives them.
 */
export function rawQuery<T = Record<string, unknown>>(ds: DataSource, sql: string, params: Record<string, unknown> = {}): Promise<T[]> {
  const [text, values] = ds.driver.escapeQueryWithParameters(sql, params);
  return ds.query(text, values);
}
