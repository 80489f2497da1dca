import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';
import type { BlockCrop, BlockInput, BlockStatus, ForageMethod, GrazingSpecies, PerimeterFence } from '../../../lib/schemas/block';
import type { SprayRecord } from '../../../lib/grazing/safety';

// Every @Column names its type: tsx/esbuild emit no decorator metadata (shared/STACK.md).
// Days are 'YYYY-MM-DD' text in the block's time zone; a block agrees on days, not instants.
@Entity('blocks')
export class Block {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'owner_id', length: 36 })
  ownerId: string;

  @Column('varchar', { length: 12 })
  status: BlockStatus;

  @Column('varchar', { length: 120 })
  name: string;

  @Column('varchar', { length: 20 })
  crop: BlockCrop;

  @Column('real')
  acres: number;

  @Column('varchar', { name: 'place_name', length: 120, nullable: true })
  placeName: string | null;

  @Column('real')
  latitude: number;

  @Column('real')
  longitude: number;

  @Column('varchar', { name: 'time_zone', length: 64 })
  timeZone: string;

  @Column('varchar', { name: 'forage_method', length: 10 })
  forageMethod: ForageMethod;

  /** The clipped samples as entered (method 'samples'), kept so the grower can edit them. */
  @Column('simple-json', { name: 'forage_samples', nullable: true })
  forageSamples: NonNullable<BlockInput['forageSamples']> | null;

  /** The stand height reading as entered (method 'height'). */
  @Column('simple-json', { name: 'forage_height', nullable: true })
  forageHeight: NonNullable<BlockInput['forageHeight']> | null;

  /** Always stored: the direct figure, or exactly what lib/grazing computed from samples or height. */
  @Column('real', { name: 'lb_dm_per_acre' })
  lbDmPerAcre: number;

  @Column('real', { name: 'target_utilization_pct' })
  targetUtilizationPct: number;

  @Column('real', { name: 'residual_height_in', nullable: true })
  residualHeightIn: number | null;

  @Column('varchar', { name: 'window_start', length: 10 })
  windowStart: string;

  @Column('varchar', { name: 'window_end', length: 10 })
  windowEnd: string;

  @Column('varchar', { name: 'out_by', length: 10 })
  outBy: string;

  @Column('varchar', { name: 'harvest_date', length: 10, nullable: true })
  harvestDate: string | null;

  @Column('simple-json', { name: 'spray_records' })
  sprayRecords: SprayRecord[];

  /** Derived from sprayRecords on every save (lib/grazing/safety earliestSafeDate). */
  @Column('varchar', { name: 'earliest_safe_date', length: 10, nullable: true })
  earliestSafeDate: string | null;

  /** First and last day animals may be on (lib/grazing/graze-window grazeSpan), stored on every save for the market's SQL. */
  @Column('varchar', { name: 'graze_from', length: 10 })
  grazeFrom: string;

  @Column('varchar', { name: 'graze_until', length: 10 })
  grazeUntil: string;

  /** lb DM the animals may take: acres × lb DM/ac × utilisation (lib/grazing/capacity allowableForage), stored on every save. */
  @Column('real', { name: 'allowable_lb' })
  allowableLb: number;

  @Column('boolean', { name: 'water_on_site' })
  waterOnSite: boolean;

  @Column('varchar', { name: 'perimeter_fence', length: 10 })
  perimeterFence: PerimeterFence;

  @Column('boolean', { name: 'truck_access' })
  truckAccess: boolean;

  /** Comma-separated: "sheep", "goats" or "sheep,goats". */
  @Column('simple-array', { name: 'species_allowed' })
  speciesAllowed: GrazingSpecies[];

  @Column('boolean', { name: 'young_plantings' })
  youngPlantings: boolean;

  @Column('text', { nullable: true })
  notes: string | null;

  @Column({ type: Date, name: 'published_at', nullable: true })
  publishedAt: Date | null;

  @Column({ type: Date, name: 'awarded_at', nullable: true })
  awardedAt: Date | null;

  @Column({ type: Date, name: 'withdrawn_at', nullable: true })
  withdrawnAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: Date })
  updatedAt: Date;
}
