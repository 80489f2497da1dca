import type { MigrationInterface, QueryRunner } from 'typeorm';

// The head-days agreed at sign-off, which invoices bill. The sign-off work adds this column too; whichever
// migration runs first adds it and this one then leaves it alone, so the two can meet on main without a clash.
export class ContractAgreedHeadDays1765300000001 implements MigrationInterface {
  name = 'ContractAgreedHeadDays1765300000001';

  async up(q: QueryRunner): Promise<void> {
    const table = await q.getTable('contracts');
    if (table?.findColumnByName('agreed_head_days')) return;
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "agreed_head_days" real`);
  }

  async down(q: QueryRunner): Promise<void> {
    const table = await q.getTable('contracts');
    if (table?.findColumnByName('agreed_head_days')) await q.query(`ALTER TABLE "contracts" DROP COLUMN "agreed_head_days"`);
  }
}
