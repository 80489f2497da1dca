import { Column, Entity, PrimaryColumn } from 'typeorm';

export type OutboxStatus = 'pending' | 'sent';

/** A message a use case owes, written in the same transaction as the state change it reports. */
@Entity('mail_outbox')
export class OutboxMessage {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'to_address', length: 320 })
  to: string;

  @Column('varchar', { length: 400 })
  subject: string;

  @Column('text')
  text: string;

  @Column('text', { nullable: true })
  html: string | null;

  @Column('varchar', { length: 8 })
  status: OutboxStatus;

  @Column('integer')
  attempts: number;

  /** Epoch ms: not before. Backoff pushes it on after a failure. */
  @Column('bigint', { name: 'next_attempt_at', transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  nextAttemptAt: number;

  /** Epoch ms until which one sender owns the row (a lease: a sender that died releases it by time). */
  @Column('bigint', { name: 'claimed_until', nullable: true, transformer: { to: (v: number | null) => v, from: (v: string | number | null) => (v == null ? null : Number(v)) } })
  claimedUntil: number | null;

  @Column('varchar', { name: 'last_error', length: 500, nullable: true })
  lastError: string | null;

  @Column('bigint', { name: 'created_at', transformer: { to: (v: number) => v, from: (v: string | number) => Number(v) } })
  createdAt: number;

  @Column('bigint', { name: 'sent_at', nullable: true, transformer: { to: (v: number | null) => v, from: (v: string | number | null) => (v == null ? null : Number(v)) } })
  sentAt: number | null;
}
