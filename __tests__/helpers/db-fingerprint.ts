import crypto from 'node:crypto';
import type { DataSource } from 'typeorm';

// What is stored, table by table: the row count and a hash over every row, so a test can say "this request
// changed nothing" and, when it did, name the table. On either engine the tests run on:
//   SQLite      every table of sqlite_master, rows in rowid order, SHA-256 over their JSON here;
//   PostgreSQL  every table of the current schema, rows in primary-key order, md5 over each row's text form
//               computed by the server in ONE query for all tables (hostile-input takes a fingerprint per run).

export type Fingerprint = Record<string, string>;

export async function dbFingerprint(ds: DataSource): Promise<Fingerprint> {
  return ds.options.type === 'postgres' ? postgresFingerprint(ds) : sqliteFingerprint(ds);
}

async function sqliteFingerprint(ds: DataSource): Promise<Fingerprint> {
  const tables = (await ds.query(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name`)) as Array<{ name: string }>;
  const out: Fingerprint = {};
  for (const { name } of tables) {
    const rows = (await ds.query(`SELECT * FROM "${name}" ORDER BY rowid`)) as unknown[];
    const hash = crypto.createHash('sha256');
    for (const row of rows) hash.update(JSON.stringify(row, (_k, v: unknown) => (Buffer.isBuffer(v) ? v.toString('base64') : v))).update('\n');
    out[name] = `${rows.length}:${hash.digest('hex').slice(0, 16)}`;
  }
  return out;
}

const quote = (id: string) => `"${id.replace(/"/g, '""')}"`;

// The schema does not change during a test, so the one query is built once per data source.
const postgresQueries = new WeakMap<DataSource, Promise<string>>();

function postgresQuery(ds: DataSource): Promise<string> {
  let q = postgresQueries.get(ds);
  if (!q) {
    q = (async () => {
      // Each table with its primary key's columns in key order (every Fieldfold table has one; a table without
      // one is ordered by its whole row text, which is as stable).
      const tables = (await ds.query(
        `SELECT c.relname AS name,
                COALESCE((SELECT array_agg(a.attname::text ORDER BY array_position(i.indkey, a.attnum))
                            FROM pg_index i JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = ANY (i.indkey)
                           WHERE i.indrelid = c.oid AND i.indisprimary), '{}') AS pk
           FROM pg_class c
          WHERE c.relnamespace = current_schema()::regnamespace AND c.relkind IN ('r', 'p')
          ORDER BY c.relname`,
      )) as Array<{ name: string; pk: string[] }>;
      if (tables.length === 0) throw new Error('dbFingerprint: the database has no tables');
      return tables
        .map(({ name, pk }) => {
          const order = pk.length ? pk.map((c) => `x.${quote(c)}`).join(', ') : 'x::text';
          return `SELECT '${name.replace(/'/g, "''")}' AS name, COUNT(*)::int AS n, md5(COALESCE(string_agg(x::text, E'\\n' ORDER BY ${order}), '')) AS h FROM ${quote(name)} AS x`;
        })
        .join('\nUNION ALL\n');
    })();
    postgresQueries.set(ds, q);
  }
  return q;
}

async function postgresFingerprint(ds: DataSource): Promise<Fingerprint> {
  const rows = (await ds.query(await postgresQuery(ds))) as Array<{ name: string; n: number; h: string }>;
  const out: Fingerprint = {};
  for (const r of rows) out[r.name] = `${r.n}:${r.h.slice(0, 16)}`;
  return out;
}

/** The tables whose rows differ between two fingerprints (empty when nothing changed). */
export function changedTables(before: Fingerprint, after: Fingerprint): string[] {
  return [...new Set([...Object.keys(before), ...Object.keys(after)])].filter((t) => before[t] !== after[t]);
}
