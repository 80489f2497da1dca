import type { MigrationInterface, QueryRunner } from 'typeorm';

// "Nearest first" reads every open block in a disk round the grazier's home (often a hundred or more) for their
// ids and places. With the id at the end of the place index that read comes from the index alone; before, each
// row cost a look-up in the table. The other columns stay as 1765400000000 made them.
const COLUMNS = ['status', 'latitude', 'longitude', 'graze_until', 'owner_id', 'time_zone', 'graze_from', 'acres', 'allowable_lb', 'species_allowed'];
const create = (columns: string[]) => `CREATE INDEX "idx_blocks_market_place" ON "blocks" (${columns.map((c) => `"${c}"`).join(', ')})`;

export class MarketPlaceIndex1766400000000 implements MigrationInterface {
  name = 'MarketPlaceIndex1766400000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "idx_blocks_market_place"`);
    await q.query(create([...COLUMNS, 'id']));
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "idx_blocks_market_place"`);
    await q.query(create(COLUMNS));
  }
}
