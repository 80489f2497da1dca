import { Column, Entity, PrimaryColumn } from 'typeorm';
import type { ContractTerms, TermChanges } from '../../../lib/contract-terms';
import type { HeadDaysByDay } from '../../../lib/grazing/head-days';
import type { AmendmentStatus, AmendmentView, ContractParty, LogEntryKind, SignOffStatus } from '../../../lib/schemas/contract';

// The records a contract gathers after the award: signatures on each version of its terms, amendments,
// the grazing log (with photos) and the sign-off rounds. Tables and their once-only indexes:
// server/db/migrations/1765100000000-contract-signing-log.ts.

const epochMs = { to: (v: number) => v, from: (v: string | number) => Number(v) };

/** One party's signature on one version of the terms (unique per contract, version and party). */
@Entity('contract_signatures')
export class ContractSignature {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  @Column('integer', { name: 'terms_version' })
  termsVersion: number;

  @Column('varchar', { length: 8 })
  party: ContractParty;

  @Column('varchar', { name: 'account_id', length: 36 })
  accountId: string;

  @Column('varchar', { name: 'typed_name', length: 120 })
  typedName: string;

  @Column('boolean', { name: 'cautions_acknowledged' })
  cautionsAcknowledged: boolean;

  /** SHA-256 of the canonical terms text signed, computed by the server (and matching what the signer was shown). */
  @Column('varchar', { name: 'terms_hash', length: 64 })
  termsHash: string;

  @Column('varchar', { length: 64, nullable: true })
  ip: string | null;

  @Column('varchar', { name: 'user_agent', length: 400, nullable: true })
  userAgent: string | null;

  @Column({ type: Date, name: 'signed_at' })
  signedAt: Date;
}

/** A change of terms either party proposed; it takes effect only when both signed its version. */
@Entity('contract_amendments')
export class ContractAmendment {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  /** The terms version it becomes; numbers are never reused, so a withdrawn amendment leaves a gap. */
  @Column('integer')
  version: number;

  @Column('varchar', { length: 10 })
  status: AmendmentStatus;

  @Column('varchar', { name: 'proposed_by', length: 8 })
  proposedBy: ContractParty;

  @Column('varchar', { name: 'proposed_by_id', length: 36 })
  proposedById: string;

  @Column('text')
  reason: string;

  /** The new values (applied to the terms when both have signed). */
  @Column('simple-json')
  changes: TermChanges;

  /** Each change in words with the value it replaces, as it read when proposed. */
  @Column('simple-json', { name: 'change_lines' })
  changeLines: AmendmentView['changes'];

  @Column('real', { name: 'agreed_head_days', nullable: true })
  agreedHeadDays: number | null;

  @Column('simple-json')
  terms: ContractTerms;

  @Column('text', { name: 'terms_text' })
  termsText: string;

  @Column('varchar', { name: 'terms_hash', length: 64 })
  termsHash: string;

  @Column({ type: Date, name: 'created_at' })
  createdAt: Date;

  @Column({ type: Date, name: 'decided_at', nullable: true })
  decidedAt: Date | null;
}

/** One entry of the grazing log, written on the phone (client id) and stored once. */
@Entity('contract_log_entries')
export class LogEntry {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  @Column('varchar', { name: 'client_id', length: 64 })
  clientId: string;

  @Column('varchar', { length: 12 })
  kind: LogEntryKind;

  /** The instant as the phone wrote it (its offset shows the local time the entry was made). */
  @Column('varchar', { length: 40 })
  at: string;

  /** The same instant in epoch ms, for ordering and paging. */
  @Column('bigint', { name: 'at_ms', transformer: epochMs })
  atMs: number;

  @Column('integer', { nullable: true })
  change: number | null;

  @Column('integer', { nullable: true })
  count: number | null;

  @Column('varchar', { length: 60, nullable: true })
  paddock: string | null;

  @Column('real', { name: 'residual_height_in', nullable: true })
  residualHeightIn: number | null;

  @Column('real', { name: 'taken_pct', nullable: true })
  takenPct: number | null;

  @Column('real', { name: 'trampled_pct', nullable: true })
  trampledPct: number | null;

  @Column('real', { name: 'bare_ground_pct', nullable: true })
  bareGroundPct: number | null;

  @Column('boolean', { name: 'water_checked', nullable: true })
  waterChecked: boolean | null;

  @Column('boolean', { name: 'fence_checked', nullable: true })
  fenceChecked: boolean | null;

  @Column('integer', { nullable: true })
  losses: number | null;

  @Column('text', { nullable: true })
  note: string | null;

  @Column('varchar', { length: 8 })
  author: ContractParty;

  @Column('varchar', { name: 'author_id', length: 36 })
  authorId: string;

  @Column('simple-json')
  flags: string[];

  @Column({ type: Date, name: 'recorded_at' })
  recordedAt: Date;

  /** Entries are never deleted: a mistake is voided by its author with a reason, and stays in the record. */
  @Column({ type: Date, name: 'voided_at', nullable: true })
  voidedAt: Date | null;

  @Column('text', { name: 'void_reason', nullable: true })
  voidReason: string | null;
}

@Entity('contract_log_photos')
export class LogPhoto {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'entry_id', length: 36 })
  entryId: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  @Column('varchar', { name: 'file_name', length: 60 })
  fileName: string;

  @Column('varchar', { name: 'mime_type', length: 20 })
  mimeType: 'image/jpeg' | 'image/png' | 'image/webp';

  @Column('integer', { name: 'size_bytes' })
  sizeBytes: number;

  @Column({ type: Date, name: 'created_at' })
  createdAt: Date;
}

/** One round of sign-off: the grazier's proposal and the grower's answer. */
@Entity('contract_sign_offs')
export class SignOff {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  @Column('integer')
  round: number;

  @Column('varchar', { length: 10 })
  status: SignOffStatus;

  @Column('real', { name: 'proposed_head_days' })
  proposedHeadDays: number;

  @Column('simple-json', { name: 'by_day' })
  byDay: HeadDaysByDay[];

  /** The instant the head-days were counted to (the last move out). */
  @Column('varchar', { name: 'counted_until', length: 40 })
  countedUntil: string;

  @Column('text', { nullable: true })
  comment: string | null;

  @Column('varchar', { name: 'grazier_name', length: 120 })
  grazierName: string;

  @Column({ type: Date, name: 'proposed_at' })
  proposedAt: Date;

  @Column('real', { name: 'counter_head_days', nullable: true })
  counterHeadDays: number | null;

  @Column('text', { name: 'dispute_comment', nullable: true })
  disputeComment: string | null;

  @Column({ type: Date, name: 'disputed_at', nullable: true })
  disputedAt: Date | null;

  @Column('varchar', { name: 'grower_name', length: 120, nullable: true })
  growerName: string | null;

  @Column('real', { name: 'agreed_head_days', nullable: true })
  agreedHeadDays: number | null;

  @Column({ type: Date, name: 'agreed_at', nullable: true })
  agreedAt: Date | null;

  @Column('varchar', { name: 'agreed_by', length: 8, nullable: true })
  agreedBy: ContractParty | null;
}
