import { Column, CreateDateColumn, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

// Every @Column names its type: tsx/esbuild emit no decorator metadata (shared/STACK.md). A point in time is
// `type: Date`: datetime text on SQLite, timestamptz on PostgreSQL (server/db/sql-dialect.ts).
@Entity('accounts')
export class Account {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { length: 254, unique: true })
  email: string;

  @Column('varchar', { name: 'password_hash', length: 100 })
  passwordHash: string;

  @Column('varchar', { length: 120 })
  name: string;

  /** Comma-separated role names: grower, grazier, admin. */
  @Column('varchar', { length: 60 })
  roles: string;

  @Column('varchar', { name: 'active_role', length: 20, nullable: true })
  activeRole: string | null;

  @Column('varchar', { name: 'business_name', length: 120, nullable: true })
  businessName: string | null;

  @Column('varchar', { length: 20, nullable: true })
  phone: string | null;

  @Column('varchar', { name: 'home_place', length: 120, nullable: true })
  homePlace: string | null;

  @Column('real', { name: 'home_latitude', nullable: true })
  homeLatitude: number | null;

  @Column('real', { name: 'home_longitude', nullable: true })
  homeLongitude: number | null;

  @Column('varchar', { name: 'flock_species', length: 20, nullable: true })
  flockSpecies: string | null;

  @Column('varchar', { name: 'flock_class', length: 40, nullable: true })
  flockClass: string | null;

  @Column('integer', { name: 'flock_head_count', nullable: true })
  flockHeadCount: number | null;

  @Column('real', { name: 'flock_body_weight_lb', nullable: true })
  flockBodyWeightLb: number | null;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: Date })
  updatedAt: Date;

  /**
   * Not a column: the sign-in session this copy of the account was loaded for (requireAuth sets it), so the
   * photo and PDF links signed for this viewer name that session and stop working when it is closed.
   */
  sessionId?: string;
}

/** One row per signed-in device; signing out deletes it, so a stolen token dies with the session. */
@Entity('sessions')
export class Session {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'account_id', length: 36 })
  accountId: string;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;

  @Column({ type: Date, name: 'expires_at' })
  expiresAt: Date;
}

const epochMs = { to: (v: number) => v, from: (v: string | number) => Number(v) };
const epochMsOrNull = { to: (v: number | null) => v, from: (v: string | number | null) => (v == null ? null : Number(v)) };

/** A mailed password-reset link: the SHA-256 of its token, never the token; used once, before it expires. */
@Entity('password_resets')
export class PasswordReset {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'account_id', length: 36 })
  accountId: string;

  /** Hex SHA-256 of the token in the link. */
  @Column('varchar', { name: 'token_hash', length: 64, unique: true })
  tokenHash: string;

  @Column('bigint', { name: 'expires_at', transformer: epochMs })
  expiresAt: number;

  @Column('bigint', { name: 'used_at', nullable: true, transformer: epochMsOrNull })
  usedAt: number | null;

  @Column('bigint', { name: 'created_at', transformer: epochMs })
  createdAt: number;
}
