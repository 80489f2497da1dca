import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

// Invoices (one per contract), each grazier's number counter, the payments API's events (each stored once) and
// growers' customer records in that API. Their PDFs are rows of the documents table (kind 'invoice'). The unique keys carry the promises: one invoice per contract, no two
// invoices of a grazier with one number, one row per API event and per API invoice.
export class Invoices1765300000000 implements MigrationInterface {
  name = 'Invoices1765300000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "invoices" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "grazier_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "grower_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "number" integer NOT NULL CHECK ("number" >= 1),
      "number_prefix" varchar(8) NOT NULL,
      "status" varchar(8) NOT NULL,
      "issue_date" varchar(10) NOT NULL,
      "due_date" varchar(10) NOT NULL,
      "payment_terms_days" integer NOT NULL,
      "currency" varchar(3) NOT NULL,
      "basis" varchar(10) NOT NULL,
      "rate" varchar(20) NOT NULL,
      "quantity" ${t.double} NOT NULL,
      "lines" text NOT NULL,
      "services" text NOT NULL,
      "subtotal_cents" integer NOT NULL CHECK ("subtotal_cents" >= 0),
      "total_cents" integer NOT NULL CHECK ("total_cents" >= 0),
      "provider_customer_id" varchar(255),
      "provider_invoice_id" varchar(255),
      "provider_status" varchar(16),
      "provider_number" varchar(64),
      "sync_attempts" integer NOT NULL DEFAULT (0),
      "sync_error" varchar(500),
      "sync_next_at" bigint,
      "paying_until" bigint,
      "pay_attempts" integer NOT NULL DEFAULT (0),
      "last_failure_code" varchar(64),
      "last_failure_decline_code" varchar(64),
      "last_failure_message" varchar(500),
      "last_failure_at" bigint,
      "paid_at" bigint,
      "paid_day" varchar(10),
      "paid_with" varchar(64),
      "voided_at" bigint,
      "pdf_shows" varchar(8),
      "created_at" bigint NOT NULL,
      "updated_at" bigint NOT NULL
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_invoices_contract" ON "invoices" ("contract_id")`);
    await q.query(`CREATE UNIQUE INDEX "uq_invoices_grazier_number" ON "invoices" ("grazier_id", "number")`);
    await q.query(`CREATE UNIQUE INDEX "uq_invoices_provider" ON "invoices" ("provider_invoice_id")`);
    await q.query(`CREATE INDEX "idx_invoices_grower" ON "invoices" ("grower_id")`);
    await q.query(`CREATE INDEX "idx_invoices_sync" ON "invoices" ("status", "sync_next_at")`);
    await q.query(`CREATE TABLE "invoice_counters" (
      "grazier_id" varchar(36) PRIMARY KEY NOT NULL REFERENCES "accounts"("id"),
      "last_number" integer NOT NULL CHECK ("last_number" >= 0)
    )`);
    await q.query(`CREATE TABLE "payment_events" (
      "id" varchar(255) PRIMARY KEY NOT NULL,
      "type" varchar(80) NOT NULL,
      "invoice_id" varchar(36),
      "outcome" varchar(16) NOT NULL,
      "received_at" bigint NOT NULL
    )`);
    await q.query(`CREATE TABLE "payment_customers" (
      "account_id" varchar(36) PRIMARY KEY NOT NULL REFERENCES "accounts"("id"),
      "provider_customer_id" varchar(255) NOT NULL,
      "created_at" bigint NOT NULL
    )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "payment_customers"`);
    await q.query(`DROP TABLE "payment_events"`);
    await q.query(`DROP TABLE "invoice_counters"`);
    await q.query(`DROP TABLE "invoices"`);
  }
}
