import type { MigrationInterface, QueryRunner } from 'typeorm';
import { allowableForage } from '../../../lib/grazing/capacity';
import { grazeSpan } from '../../../lib/grazing/graze-window';
import type { SprayRecord } from '../../../lib/grazing/safety';

// The market filters and sorts in SQL, so the figures it filters on are stored with the block (the service
// writes lib's results on every save; existing rows are filled here with the same functions) and indexed:
//   graze_from / graze_until  the days animals may be on (lib/grazing/graze-window grazeSpan)
//   allowable_lb              acres × lb DM/ac × utilisation (lib/grazing/capacity allowableForage): days of
//                             feed for a flock = allowable ÷ (head × intake), an expression on an indexed column
// Each market index leads with status, then the column one sort walks in order or one filter ranges over.
/** The columns a market filter tests besides status, the last day and the place. */
const FILTERED = '"owner_id", "time_zone", "graze_from", "acres", "allowable_lb", "species_allowed"';

export class MarketFigures1765400000000 implements MigrationInterface {
  name = 'MarketFigures1765400000000';

  async up(q: QueryRunner): Promise<void> {
    // SQLite adds a NOT NULL column only with a default; every row is filled below before anything reads it.
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "graze_from" varchar(10) NOT NULL DEFAULT ('')`);
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "graze_until" varchar(10) NOT NULL DEFAULT ('')`);
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "allowable_lb" real NOT NULL DEFAULT (0)`);
    const rows: Array<Record<string, string | number>> = await q.query(
      `SELECT "id", "window_start", "window_end", "out_by", "spray_records", "acres", "lb_dm_per_acre", "target_utilization_pct" FROM "blocks"`,
    );
    for (const r of rows) {
      const span = grazeSpan({
        windowStart: String(r.window_start),
        windowEnd: String(r.window_end),
        outBy: String(r.out_by),
        sprayRecords: JSON.parse(String(r.spray_records)) as SprayRecord[],
        speciesAllowed: [],
      });
      const { allowableLb } = allowableForage({ acres: Number(r.acres), lbDmPerAcre: Number(r.lb_dm_per_acre), utilizationPct: Number(r.target_utilization_pct) });
      await q.query(`UPDATE "blocks" SET "graze_from" = ?, "graze_until" = ?, "allowable_lb" = ? WHERE "id" = ?`, [span.from, span.until, allowableLb, r.id]);
    }

    await q.query(`DROP INDEX "idx_blocks_status"`);
    await q.query(`DROP INDEX "idx_blocks_owner"`);
    // Counting the market reads one of these two alone (no row lookups): every column a market filter tests
    // is in both. The first leads with the last day (every market query ranges over it), the second with the
    // place (a distance filter ranges over latitude first).
    await q.query(`CREATE INDEX "idx_blocks_market_until" ON "blocks" ("status", "graze_until", ${FILTERED}, "latitude", "longitude")`);
    await q.query(`CREATE INDEX "idx_blocks_market_place" ON "blocks" ("status", "latitude", "longitude", "graze_until", ${FILTERED})`);
    await q.query(`CREATE INDEX "idx_blocks_market_from" ON "blocks" ("status", "graze_from")`);
    await q.query(`CREATE INDEX "idx_blocks_market_acres" ON "blocks" ("status", "acres")`);
    await q.query(`CREATE INDEX "idx_blocks_market_allowable" ON "blocks" ("status", "allowable_lb")`);
    await q.query(`CREATE INDEX "idx_blocks_market_created" ON "blocks" ("status", "created_at")`);
    await q.query(`CREATE INDEX "idx_blocks_owner_created" ON "blocks" ("owner_id", "created_at")`);

    // A block's bids and a grazier's bids, in the order they are listed.
    await q.query(`DROP INDEX "idx_bids_block"`);
    await q.query(`DROP INDEX "idx_bids_grazier"`);
    await q.query(`CREATE INDEX "idx_bids_block_created" ON "bids" ("block_id", "created_at", "id")`);
    await q.query(`CREATE INDEX "idx_bids_grazier_created" ON "bids" ("grazier_id", "created_at", "id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "idx_bids_grazier_created"`);
    await q.query(`DROP INDEX "idx_bids_block_created"`);
    await q.query(`CREATE INDEX "idx_bids_block" ON "bids" ("block_id")`);
    await q.query(`CREATE INDEX "idx_bids_grazier" ON "bids" ("grazier_id")`);
    for (const name of ['until', 'from', 'acres', 'allowable', 'created', 'place']) await q.query(`DROP INDEX "idx_blocks_market_${name}"`);
    await q.query(`DROP INDEX "idx_blocks_owner_created"`);
    await q.query(`CREATE INDEX "idx_blocks_owner" ON "blocks" ("owner_id")`);
    await q.query(`CREATE INDEX "idx_blocks_status" ON "blocks" ("status")`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "allowable_lb"`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "graze_until"`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "graze_from"`);
  }
}
