import type { DataSource } from 'typeorm';
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import { inTransaction } from '../db/transaction';

// An express-rate-limit store in Fieldfold's own database (table rate_limit_hits), so that with several server
// processes (SERVER_PROCESSES, or N processes behind a load balancer) a client's requests are counted together
// whichever process answers them; express-rate-limit's default MemoryStore would give each process its own count
// and let a client through N times as often. Pass one store per limiter, each with its own prefix:
//
//   rateLimit({ windowMs: 15 * 60_000, limit: 10, store: new DatabaseRateLimitStore(ds, { prefix: 'sign-in:' }) })
//
// Each hit is one statement, an upsert that starts a new window when the old one has ended and otherwise adds one,
// returning the count: atomic on both engines, so two processes counting at once never lose a hit.

export interface DatabaseRateLimitStoreOptions {
  /** Put before every key, so limiters sharing the table keep apart (express-rate-limit checks stores are not shared). */
  prefix?: string;
  /** Clock in epoch ms (tests move it). */
  now?: () => number;
  /** Expired rows are swept after this many hits of this store. */
  sweepEvery?: number;
}

export class DatabaseRateLimitStore implements Store {
  /** Counts are shared with every process on the database. */
  readonly localKeys = false;
  readonly prefix: string;
  private windowMs = 60_000;
  private readonly now: () => number;
  private readonly sweepEvery: number;
  private hitsSinceSweep = 0;

  constructor(
    private readonly ds: DataSource,
    options: DatabaseRateLimitStoreOptions = {},
  ) {
    this.prefix = options.prefix ?? 'rl:';
    this.now = options.now ?? Date.now;
    this.sweepEvery = options.sweepEvery ?? 1000;
  }

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows = await this.run<{ hits: number | string; reset_at: number | string }>(
      'SELECT "hits", "reset_at" FROM "rate_limit_hits" WHERE "key" = :key AND "reset_at" > :now',
      { key: this.prefix + key, now: this.now() },
    );
    return rows[0] ? info(rows[0]) : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const now = this.now();
    const rows = await this.run<{ hits: number | string; reset_at: number | string }>(
      `INSERT INTO "rate_limit_hits" ("key", "hits", "reset_at") VALUES (:key, 1, :resetAt)
       ON CONFLICT ("key") DO UPDATE SET
         "hits" = CASE WHEN "rate_limit_hits"."reset_at" <= :now THEN 1 ELSE "rate_limit_hits"."hits" + 1 END,
         "reset_at" = CASE WHEN "rate_limit_hits"."reset_at" <= :now THEN :resetAt ELSE "rate_limit_hits"."reset_at" END
       RETURNING "hits", "reset_at"`,
      { key: this.prefix + key, now, resetAt: now + this.windowMs },
    );
    if (++this.hitsSinceSweep >= this.sweepEvery) {
      this.hitsSinceSweep = 0;
      await this.sweep();
    }
    return info(rows[0]);
  }

  async decrement(key: string): Promise<void> {
    await this.run('UPDATE "rate_limit_hits" SET "hits" = "hits" - 1 WHERE "key" = :key AND "hits" > 0 AND "reset_at" > :now', { key: this.prefix + key, now: this.now() });
  }

  async resetKey(key: string): Promise<void> {
    await this.run('DELETE FROM "rate_limit_hits" WHERE "key" = :key', { key: this.prefix + key });
  }

  /** Forgets every count of this store's prefix (not other limiters'). */
  async resetAll(): Promise<void> {
    await this.run(`DELETE FROM "rate_limit_hits" WHERE substr("key", 1, ${this.prefix.length}) = :prefix`, { prefix: this.prefix });
  }

  /** Deletes rows whose window has ended (any prefix: an ended window counts for nobody). */
  async sweep(): Promise<void> {
    await this.run('DELETE FROM "rate_limit_hits" WHERE "reset_at" <= :now', { now: this.now() });
  }

  /**
   * One statement with `:name` parameters in the engine's own placeholders. On SQLite it takes its turn in the
   * process's write queue (server/lib/db/transaction.ts); on PostgreSQL it runs on its own (autocommit).
   */
  private run<T>(sql: string, params: Record<string, unknown>): Promise<T[]> {
    const [text, values] = this.ds.driver.escapeQueryWithParameters(sql, params);
    if (this.ds.options.type === 'postgres') return this.ds.query(text, values);
    return inTransaction(this.ds, (tx) => tx.query(text, values));
  }
}

function info(row: { hits: number | string; reset_at: number | string }): ClientRateLimitInfo {
  // PostgreSQL returns bigint as a string.
  return { totalHits: Number(row.hits), resetTime: new Date(Number(row.reset_at)) };
}
