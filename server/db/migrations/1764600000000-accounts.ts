import type { MigrationInterface, QueryRunner } from 'typeorm';

export class Accounts1764600000000 implements MigrationInterface {
  name = 'Accounts1764600000000';

  async up(q: QueryRunner): Promise<void> {
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
      "home_latitude" real,
      "home_longitude" real,
      "flock_species" varchar(20),
      "flock_class" varchar(40),
      "flock_head_count" integer,
      "flock_body_weight_lb" real,
      "created_at" datetime NOT NULL DEFAULT (datetime('now')),
      "updated_at" datetime NOT NULL DEFAULT (datetime('now'))
    )`);
    await q.query(`CREATE TABLE "sessions" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "account_id" varchar(36) NOT NULL REFERENCES "accounts"("id") ON DELETE CASCADE,
      "created_at" datetime NOT NULL DEFAULT (datetime('now')),
      "expires_at" datetime NOT NULL
    )`);
    await q.query(`CREATE INDEX "idx_sessions_account" ON "sessions" ("account_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "sessions"`);
    await q.query(`DROP TABLE "accounts"`);
  }
}
