import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

export class Bids1764700100000 implements MigrationInterface {
  name = 'Bids1764700100000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "bids" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "block_id" varchar(36) NOT NULL REFERENCES "blocks"("id"),
      "grazier_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "status" varchar(12) NOT NULL DEFAULT ('live'),
      "basis" varchar(10) NOT NULL,
      "rate" varchar(20) NOT NULL,
      "head_count" integer NOT NULL,
      "species" varchar(10) NOT NULL,
      "animal_class" varchar(40) NOT NULL,
      "body_weight_lb" ${t.double} NOT NULL,
      "start_date" varchar(10) NOT NULL,
      "end_date" varchar(10) NOT NULL,
      "services" text NOT NULL DEFAULT ('[]'),
      "note" text,
      "decided_at" ${t.timestamp},
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      "updated_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      CHECK ("status" IN ('live', 'accepted', 'declined', 'withdrawn')),
      CHECK ("basis" IN ('head-day', 'acre', 'flat')),
      CHECK ("head_count" > 0),
      CHECK ("end_date" > "start_date")
    )`);
    await q.query(`CREATE INDEX "idx_bids_block" ON "bids" ("block_id")`);
    await q.query(`CREATE INDEX "idx_bids_grazier" ON "bids" ("grazier_id")`);
    // One live bid per grazier per block, held by the database as well as the service.
    await q.query(`CREATE UNIQUE INDEX "uq_bids_live_per_grazier" ON "bids" ("block_id", "grazier_id") WHERE "status" = 'live'`);
    // At most one accepted bid per block.
    await q.query(`CREATE UNIQUE INDEX "uq_bids_accepted_per_block" ON "bids" ("block_id") WHERE "status" = 'accepted'`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "bids"`);
  }
}
