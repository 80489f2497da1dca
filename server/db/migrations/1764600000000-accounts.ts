import type { MigrationInterface, QueryRunner } from 'typeorm';
import { sqlDialect } from '../sql-dialect';

export class Accounts1764600000000 implements MigrationInterface {
  name = 'Accounts1764600000000';

  async up(q: QueryRunner): Promise<void> {
    const t = sqlDialect(q);
    await q.query(`CREATE TABLE "accounts" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "email" varchar(254) NOT NULL UNIQUE,
      "password_hash" varchar(100) NOT NULL,
      "name" varchar(120) NOT NULL,
      "roles" varchar(60) NOT NULL,
      "active_role" varchar(20),
      "business_name" varchar(120),
      "phone" varchar(20),
      "home_place" varchar(120),
      "home_latitude" ${t.double},
      "home_longitude" ${t.double},
      "flock_species" varchar(20),
      "flock_class" varchar(40),
      "flock_head_count" integer,
      "flock_body_weight_lb" ${t.double},
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      "updated_at" ${t.timestamp} NOT NULL DEFAULT (${t.now})
    )`);
    await q.query(`CREATE TABLE "sessions" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "account_id" varchar(36) NOT NULL REFERENCES "accounts"("id") ON DELETE CASCADE,
      "created_at" ${t.timestamp} NOT NULL DEFAULT (${t.now}),
      "expires_at" ${t.timestamp} NOT NULL
    )`);
    await q.query(`CREATE INDEX "idx_sessions_account" ON "sessions" ("account_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "sessions"`);
    await q.query(`DROP TABLE "accounts"`);
  }
}
