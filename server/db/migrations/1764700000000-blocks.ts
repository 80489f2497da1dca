import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

// Blocks and their photos. Spray records are a JSON column: they are always read and written with their
// block, never queried on their own; the one figure that is queried (earliest safe date) has its own column.
export class Blocks1764700000000 implements MigrationInterface {
  name = 'Blocks1764700000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "blocks" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "owner_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "status" varchar(12) NOT NULL DEFAULT ('draft'),
      "name" varchar(120) NOT NULL,
      "crop" varchar(20) NOT NULL,
      "acres" ${t.double} NOT NULL,
      "place_name" varchar(120),
      "latitude" ${t.double} NOT NULL,
      "longitude" ${t.double} NOT NULL,
      "time_zone" varchar(64) NOT NULL,
      "forage_method" varchar(10) NOT NULL,
      "forage_samples" text,
      "forage_height" text,
      "lb_dm_per_acre" ${t.double} NOT NULL,
      "target_utilization_pct" ${t.double} NOT NULL,
      "residual_height_in" ${t.double},
      "window_start" varchar(10) NOT NULL,
      "window_end" varchar(10) NOT NULL,
      "out_by" varchar(10) NOT NULL,
      "harvest_date" varchar(10),
      "spray_records" text NOT NULL DEFAULT ('[]'),
      "earliest_safe_date" varchar(10),
      "water_on_site" boolean NOT NULL,
      "perimeter_fence" varchar(10) NOT NULL,
      "truck_access" boolean NOT NULL,
      "species_allowed" varchar(20) NOT NULL,
      "young_plantings" boolean NOT NULL,
      "notes" text,
      "published_at" ${t.timestamp},
      "awarded_at" ${t.timestamp},
      "withdrawn_at" ${t.timestamp},
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      "updated_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      CHECK ("status" IN ('draft', 'open', 'awarded', 'closed', 'withdrawn')),
      CHECK ("acres" > 0),
      CHECK ("lb_dm_per_acre" > 0)
    )`);
    await q.query(`CREATE INDEX "idx_blocks_owner" ON "blocks" ("owner_id")`);
    await q.query(`CREATE INDEX "idx_blocks_status" ON "blocks" ("status")`);
    await q.query(`CREATE TABLE "block_photos" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "block_id" varchar(36) NOT NULL REFERENCES "blocks"("id") ON DELETE CASCADE,
      "file_name" varchar(64) NOT NULL UNIQUE,
      "mime_type" varchar(20) NOT NULL,
      "size_bytes" integer NOT NULL,
      "position" integer NOT NULL,
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now})
    )`);
    await q.query(`CREATE INDEX "idx_block_photos_block" ON "block_photos" ("block_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "block_photos"`);
    await q.query(`DROP TABLE "blocks"`);
  }
}
