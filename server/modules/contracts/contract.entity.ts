import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { BidService, FlockClass } from '../../../lib/schemas/bid';
import type { ContractStatus } from '../../../lib/schemas/contract';
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

  // Added for invoices (migration 1765300000001) until the sign-off work lands this column on main: the head-days
  // both parties agreed at sign-off, which a head-day invoice bills. Null until agreed.
  @Column('real', { name: 'agreed_head_days', nullable: true })
  agreedHeadDays: number | null;

  @CreateDateColumn({ name: 'created_at', type: 'datetime' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'datetime' })
  updatedAt: Date;
}
