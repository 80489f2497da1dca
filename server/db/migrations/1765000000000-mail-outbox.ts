import type { MigrationInterface, QueryRunner } from 'typeorm';

// The mail outbox: a use case writes the messages it owes in its own transaction; a sender delivers them
// after the commit and marks each sent. Times are epoch milliseconds (bigint) so SQLite and PostgreSQL
// compare them the same way.
export class MailOutbox1765000000000 implements MigrationInterface {
  name = 'MailOutbox1765000000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE "mail_outbox" (
      "id" varchar(36) PRIMARY KEY NOT NULL,
      "to_address" varchar(320) NOT NULL,
      "subject" varchar(400) NOT NULL,
      "text" text NOT NULL,
      "html" text,
      "status" varchar(8) NOT NULL DEFAULT ('pending'),
      "attempts" integer NOT NULL DEFAULT (0),
      "next_attempt_at" bigint NOT NULL,
      "claimed_until" bigint,
      "last_error" varchar(500),
      "created_at" bigint NOT NULL,
      "sent_at" bigint
    )`);
    await q.query(`CREATE INDEX "idx_mail_outbox_due" ON "mail_outbox" ("status", "next_attempt_at")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "mail_outbox"`);
  }
}
