import crypto from 'node:crypto';
import { In, type DataSource, type EntityManager } from 'typeorm';
import { inTransaction } from '../db/transaction';
import type { MailMessage, MailPort } from './mail-port';
import { OutboxMessage } from './outbox.entity';

// The durable mail outbox (STYLE.md principle 13). A use case calls `queueMail(tx, …)` inside its own write
// transaction, so the message exists exactly when the state change it reports was committed. After the
// commit the use case calls `outbox.kick()`; the sender (also on a timer, for retries and for messages
// another process queued) claims due rows one at a time (claimNext: a lease set by a conditional UPDATE, so several
// processes never send one row at once) — hands each to the mail adapter, and marks it sent.
//
// Delivery is at least once: if the process dies after the SMTP server accepted a message and before the
// row was marked sent, the lease runs out and the message goes again. The alternative (mark first, send
// after) loses the message on that crash; a duplicate notice is the lesser harm, and both copies carry the
// same Message-ID (the row id) so a mail client can fold them.

/** Retry delays after the 1st, 2nd, … failure; the last one repeats. A mail server that is down delays mail, never loses it. */
export const OUTBOX_BACKOFF_MS = [5_000, 30_000, 2 * 60_000, 10 * 60_000, 30 * 60_000];
/** How long a sender owns a claimed row before another may take it (must exceed the SMTP timeouts). */
export const OUTBOX_LEASE_MS = 60_000;

export async function queueMail(tx: EntityManager, messages: MailMessage[], now: number): Promise<void> {
  for (const m of messages) {
    await tx.insert(OutboxMessage, {
      id: crypto.randomUUID(),
      to: m.to,
      subject: m.subject,
      text: m.text,
      html: m.html ?? null,
      status: 'pending',
      attempts: 0,
      nextAttemptAt: now,
      claimedUntil: null,
      lastError: null,
      createdAt: now,
      sentAt: null,
    });
  }
}

export interface MailOutbox {
  /** Ask the sender to look for due messages now (after a commit); never waits for delivery. */
  kick(): void;
}

export class OutboxSender implements MailOutbox {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<number> | null = null;
  private again = false;

  constructor(
    private readonly ds: DataSource,
    private readonly mail: MailPort,
    private readonly now: () => number,
    private readonly log: (msg: string) => void = () => {},
    private readonly batch = 20,
  ) {}

  kick(): void {
    void this.drain();
  }

  /** Sends every message due now; resolves with how many were sent. Overlapping calls share one run. */
  drain(): Promise<number> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    this.running = (async () => {
      let sent = 0;
      try {
        do {
          this.again = false;
          sent += await this.sendDue();
        } while (this.again);
      } catch (err) {
        this.log(`[mail] outbox run failed: ${err instanceof Error ? err.message : String(err)}`);
      } finally {
        this.running = null;
      }
      return sent;
    })();
    return this.running;
  }

  /** Polls for due messages every `intervalMs` (retries, and mail queued by other processes). */
  start(intervalMs = 2_000): void {
    if (this.timer) return;
    this.timer = setInterval(() => this.kick(), intervalMs);
    this.timer.unref();
    this.kick();
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }

  private async sendDue(): Promise<number> {
    const now = this.now();
    let sent = 0;
    for (let n = 0; n < this.batch; n++) {
      const row = await this.claimNext(now);
      if (row === null) break;
      if (row === 'lost') continue;
      try {
        await this.mail.send({ id: row.id, to: row.to, subject: row.subject, text: row.text, html: row.html ?? undefined });
      } catch (err) {
        await this.failed(row, err);
        continue;
      }
      // Only while the lease is still ours (`claimedUntil` is the one this sender set): a sender whose send outlived
      // its lease has been overtaken by another, and its late answer must not touch that one's claim.
      // The body goes once it is sent: the outbox is a queue, not an archive, and some bodies carry a secret
      // (a password-reset link) that must not outlive its sending in the database. To, subject and time stay.
      await inTransaction(this.ds, (tx) =>
        tx.update(OutboxMessage, { id: row.id, claimedUntil: row.claimedUntil! }, { status: 'sent', sentAt: this.now(), claimedUntil: null, lastError: null, text: '', html: null }),
      );
      sent += 1;
    }
    return sent;
  }

  /**
   * Takes the next due message for this sender: null when none is due, 'lost' when another sender took it first.
   * The claim is a lease (claimed_until) set by a conditional UPDATE, because the send runs after the commit and
   * may outlive a connection: only one sender, of any process, wins a row until its lease runs out, and one that
   * died releases it by time. On PostgreSQL the row is first picked with FOR UPDATE SKIP LOCKED, so senders in
   * several processes take different rows at once instead of queueing on the same one; on SQLite (one writer at a
   * time) the conditional UPDATE alone decides.
   */
  private async claimNext(now: number): Promise<OutboxMessage | 'lost' | null> {
    const lease = now + OUTBOX_LEASE_MS;
    return inTransaction(this.ds, async (tx) => {
      const pick = tx
        .createQueryBuilder(OutboxMessage, 'm')
        .where('m.status = :pending AND m.next_attempt_at <= :now', { pending: 'pending', now })
        .andWhere('(m.claimed_until IS NULL OR m.claimed_until <= :now)', { now })
        .orderBy('m.next_attempt_at', 'ASC')
        .addOrderBy('m.created_at', 'ASC')
        .limit(1);
      if (tx.connection.options.type === 'postgres') pick.setLock('pessimistic_write').setOnLocked('skip_locked');
      const row = await pick.getOne();
      if (!row) return null;
      const res = await tx
        .createQueryBuilder()
        .update(OutboxMessage)
        .set({ claimedUntil: lease, attempts: () => 'attempts + 1' })
        .where('id = :id AND status = :pending', { id: row.id, pending: 'pending' })
        .andWhere('(claimed_until IS NULL OR claimed_until <= :now)', { now })
        .execute();
      if (res.affected !== 1) return 'lost';
      row.attempts += 1;
      row.claimedUntil = lease;
      return row;
    });
  }

  private async failed(row: OutboxMessage, err: unknown): Promise<void> {
    const reason = (err instanceof Error ? err.message : String(err)).replace(/[\r\n\t]+/g, ' ').slice(0, 300);
    const delay = OUTBOX_BACKOFF_MS[Math.min(row.attempts - 1, OUTBOX_BACKOFF_MS.length - 1)];
    // Subject only in the log: addresses and bodies stay out of logs.
    this.log(`[mail] "${row.subject.replace(/[\r\n\t]+/g, ' ')}" not sent (attempt ${row.attempts}), retrying in ${Math.round(delay / 1000)} s: ${reason}`);
    await inTransaction(this.ds, (tx) => tx.update(OutboxMessage, { id: row.id, claimedUntil: row.claimedUntil! }, { claimedUntil: null, nextAttemptAt: this.now() + delay, lastError: reason }));
  }
}

/** Messages still waiting (for health checks and tests). */
export async function pendingMail(ds: DataSource): Promise<number> {
  return ds.manager.countBy(OutboxMessage, { status: In(['pending']) });
}
