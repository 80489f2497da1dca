import { Client } from 'pg';
import { POSTGRES_APPLICATION_NAME } from '../../server/db/data-source';
import { checkDump, dumpPostgres, restorePostgres } from '../backup-postgres.mjs';

// The PostgreSQL side of backup and restore (DATABASE_URL set): pg_dump / pg_restore through
// scripts/backup-postgres.mjs, and what the manifest says of the copy, read in the very snapshot the dump took.
//
// The copy is consistent under load the way the SQLite one is: this session opens a REPEATABLE READ transaction,
// exports its snapshot (pg_export_snapshot) and keeps it open while pg_dump --snapshot dumps exactly that view —
// every transaction committed before it, none after, whatever the servers write meanwhile (they never wait for
// it). The row counts and migrations in the manifest are read in the same snapshot, so they are the dump's own.

export interface PostgresCopyFacts {
  /** 'ok' when pg_restore reads the whole dump back (checkDump). */
  integrity: string;
  tables: Record<string, number>;
  migrations: string[];
  bytes: number;
  /** The snapshot's transaction began at this instant: it holds every transaction committed before it. */
  snapshotAt: string;
}

/** host:port/database of a DATABASE_URL, without the user and password (for messages and the manifest). */
export function postgresLabel(url: string): string {
  const u = new URL(url);
  return `${u.host}${u.pathname}`;
}

async function connect(url: string, role: string): Promise<Client> {
  const c = new Client({ connectionString: url, application_name: `fieldfold-${role}` });
  try {
    await c.connect();
  } catch (err) {
    throw new Error(`Cannot reach the PostgreSQL database ${postgresLabel(url)} named by DATABASE_URL (${err instanceof Error ? err.message : String(err)})`);
  }
  return c;
}

const quote = (id: string) => `"${id.replace(/"/g, '""')}"`;

/** The tables of the current schema (ordinary and partitioned), by name. */
async function tableNames(c: Client): Promise<string[]> {
  const r = await c.query<{ name: string }>(`SELECT relname AS name FROM pg_class WHERE relnamespace = current_schema()::regnamespace AND relkind IN ('r', 'p') ORDER BY relname`);
  return r.rows.map((x) => x.name);
}

/** Dumps the live database at `url` into `dest` and returns what the copy holds. */
export async function backupPostgres(url: string, dest: string): Promise<PostgresCopyFacts> {
  const c = await connect(url, 'backup');
  try {
    await c.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
    const [{ snapshot, at }] = (await c.query<{ snapshot: string; at: Date }>('SELECT pg_export_snapshot() AS snapshot, now() AS at')).rows;
    const names = await tableNames(c);
    if (!names.includes('migrations')) throw new Error(`${postgresLabel(url)} holds no Fieldfold database (no migrations table): check DATABASE_URL`);
    const tables: Record<string, number> = {};
    for (const name of names) tables[name] = Number((await c.query<{ n: string }>(`SELECT COUNT(*) AS n FROM ${quote(name)}`)).rows[0].n);
    const migrations = (await c.query<{ name: string }>('SELECT name FROM migrations ORDER BY timestamp')).rows.map((r) => r.name);
    // pg_dump runs while this transaction holds the snapshot open (a synchronous call: nothing else is due here).
    const bytes = dumpPostgres(url, dest, { snapshot });
    await c.query('COMMIT');
    checkDump(dest);
    return { integrity: 'ok', tables, migrations, bytes, snapshotAt: at.toISOString() };
  } finally {
    await c.end();
  }
}

/** The check a restore makes of a dump before it touches anything: 'ok', or what pg_restore said. */
export function inspectDump(file: string): string {
  try {
    checkDump(file);
    return 'ok';
  } catch (err) {
    return err instanceof Error ? err.message : String(err);
  }
}

export interface PostgresSession {
  pid: number;
  client: string;
  since: string;
}

/** Fieldfold server connections to the database at `url` (any machine's), this one's own left out. */
export async function serverSessions(url: string): Promise<PostgresSession[]> {
  const c = await connect(url, 'restore');
  try {
    const r = await c.query<{ pid: number; client: string | null; since: Date | null }>(
      `SELECT pid, client_addr::text AS client, backend_start AS since FROM pg_stat_activity
        WHERE datname = current_database() AND application_name = $1 AND pid <> pg_backend_pid() ORDER BY backend_start`,
      [POSTGRES_APPLICATION_NAME],
    );
    return r.rows.map((x) => ({ pid: x.pid, client: x.client ?? 'a local socket', since: x.since ? x.since.toISOString() : 'unknown' }));
  } finally {
    await c.end();
  }
}

/** True when the database holds any table (something a restore would replace). */
export async function holdsTables(url: string): Promise<boolean> {
  const c = await connect(url, 'restore');
  try {
    return (await tableNames(c)).length > 0;
  } finally {
    await c.end();
  }
}

export { dumpPostgres, restorePostgres };
