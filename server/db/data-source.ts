import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { Account, Session } from '../modules/accounts/account.entity';
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
import { InvoiceListOrder1766300000000 } from './migrations/1766300000000-invoice-list-order';
import { LogMovesIndex1766300100000 } from './migrations/1766300100000-log-moves-index';
import { registerSqlFunctions } from './sql-functions';

export const entities = [Account, Session, Block, BlockPhoto, Bid, Contract, ContractSignature, ContractAmendment, LogEntry, LogPhoto, SignOff, OutboxMessage, Document, Invoice, InvoiceCounter, PaymentEventRecord, PaymentCustomer];
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
  InvoiceListOrder1766300000000,
  LogMovesIndex1766300100000,
];

/** `database` is a file path, or ':memory:' for tests. Migrations only; never synchronize. */
export function createDataSource(database: string): DataSource {
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
    prepareDatabase: (db: { pragma: (s: string) => unknown } & Parameters<typeof registerSqlFunctions>[0]) => {
      if (database !== ':memory:') db.pragma('journal_mode = WAL');
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

export async function openDatabase(database: string): Promise<DataSource> {
  const ds = createDataSource(database);
  await ds.initialize();
  await ds.runMigrations({ transaction: 'each' });
  return ds;
}
