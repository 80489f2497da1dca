import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { distanceMiles } from '../../lib/geo';
import { freshTestDatabase, onPostgres, type TestDatabase } from '../helpers/test-database';

// The migrations are written once for both engines (server/db/sql-dialect.ts names the few words that differ).
// This compares what they build: every table, its columns with their kind of value and nullability, and every
// unique index (the once-only promises) with its columns and whether it is partial. It runs in npm test's
// PostgreSQL pass, where a PostgreSQL database exists to compare the SQLite one with.

interface Schema {
  columns: string[];
  uniques: string[];
}

/** The kind of value a declared type holds, in words both engines share. */
function kind(type: string): string {
  const t = type.toLowerCase();
  if (/^(varchar|character varying|text)/.test(t)) return 'text';
  if (/^(integer|bigint|int)/.test(t)) return t.startsWith('bigint') ? 'bigint' : 'integer';
  if (/^(real|double)/.test(t)) return 'float';
  if (/^(datetime|timestamp)/.test(t)) return 'timestamp';
  if (/^bool/.test(t)) return 'boolean';
  return t;
}

async function sqliteSchema(ds: DataSource): Promise<Schema> {
  const tables: Array<{ name: string }> = await ds.query(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name`);
  const columns: string[] = [];
  const uniques: string[] = [];
  for (const { name } of tables) {
    const info: Array<{ name: string; type: string; notnull: number; pk: number }> = await ds.query(`PRAGMA table_info("${name}")`);
    for (const c of info) columns.push(`${name}.${c.name} ${kind(c.type)} ${c.notnull || c.pk ? 'not null' : 'null'}`);
    const indexes: Array<{ name: string; unique: number; partial: number }> = await ds.query(`PRAGMA index_list("${name}")`);
    for (const ix of indexes.filter((i) => i.unique)) {
      const cols: Array<{ name: string }> = await ds.query(`PRAGMA index_info("${ix.name}")`);
      uniques.push(`${name} (${cols.map((c) => c.name).join(', ')})${ix.partial ? ' partial' : ''}`);
    }
  }
  return { columns: columns.sort(), uniques: uniques.sort() };
}

async function postgresSchema(ds: DataSource): Promise<Schema> {
  const cols: Array<{ table_name: string; column_name: string; data_type: string; is_nullable: string }> = await ds.query(
    `SELECT table_name, column_name, data_type, is_nullable FROM information_schema.columns WHERE table_schema = 'public'`,
  );
  const ix: Array<{ table_name: string; columns: string; partial: boolean }> = await ds.query(
    `SELECT t.relname AS table_name,
            (SELECT string_agg(a.attname, ', ' ORDER BY k.ord) FROM unnest(i.indkey) WITH ORDINALITY AS k(attnum, ord)
               JOIN pg_attribute a ON a.attrelid = t.oid AND a.attnum = k.attnum) AS columns,
            i.indpred IS NOT NULL AS partial
       FROM pg_index i JOIN pg_class t ON t.oid = i.indrelid JOIN pg_namespace n ON n.oid = t.relnamespace
      WHERE n.nspname = 'public' AND i.indisunique`,
  );
  return {
    columns: cols.map((c) => `${c.table_name}.${c.column_name} ${kind(c.data_type)} ${c.is_nullable === 'NO' ? 'not null' : 'null'}`).sort(),
    // TypeORM's own migrations table is an integer rowid on SQLite (no index) and a serial key here: not ours to compare.
    uniques: ix.filter((i) => i.table_name !== 'migrations').map((i) => `${i.table_name} (${i.columns})${i.partial ? ' partial' : ''}`).sort(),
  };
}

(onPostgres ? describe : describe.skip)('the migrations on SQLite and on PostgreSQL', () => {
  let sqlite: DataSource;
  let pg: DataSource;
  let pgDb: TestDatabase;

  beforeAll(async () => {
    sqlite = await openDatabase(':memory:');
    pgDb = await freshTestDatabase();
    pg = await openDatabase(pgDb.target);
  });

  afterAll(async () => {
    await sqlite?.destroy();
    await pg?.destroy();
    await pgDb?.drop();
  });

  it('When both engines have run every migration, then they hold the same tables and columns, each of the same kind and nullability', async () => {
    const [a, b] = await Promise.all([sqliteSchema(sqlite), postgresSchema(pg)]);
    expect(b.columns).toEqual(a.columns);
    // The tables the once-only promises live on are there (a sanity check that the lists are not both empty).
    expect(a.columns).toContain('contract_log_entries.client_id text not null');
    expect(a.columns).toContain('contracts.created_at timestamp not null');
  });

  it('When both engines have run every migration, then every unique index — whole or partial — is on the same columns', async () => {
    const [a, b] = await Promise.all([sqliteSchema(sqlite), postgresSchema(pg)]);
    expect(b.uniques).toEqual(a.uniques);
    expect(a.uniques).toEqual(expect.arrayContaining(['bids (block_id) partial', 'contract_log_entries (contract_id, client_id)', 'payment_events (id)', 'invoices (contract_id)']));
  });
});

(onPostgres ? describe : describe.skip)('the market\'s distance function on PostgreSQL', () => {
  let db: TestDatabase;
  let ds: DataSource;
  beforeAll(async () => {
    db = await freshTestDatabase();
    ds = await openDatabase(db.target);
  });
  afterAll(async () => {
    await ds?.destroy();
    await db?.drop();
  });

  it('When it measures thousands of pairs of points (near, far, antipodal, across the antimeridian), then it gives lib/geo distanceMiles to within a few units in the last place', async () => {
    // A fixed pseudo-random walk, so a failure names the same points every run.
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const pairs: Array<[number, number, number, number]> = [];
    for (let i = 0; i < 2000; i++) {
      const lat = rnd() * 180 - 90;
      const lng = rnd() * 360 - 180;
      const near = i % 2 === 0;
      const lat2 = near ? Math.max(-90, Math.min(90, lat + (rnd() - 0.5) * 2)) : rnd() * 180 - 90;
      const lng2 = near ? ((lng + (rnd() - 0.5) * 2 + 540) % 360) - 180 : rnd() * 360 - 180;
      pairs.push([lat, lng, lat2, lng2]);
    }
    pairs.push([0, 0, 0, 180], [90, 0, -90, 0], [39.712, -121.934, 39.712, -121.934], [10, 179.9, 10, -179.9]);
    const got: number[] = [];
    for (let i = 0; i < pairs.length; i += 500) {
      const chunk = pairs.slice(i, i + 500);
      const values = chunk.map((_, j) => `($${4 * j + 1}::float8, $${4 * j + 2}::float8, $${4 * j + 3}::float8, $${4 * j + 4}::float8, ${j})`).join(', ');
      const res: Array<{ d: number }> = await ds.query(`SELECT ff_distance_miles(a, b, c, d) AS d FROM (VALUES ${values}) AS v(a, b, c, d, n) ORDER BY n`, chunk.flat());
      got.push(...res.map((r) => r.d));
    }
    // sin and cos are the C library's here and V8's own in lib: they differ in the last bit now and then, so the
    // two distances may be a few ulps apart (a relative 1e-13 is about 450 ulps of slack; none come near it).
    const apart = pairs.map((p, i) => {
      const js = distanceMiles({ latitude: p[0], longitude: p[1] }, { latitude: p[2], longitude: p[3] });
      return js === 0 ? got[i] : Math.abs(got[i] - js) / js;
    });
    expect(Math.max(...apart)).toBeLessThan(1e-13);
    expect(apart.filter((x) => x === 0).length).toBeGreaterThan(pairs.length / 2);
  });
});
