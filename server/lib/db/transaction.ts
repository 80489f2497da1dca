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

/** PostgreSQL's deadlock_detected: it rolled one of two transactions back whole, so running it again is safe. */
const DEADLOCK = '40P01';
const DEADLOCK_RETRIES = 3;

function isDeadlock(err: unknown): boolean {
  const e = err as { code?: string; driverError?: { code?: string } } | null;
  return (e?.driverError?.code ?? e?.code) === DEADLOCK;
}

/** On PostgreSQL: the work in its own transaction, run again (a few times) if the server broke a deadlock with it. */
async function withDeadlockRetry<T>(run: () => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await run();
    } catch (err) {
      if (!isDeadlock(err) || attempt > DEADLOCK_RETRIES) throw err;
    }
  }
}

export function inTransaction<T>(ds: DataSource, work: (tx: EntityManager) => Promise<T>): Promise<T> {
  // A nested call on SQLite would queue behind the transaction that is waiting for it: a silent deadlock.
  if (inside.getStore() === ds) return Promise.reject(new NestedTransactionError());
  const body = () => inside.run(ds, () => ds.transaction(work));
  // Use cases take their rows in a fixed order (the contract or block first) so they queue rather than deadlock;
  // the retry covers an order not foreseen. A transaction body has no effect outside the database (STYLE.md 13).
  if (!serialisesWrites(ds)) return withDeadlockRetry(body);
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
