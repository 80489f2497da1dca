import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { Account, PasswordReset, Session } from '../modules/accounts/account.entity';
import { Block } from '../modules/blocks/block.entity';
import { BlockPhoto } from '../modules/blocks/block-photo.entity';
import { Bid } from '../modules/bids/bid.entity';
import { Contract } from '../modules/contracts/contract.entity';
import { ContractAmendment, ContractSignature, LogEntry, LogPhoto, SignOff } from '../modules/contracts/contract-records.entity';
import { OutboxMessage } from '../lib/mail/outbox.entity';
import { Document } from '../modules/documents/document.entity';
import { Invoice, InvoiceCounter, PaymentCustomer, PaymentEventRecord } from '../modules/invoices/invoice.entity';
import { Accounts1764600000000 } from './migrations/1764600000000-accounts';
import { Blocks1764700000000 } from './migrations/1764700000000-blocks';
import { Bids1764700100000 } from './migrations/1764700100000-bids';
import { Contracts1764700200000 } from './migrations/1764700200000-contracts';
import { MailOutbox1765000000000 } from './migrations/1765000000000-mail-outbox';
import { ContractSigningLog1765100000000 } from './migrations/1765100000000-contract-signing-log';
import { Documents1765200000000 } from './migrations/1765200000000-documents';
import { Invoices1765300000000 } from './migrations/1765300000000-invoices';
import { MarketFigures1765400000000 } from './migrations/1765400000000-market-figures';
import { PasswordResets1766000000000 } from './migrations/1766000000000-password-resets';
import { PostgresFunctions1766200000000 } from './migrations/1766200000000-postgres-functions';
import { RateLimitHits1766200000100 } from './migrations/1766200000100-rate-limit-hits';
import { InvoiceListOrder1766300000000 } from './migrations/1766300000000-invoice-list-order';
import { LogMovesIndex1766300100000 } from './migrations/1766300100000-log-moves-index';
import { MarketPlaceIndex1766400000000 } from './migrations/1766400000000-market-place-index';
import { registerSqlFunctions } from './sql-functions';

export const entities = [Account, Session, PasswordReset, Block, BlockPhoto, Bid, Contract, ContractSignature, ContractAmendment, LogEntry, LogPhoto, SignOff, OutboxMessage, Document, Invoice, InvoiceCounter, PaymentEventRecord, PaymentCustomer];
export const migrations = [
  Accounts1764600000000,
  Blocks1764700000000,
  Bids1764700100000,
  Contracts1764700200000,
  MailOutbox1765000000000,
  ContractSigningLog1765100000000,
  Documents1765200000000,
  Invoices1765300000000,
  MarketFigures1765400000000,
  PasswordResets1766000000000,
  PostgresFunctions1766200000000,
  RateLimitHits1766200000100,
  InvoiceListOrder1766300000000,
  LogMovesIndex1766300100000,
  MarketPlaceIndex1766400000000,
];

/** Where the data lives: a SQLite file path (':memory:' for tests) or a postgres:// URL (DATABASE_URL). */
export type DatabaseTarget = string;

export function isPostgresTarget(database: DatabaseTarget): boolean {
  return /^postgres(ql)?:\/\//.test(database);
}

/**
 * The application_name every server process's PostgreSQL connections carry: npm run restore refuses while a
 * session with it is connected to the database, from whichever machine.
 */
export const POSTGRES_APPLICATION_NAME = 'fieldfold';

/** Connections each server process may hold on PostgreSQL (N processes hold up to N times this many). */
export const POSTGRES_POOL_SIZE = 10;

