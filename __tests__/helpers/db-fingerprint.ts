import crypto from 'node:crypto';
import type { DataSource } from 'typeorm';

// What is stored, table by table: the row count and a SHA-256 over every row, so a test can say "this request
// changed nothing" and, when it did, name the table. SQLite only (the tests' database).

export type Fingerprint = Record<string, string>;

export async function dbFingerprint(ds: DataSource): Promise<Fingerprint> {
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

/** The tables whose rows differ between two fingerprints (empty when nothing changed). */
export function changedTables(before: Fingerprint, after: Fingerprint): string[] {
  return [...new Set([...Object.keys(before), ...Object.keys(after)])].filter((t) => before[t] !== after[t]);
}
