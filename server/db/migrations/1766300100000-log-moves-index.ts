import type { MigrationInterface, QueryRunner } from 'typeorm';

// Every log request and every entry posted reads the contract's moves in time order (the running figures and
// the head-count check). This partial index holds just the moves that count (not voided), in that order, with
// the columns the read takes: a few rows a day read straight from the index, never the day's observations.
export class LogMovesIndex1766300100000 implements MigrationInterface {
  name = 'LogMovesIndex1766300100000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(
      `CREATE INDEX "idx_log_moves" ON "contract_log_entries" ("contract_id", "at_ms", "recorded_at", "id", "at", "change") WHERE "kind" = 'move' AND "voided_at" IS NULL`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "idx_log_moves"`);
  }
}
