import type { EntityManager } from 'typeorm';

type Results<T extends readonly (() => Promise<unknown>)[]> = { -readonly [K in keyof T]: Awaited<ReturnType<T[K]>> };

/**
 * Reads that do not depend on each other, on `em`: at once when `em` is the data source's own manager (each query
 * takes a connection of the pool), one after another when it is bound to one connection (a transaction's). A
 * PostgreSQL connection runs one query at a time; pg queues one sent while another runs, which pg 8 deprecates
 * (it warns on stderr) and pg 9 refuses. On SQLite both ways are the same: one connection, queries in turn.
 */
export async function readTogether<const T extends readonly (() => Promise<unknown>)[]>(em: EntityManager, reads: T): Promise<Results<T>> {
  if (!em.queryRunner) return (await Promise.all(reads.map((read) => read()))) as Results<T>;
  const out: unknown[] = [];
  for (const read of reads) out.push(await read());
  return out as Results<T>;
}
