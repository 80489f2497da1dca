import type { QueryRunner } from 'typeorm';

// The few words in which Fieldfold's migrations differ between SQLite and PostgreSQL; everything else in them
// (varchar, text, integer, bigint, boolean, CHECK, partial unique indexes, REFERENCES) is written once and means
// the same on both. On SQLite each word is exactly what the migrations said before PostgreSQL was supported, so an
// existing SQLite database and a new one have the same schema.

export interface SqlDialect {
  postgres: boolean;
  /**
   * A point in time (entities: `type: Date`). SQLite keeps TypeORM's UTC text; PostgreSQL a timestamptz to the
   * millisecond, the precision of a JS Date, so a time read back compares equal to the stored one.
   */
  timestamp: string;
  /** A float: SQLite's REAL is 8 bytes, PostgreSQL's real only 4, so double precision there. */
  double: string;
  /** The current time, as a column default. */
  now: string;
  /** The i-th (1-based) positional parameter of a raw query. */
  param(i: number): string;
}

const SQLITE: SqlDialect = { postgres: false, timestamp: 'datetime', double: 'real', now: "datetime('now')", param: () => '?' };
const POSTGRES: SqlDialect = { postgres: true, timestamp: 'timestamptz(3)', double: 'double precision', now: 'now()', param: (i) => `$${i}` };

export function sqlDialect(q: QueryRunner): SqlDialect {
  return q.connection.options.type === 'postgres' ? POSTGRES : SQLITE;
}
