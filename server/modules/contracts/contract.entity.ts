import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { BidService, FlockClass } from '../../../lib/schemas/bid';
import type { ContractParty, ContractStatus } from '../../../lib/schemas/contract';
import type { ContractTerms } from '../../../lib/contract-terms';
import type { ChargeBasis } from '../../../lib/money';
import type { FlockSpecies } from '../../../lib/grazing/flock-intake';

/** The agreed terms, copied from the bid and block at award time so later edits never change them. */
@Entity('contracts')
export class Contract {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'block_id', length: 36 })
  blockId: string;

  @Column('varchar', { name: 'bid_id', length: 36 })
  bidId: string;

  @Column('varchar', { name: 'grower_id', length: 36 })
  growerId: string;

  @Column('varchar', { name: 'grazier_id', length: 36 })
  grazierId: string;

  @Column('varchar', { length: 12 })
  status: ContractStatus;

  @Column('varchar', { length: 10 })
  basis: ChargeBasis;

  @Column('varchar', { length: 20 })
  rate: string;

  @Column('integer', { name: 'head_count' })
  headCount: number;

  @Column('varchar', { length: 10 })
  species: FlockSpecies;

  @Column('varchar', { name: 'animal_class', length: 40 })
  animalClass: FlockClass;

  @Column('real', { name: 'body_weight_lb' })
  bodyWeightLb: number;

  @Column('varchar', { name: 'start_date', length: 10 })
  startDate: string;

  @Column('varchar', { name: 'end_date', length: 10 })
  endDate: string;

  @Column('varchar', { name: 'out_by', length: 10 })
  outBy: string;

  @Column('simple-json')
  services: BidService[];

  @Column('real')
  acres: number;

  @Column('real', { name: 'lb_dm_per_acre' })
  lbDmPerAcre: number;

  @Column('real', { name: 'target_utilization_pct' })
  targetUtilizationPct: number;

  @Column('varchar', { name: 'time_zone', length: 64 })
  timeZone: string;

  /** Version of the terms in force; an amendment both parties signed moves it on. */
  @Column('integer', { name: 'terms_version', default: 1 })
  termsVersion: number;

  /** The terms snapshot in force (lib/contract-terms); null only on rows made before it was kept. */
  @Column('simple-json', { nullable: true })
  terms: ContractTerms | null;

  /** canonicalTermsText(terms) as it was when these terms were made: the text the signatures' hash is of. */
  @Column('text', { name: 'terms_text', nullable: true })
  termsText: string | null;

  /** SHA-256 (hex) of termsText. */
  @Column('varchar', { name: 'terms_hash', length: 64, nullable: true })
  termsHash: string | null;

  /** Head-days both parties agreed at sign-off (locked; an amendment both sign is the only way to change it). */
  @Column('real', { name: 'agreed_head_days', nullable: true })
  agreedHeadDays: number | null;

  @Column({ type: Date, name: 'agreed_at', nullable: true })
  agreedAt: Date | null;

  @Column({ type: Date, name: 'grazing_started_at', nullable: true })
  grazingStartedAt: Date | null;

  @Column({ type: Date, name: 'cancelled_at', nullable: true })
  cancelledAt: Date | null;

  @Column('varchar', { name: 'cancelled_by', length: 8, nullable: true })
  cancelledBy: ContractParty | null;

  @Column('text', { name: 'cancel_reason', nullable: true })
  cancelReason: string | null;

  /** Bumped by every change of the row; a use case's first write, so it holds the row while it decides. */
  @Column('integer', { default: 0 })
  revision: number;

  /** The stored grazing-log PDF that shows the record as it stands (server/modules/documents). */
  @Column('varchar', { name: 'log_document_id', length: 36, nullable: true })
  logDocumentId: string | null;

  /** What that file was made from (contract-documents.ts grazingLogSourceKey). */
  @Column('varchar', { name: 'log_document_key', length: 120, nullable: true })
  logDocumentKey: string | null;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: Date })
  updatedAt: Date;
}
