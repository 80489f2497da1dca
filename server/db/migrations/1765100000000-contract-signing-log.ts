import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

// Issue 8: the terms snapshot and its signatures, amendments, the grazing log and sign-off.
// The once-only rules live here as unique indexes so they hold with several server processes:
// one signature per (contract, terms version, party); one log entry per (contract, client id); one
// amendment per (contract, version) and at most one waiting; one sign-off round per (contract, round)
// and at most one open.
export class ContractSigningLog1765100000000 implements MigrationInterface {
  name = 'ContractSigningLog1765100000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    // The terms in force: their version, the snapshot (JSON, lib/contract-terms ContractTerms), the canonical
    // text the parties sign and its SHA-256. Rows made before this migration get their snapshot on first use.
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "terms_version" integer NOT NULL DEFAULT (1)`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "terms" text`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "terms_text" text`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "terms_hash" varchar(64)`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "agreed_head_days" ${t.double}`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "agreed_at" ${t.timestamp}`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "grazing_started_at" ${t.timestamp}`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "cancelled_at" ${t.timestamp}`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "cancelled_by" varchar(8)`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "cancel_reason" text`);
    // Bumped by every change of the contract row; the first statement of a use case on a contract, so it
    // also takes the row's write lock (PostgreSQL) before anything is read for a decision.
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "revision" integer NOT NULL DEFAULT (0)`);
    // The stored grazing-log PDF (documents table) that shows the record as it stands, and what it was made
    // from (terms version and agreed figure): when the key no longer matches, a new version is due.
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "log_document_id" varchar(36)`);
    await q.query(`ALTER TABLE "contracts" ADD COLUMN "log_document_key" varchar(120)`);
    await q.query(`CREATE INDEX "idx_contracts_grower_created" ON "contracts" ("grower_id", "created_at", "id")`);
    await q.query(`CREATE INDEX "idx_contracts_grazier_created" ON "contracts" ("grazier_id", "created_at", "id")`);

    await q.query(`CREATE TABLE "contract_signatures" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "terms_version" integer NOT NULL,
      "party" varchar(8) NOT NULL,
      "account_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "typed_name" varchar(120) NOT NULL,
      "cautions_acknowledged" boolean NOT NULL,
      "terms_hash" varchar(64) NOT NULL,
      "ip" varchar(64),
      "user_agent" varchar(400),
      "signed_at" ${t.timestamp} NOT NULL
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_signature_once" ON "contract_signatures" ("contract_id", "terms_version", "party")`);

    await q.query(`CREATE TABLE "contract_amendments" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "version" integer NOT NULL,
      "status" varchar(10) NOT NULL,
      "proposed_by" varchar(8) NOT NULL,
      "proposed_by_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "reason" text NOT NULL,
      "changes" text NOT NULL,
      "change_lines" text NOT NULL,
      "agreed_head_days" ${t.double},
      "terms" text NOT NULL,
      "terms_text" text NOT NULL,
      "terms_hash" varchar(64) NOT NULL,
      "created_at" ${t.timestamp} NOT NULL,
      "decided_at" ${t.timestamp}
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_amendment_version" ON "contract_amendments" ("contract_id", "version")`);
    await q.query(`CREATE UNIQUE INDEX "uq_amendment_one_waiting" ON "contract_amendments" ("contract_id") WHERE "status" = 'proposed'`);

    await q.query(`CREATE TABLE "contract_log_entries" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "client_id" varchar(64) NOT NULL,
      "kind" varchar(12) NOT NULL,
      "at" varchar(40) NOT NULL,
      "at_ms" bigint NOT NULL,
      "change" integer,
      "count" integer,
      "paddock" varchar(60),
      "residual_height_in" ${t.double},
      "taken_pct" ${t.double},
      "trampled_pct" ${t.double},
      "bare_ground_pct" ${t.double},
      "water_checked" boolean,
      "fence_checked" boolean,
      "losses" integer,
      "note" text,
      "author" varchar(8) NOT NULL,
      "author_id" varchar(36) NOT NULL REFERENCES "accounts"("id"),
      "flags" text NOT NULL DEFAULT ('[]'),
      "recorded_at" ${t.timestamp} NOT NULL,
      "voided_at" ${t.timestamp},
      "void_reason" text
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_log_entry_client" ON "contract_log_entries" ("contract_id", "client_id")`);
    await q.query(`CREATE INDEX "idx_log_entries_time" ON "contract_log_entries" ("contract_id", "at_ms", "id")`);
    await q.query(`CREATE INDEX "idx_log_entries_moves" ON "contract_log_entries" ("contract_id", "kind")`);

    await q.query(`CREATE TABLE "contract_log_photos" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "entry_id" varchar(36) NOT NULL REFERENCES "contract_log_entries"("id"),
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "file_name" varchar(60) NOT NULL,
      "mime_type" varchar(20) NOT NULL,
      "size_bytes" integer NOT NULL,
      "created_at" ${t.timestamp} NOT NULL
    )`);
    await q.query(`CREATE INDEX "idx_log_photos_entry" ON "contract_log_photos" ("entry_id")`);

    await q.query(`CREATE TABLE "contract_sign_offs" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "contract_id" varchar(36) NOT NULL REFERENCES "contracts"("id"),
      "round" integer NOT NULL,
      "status" varchar(10) NOT NULL,
      "proposed_head_days" ${t.double} NOT NULL,
      "by_day" text NOT NULL,
      "counted_until" varchar(40) NOT NULL,
      "comment" text,
      "grazier_name" varchar(120) NOT NULL,
      "proposed_at" ${t.timestamp} NOT NULL,
      "counter_head_days" ${t.double},
      "dispute_comment" text,
      "disputed_at" ${t.timestamp},
      "grower_name" varchar(120),
      "agreed_head_days" ${t.double},
      "agreed_at" ${t.timestamp},
      "agreed_by" varchar(8)
    )`);
    await q.query(`CREATE UNIQUE INDEX "uq_sign_off_round" ON "contract_sign_offs" ("contract_id", "round")`);
    await q.query(`CREATE UNIQUE INDEX "uq_sign_off_one_open" ON "contract_sign_offs" ("contract_id") WHERE "status" IN ('proposed', 'disputed')`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "contract_sign_offs"`);
    await q.query(`DROP TABLE "contract_log_photos"`);
    await q.query(`DROP TABLE "contract_log_entries"`);
    await q.query(`DROP TABLE "contract_amendments"`);
    await q.query(`DROP TABLE "contract_signatures"`);
    await q.query(`DROP INDEX "idx_contracts_grazier_created"`);
    await q.query(`DROP INDEX "idx_contracts_grower_created"`);
    for (const c of ['log_document_key', 'log_document_id', 'revision', 'cancel_reason', 'cancelled_by', 'cancelled_at', 'grazing_started_at', 'agreed_at', 'agreed_head_days', 'terms_hash', 'terms_text', 'terms', 'terms_version']) {
      await q.query(`ALTER TABLE "contracts" DROP COLUMN "${c}"`);
    }
  }
}
