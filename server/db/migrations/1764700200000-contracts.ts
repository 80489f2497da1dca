import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

// A contract copies the agreed terms at award time (see lib/schemas/contract.ts). One per block and per
// bid: the unique keys are the last line of defence against a double award. No CHECK on status: later
// issues add statuses (signing, log, sign-off), and SQLite cannot alter a CHECK without rebuilding the table.
export class Contracts1764700200000 implements MigrationInterface {
  name = 'Contracts1764700200000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "contracts" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "block_id" varchar(36) NOT NULL UNIQUE REFERENCES "blocks"("id"),
      "bid_id" varchar(36) NOT NULL UNIQUE REFERENCES "bids"("id"),
      "grower_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "grazier_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "status" varchar(12) NOT NULL DEFAULT ('to-sign'),
      "basis" varchar(10) NOT NULL,
      "rate" varchar(20) NOT NULL,
      "head_count" integer NOT NULL,
      "species" varchar(10) NOT NULL,
      "animal_class" varchar(40) NOT NULL,
      "body_weight_lb" ${t.double} NOT NULL,
      "start_date" varchar(10) NOT NULL,
      "end_date" varchar(10) NOT NULL,
      "out_by" varchar(10) NOT NULL,
      "services" text NOT NULL DEFAULT ('[]'),
      "acres" ${t.double} NOT NULL,
      "lb_dm_per_acre" ${t.double} NOT NULL,
      "target_utilization_pct" ${t.double} NOT NULL,
      "time_zone" varchar(64) NOT NULL,
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      "updated_at" ${t.timestamp} NOT NULL DEFAULT (${t.now})
    )`);
    await q.query(`CREATE INDEX "idx_contracts_grower" ON "contracts" ("grower_id")`);
    await q.query(`CREATE INDEX "idx_contracts_grazier" ON "contracts" ("grazier_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "contracts"`);
  }
}
