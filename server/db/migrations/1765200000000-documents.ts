import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

// Generated PDF records (grazing logs, invoices), one row per stored version. The partial unique indexes
// are what makes "next version" safe with several server processes: two stores that pick the same number
// collide here and the loser retries. invoice_id has no foreign key: the invoices table belongs to the
// invoices module, and SQLite cannot add a foreign key to an existing table later.
export class Documents1765200000000 implements MigrationInterface {
  name = 'Documents1765200000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "documents" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "kind" varchar(20) NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "invoice_id" varchar(36),
      "version" integer NOT NULL CHECK ("version" >= 1),
      "sha256" varchar(64) NOT NULL,
      "size_bytes" integer NOT NULL,
      "content_type" varchar(100) NOT NULL,
      "storage_key" varchar(200) NOT NULL UNIQUE,
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now})
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_documents_log_version" ON "documents" ("kind", "contract_id", "version") WHERE "kind" = 'grazing-log'`);
    await q.query(`CREATE UNIQUE INDEX "uq_documents_invoice_version" ON "documents" ("kind", "invoice_id", "version") WHERE "kind" = 'invoice'`);
    await q.query(`CREATE INDEX "idx_documents_contract" ON "documents" ("contract_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "documents"`);
  }
}
