import type { MigrationInterface, QueryRunner } from 'typeorm';

// Request counts for express-rate-limit (server/lib/http/rate-limit-store.ts), kept in the database so that every
// server process sharing it counts the same client's requests together. One row per limiter prefix and client key,
// for the current window: its hits and the epoch millisecond the window ends. Rows whose window has ended are
// swept now and then; nothing else refers to them.
export class RateLimitHits1766200000100 implements MigrationInterface {
  name = 'RateLimitHits1766200000100';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "rate_limit_hits" (
      "key" varchar(300) PRIMARY KEY NOT NULL,
      "hits" integer NOT NULL CHECK ("hits" >= 0),
      "reset_at" bigint NOT NULL
    )`);
    await q.query(`CREATE INDEX "idx_rate_limit_hits_reset" ON "rate_limit_hits" ("reset_at")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "rate_limit_hits"`);
  }
}
