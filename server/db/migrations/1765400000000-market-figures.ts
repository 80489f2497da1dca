import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';
import { allowableForage } from '../../../lib/grazing/capacity';
import { grazeSpan } from '../../../lib/grazing/graze-window';
import type { SprayRecord } from '../../../lib/grazing/safety';

// The market filters and sorts in SQL, so the figures it filters on are stored with the block (the service
// writes lib's results on every save; existing rows are filled here with the same functions) and indexed:
//   graze_from / graze_until  the days animals may be on (lib/grazing/graze-window grazeSpan)
//   allowable_lb              acres × lb DM/ac × utilisation (lib/grazing/capacity allowableForage): days of
//                             feed for a flock = allowable ÷ (head × intake), an expression on an indexed column

/** Every column a market filter tests (besides status). */
const FILTERED = ['graze_until', 'owner_id', 'time_zone', 'graze_from', 'acres', 'allowable_lb', 'species_allowed', 'latitude', 'longitude'];

/**
 * The market's indexes: status, then the column one sort walks or one filter ranges over, then every other
 * filtered column — so the count and the page's keys are read from the index alone, whichever SQLite picks.
 */
const MARKET_INDEXES: Record<string, string[]> = {
  until: ['graze_until'],
  place: ['latitude', 'longitude'],
  from: ['graze_from'],
  acres: ['acres'],
  allowable: ['allowable_lb'],
  created: ['created_at'],
};

function marketIndex(name: string): string {
  const lead = MARKET_INDEXES[name];
  const columns = ['status', ...lead, ...FILTERED.filter((c) => !lead.includes(c))].map((c) => `"${c}"`);
  return `CREATE INDEX "idx_blocks_market_${name}" ON "blocks" (${columns.join(', ')})`;
}

export class MarketFigures1765400000000 implements MigrationInterface {
  name = 'MarketFigures1765400000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    // SQLite adds a NOT NULL column only with a default; every row is filled below before anything reads it.
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "graze_from" varchar(10) NOT NULL DEFAULT ('')`);
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "graze_until" varchar(10) NOT NULL DEFAULT ('')`);
    await q.query(`ALTER TABLE "blocks" ADD COLUMN "allowable_lb" ${t.double} NOT NULL DEFAULT (0)`);
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
      await q.query(`UPDATE "blocks" SET "graze_from" = ${t.param(1)}, "graze_until" = ${t.param(2)}, "allowable_lb" = ${t.param(3)} WHERE "id" = ${t.param(4)}`, [span.from, span.until, allowableLb, r.id]);
    }

    await q.query(`DROP INDEX "idx_blocks_status"`);
    await q.query(`DROP INDEX "idx_blocks_owner"`);
    for (const name of Object.keys(MARKET_INDEXES)) await q.query(marketIndex(name));
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
    for (const name of Object.keys(MARKET_INDEXES)) await q.query(`DROP INDEX "idx_blocks_market_${name}"`);
    await q.query(`DROP INDEX "idx_blocks_owner_created"`);
    await q.query(`CREATE INDEX "idx_blocks_owner" ON "blocks" ("owner_id")`);
    await q.query(`CREATE INDEX "idx_blocks_status" ON "blocks" ("status")`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "allowable_lb"`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "graze_until"`);
    await q.query(`ALTER TABLE "blocks" DROP COLUMN "graze_from"`);
  }
}
