import type { DataSource, EntityManager } from 'typeorm';

// TypeORM's better-sqlite3 driver runs every query of the process on ONE query runner. Two
// `ds.transaction()` calls that overlap in time therefore interleave on the same connection: the second
// BEGIN fails ("cannot start a transaction within a transaction") and the first commit is lost. So the
// marketplace runs its transactions one after another, per DataSource, through this queue. SQLite has a
// single writer anyway; each transaction here is a few milliseconds.
// Writes made outside this queue (e.g. `repository.save()` from another module) can still land inside a
// queued transaction; route writes through `inTransaction` to be safe.

const queues = new WeakMap<DataSource, Promise<unknown>>();

export function inTransaction<T>(ds: DataSource, work: (tx: EntityManager) => Promise<T>): Promise<T> {
  const previous = queues.get(ds) ?? Promise.resolve();
  const run = previous.then(
    () => ds.transaction(work),
    () => ds.transaction(work),
  );
  // The queue only orders; a failed transaction must not block the next one.
  queues.set(
    ds,
    run.catch(() => undefined),
  );
  return run;
}
