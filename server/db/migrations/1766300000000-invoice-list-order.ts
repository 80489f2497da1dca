import type { MigrationInterface, QueryRunner } from 'typeorm';

// GET /api/invoices is cut by keyset in list order (due date, number, id) for one side: the grazier's
// receivables or the grower's payables. These indexes walk that order from the cursor, so a page reads its
// rows and no more; the grower's one replaces the plain grower index it starts with.
export class InvoiceListOrder1766300000000 implements MigrationInterface {
  name = 'InvoiceListOrder1766300000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX "idx_invoices_grazier_due" ON "invoices" ("grazier_id", "due_date", "number", "id")`);
    await q.query(`CREATE INDEX "idx_invoices_grower_due" ON "invoices" ("grower_id", "due_date", "number", "id")`);
    await q.query(`DROP INDEX "idx_invoices_grower"`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`CREATE INDEX "idx_invoices_grower" ON "invoices" ("grower_id")`);
    await q.query(`DROP INDEX "idx_invoices_grower_due"`);
    await q.query(`DROP INDEX "idx_invoices_grazier_due"`);
  }
}
