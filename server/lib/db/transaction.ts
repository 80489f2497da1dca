import { AsyncLocalStorage } from 'node:async_hooks';
import type { DataSource, EntityManager } from 'typeorm';

// TypeORM's better-sqlite3 driver runs every query of the process on ONE query runner. Two
// `ds.transaction()` calls that overlap in time therefore interleave on the same connection: the second
// BEGIN fails ("cannot start a transaction within a transaction") and the first commit is lost. So on
// SQLite the transactions of a process run one after another, per DataSource, through this queue. SQLite
// has a single writer anyway; each transaction here is a few milliseconds.
//
// The queue is an optimisation and a driver workaround, never the guarantee: every once-only effect also
// rests on a unique index, a conditional UPDATE or a stored idempotency key, so it holds with several server
// processes sharing one database (PostgreSQL), where this queue is bypassed.
//
// Writes made outside this queue (`ds.manager.save()` from anywhere) can land inside a queued transaction on
// SQLite: route every write through `inTransaction`.

const queues = new WeakMap<DataSource, Promise<unknown>>();
const inside = new AsyncLocalStorage<DataSource>();

export class NestedTransactionError extends Error {
  constructor() {
    super('inTransaction was called inside another inTransaction: pass the open EntityManager down instead (a nested call would wait for itself)');
    this.name = 'NestedTransactionError';
  }
}

function serialisesWrites(ds: DataSource): boolean {
  return ds.options.type === 'better-sqlite3';
}

/**
 * Conflicts the database resolved by rolling one transaction back whole, so that running it again is safe:
 * PostgreSQL's deadlock_detected, and SQLite's busy answers when several processes share the file (a transaction
 * that read before another process committed may not then write: SQLite says "database is locked" at once,
 * without waiting out the busy timeout).
 */
const RETRYABLE = new Set(['40P01', 'SQLITE_BUSY', 'SQLITE_BUSY_SNAPSHOT', 'SQLITE_BUSY_RECOVERY']);
const RETRIES = 8;

function isRetryableConflict(err: unknown): boolean {
  const e = err as { code?: string; driverError?: { code?: string } } | null;
  return RETRYABLE.has(e?.driverError?.code ?? e?.code ?? '');
}

/** The work in its own transaction, run again (a few times, after a short random pause) if the database refused it. */
async function withConflictRetry<T>(run: () => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if (!isRetryableConflict(err) || attempt > RETRIES) throw err;
      await new Promise((r) => setTimeout(r, Math.random() * 5 * 2 ** Math.min(attempt, 6)));
    }
  }
}

export function inTransaction<T>(ds: DataSource, work: (tx: EntityManager) => Promise<T>): Promise<T> {
  // A nested call on SQLite would queue behind the transaction that is waiting for it: a silent deadlock.
  if (inside.getStore() === ds) return Promise.reject(new NestedTransactionError());
  // Use cases take their rows in a fixed order (the contract or block first) so they queue rather than deadlock;
  // the retry covers an order not foreseen, and SQLite shared by several processes. A transaction body has no
  // effect outside the database (STYLE.md 13), so running it again changes nothing twice.
  const body = () => withConflictRetry(() => inside.run(ds, () => ds.transaction(work)));
  if (!serialisesWrites(ds)) return body();
  const previous = queues.get(ds) ?? Promise.resolve();
  const run = previous.then(body, body);
  // The queue only orders; a failed transaction must not block the next one.
  queues.set(
    ds,
    run.catch(() => undefined),
  );
  return run;
}

/** True while the caller runs inside `inTransaction` on `ds` (slow work must not run there). */
export function inOpenTransaction(ds: DataSource): boolean {
  return inside.getStore() === ds;
}
