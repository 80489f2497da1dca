import type { MigrationInterface, QueryRunner } from 'typeorm';

// Password-reset requests: only the SHA-256 of each mailed token is kept (the token itself is in the mail, and
// in the outbox row until it is sent), each usable once before it expires. Times are epoch ms (bigint).
export class PasswordResets1766000000000 implements MigrationInterface {
  name = 'PasswordResets1766000000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "password_resets" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "account_id" varchar(36) NOT NULL REFERENCES "accounts"("id") ON DELETE CASCADE,
      "token_hash" varchar(64) NOT NULL UNIQUE,
      "expires_at" bigint NOT NULL,
      "used_at" bigint,
      "created_at" bigint NOT NULL
    )`);
    await q.query(`CREATE INDEX "idx_password_resets_account" ON "password_resets" ("account_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "password_resets"`);
  }
}
