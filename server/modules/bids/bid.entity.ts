import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { BidService, BidStatus, FlockClass } from '../../../lib/schemas/bid';
import type { ChargeBasis } from '../../../lib/money';
import type { FlockSpecies } from '../../../lib/grazing/flock-intake';

@Entity('bids')
export class Bid {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'block_id', length: 36 })
  blockId: string;

  @Column('varchar', { name: 'grazier_id', length: 36 })
  grazierId: string;

  @Column('varchar', { length: 12 })
  status: BidStatus;

  @Column('varchar', { length: 10 })
  basis: ChargeBasis;

  /** Canonical decimal dollars (lib/money rateToString): text, so no binary fraction ever touches it. */
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

  @Column('simple-json')
  services: BidService[];

  @Column('text', { nullable: true })
  note: string | null;

  /** When the grower accepted or declined it (or the block was withdrawn). */
  @Column({ type: Date, name: 'decided_at', nullable: true })
  decidedAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: Date })
  updatedAt: Date;
}