/** Migrations only; never synchronize. One set of entities and migrations for both engines. */
export function createDataSource(database: DatabaseTarget): DataSource {
  if (isPostgresTarget(database)) {
    return new DataSource({
      type: 'postgres',
      url: database,
      entities,
      migrations,
      synchronize: false,
      migrationsRun: false,
      logging: false,
      applicationName: POSTGRES_APPLICATION_NAME,
      // A request waits at most 10 s for a free connection of the pool, then fails (503-like) instead of piling up.
      extra: { max: POSTGRES_POOL_SIZE, connectionTimeoutMillis: 10_000 },
    });
  }
  return new DataSource({
    type: 'better-sqlite3',
    database,
    entities,
    migrations,
    synchronize: false,
    migrationsRun: false,
    logging: false,
    // WAL lets the PDF and mail work read while a request writes; the busy timeout waits out a short lock
    // instead of failing with SQLITE_BUSY.
    // The market's SQL calls lib's distance function (server/db/sql-functions.ts).
    prepareDatabase: (db: { pragma: (s: string) => unknown; prepare: (sql: string) => unknown } & Parameters<typeof registerSqlFunctions>[0]) => {
      if (database !== ':memory:') db.pragma('journal_mode = WAL');
      beginImmediate(db);
      // synchronous = FULL (SQLite's default, kept on purpose): a commit that answered 2xx — a signature, an agreed
      // figure, a paid invoice — survives a power or OS failure too. NORMAL would save the fsync (about 5 ms per commit,
      // measured here, on the event loop) but can lose the last commits to a power cut (SQLite documentation,
      // "PRAGMA synchronous"); the bench shows the cost.
      db.pragma('synchronous = FULL');
      db.pragma('busy_timeout = 5000');
      db.pragma('foreign_keys = ON');
      registerSqlFunctions(db);
    },
  });
}

/**
 * Every transaction takes SQLite's write lock at BEGIN (BEGIN IMMEDIATE), not at its first write.
 *
 * TypeORM's SQLite query runner always sends a deferred `BEGIN TRANSACTION`. A deferred transaction that reads and
 * then writes — every use case here: check the state, then change it — cannot wait for another connection's write:
 * its snapshot is already older than that write, so SQLite answers SQLITE_BUSY ("database is locked") at once,
 * busy timeout or not. Within one process the transaction queue (server/lib/db/transaction.ts) keeps that from
 * happening; across processes on one file (a second server, an operator command such as make-admin) it turned
 * racing requests into 500s (__tests__/server/races.test.ts, "processes"). An immediate transaction instead waits
 * its turn for up to the busy timeout and then reads the latest state. The driver offers no option for this, so
 * its one BEGIN statement is rewritten where it is prepared.
 */
function beginImmediate(db: { prepare: (sql: string) => unknown }): void {
  const prepare = db.prepare.bind(db);
  db.prepare = (sql: string) => prepare(sql === 'BEGIN TRANSACTION' ? 'BEGIN IMMEDIATE TRANSACTION' : sql);
}

/** The advisory lock key that lets one process at a time migrate and seed a PostgreSQL database ("fieldfold"). */
const STARTUP_LOCK = 0x6669656c64;

/**
 * Runs `work` while holding the database's start-up lock: on PostgreSQL a session advisory lock, so of several
 * processes starting together one migrates and seeds while the others wait, then find the work done. On SQLite
 * `npm start` starts the first process alone and the rest once it answers (scripts/start.mjs).
 */
export async function withStartupLock<T>(ds: DataSource, work: () => Promise<T>): Promise<T> {
  if (ds.options.type !== 'postgres') return work();
  const runner = ds.createQueryRunner();
  try {
    await runner.query('SELECT pg_advisory_lock($1)', [STARTUP_LOCK]);
    return await work();
  } finally {
    await runner.query('SELECT pg_advisory_unlock($1)', [STARTUP_LOCK]).catch(() => undefined);
    await runner.release();
  }
}

/** Opens the database and brings its schema up to date (under the start-up lock). */
export async function openDatabase(database: DatabaseTarget, afterMigrations?: (ds: DataSource) => Promise<void>): Promise<DataSource> {
  const ds = createDataSource(database);
  await ds.initialize();
  try {
    await withStartupLock(ds, async () => {
      await ds.runMigrations({ transaction: 'each' });
      await afterMigrations?.(ds);
    });
  } catch (err) {
    await ds.destroy();
    throw err;
  }
  return ds;
}
