import type { DataSource, EntityManager } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { readTogether } from '../../server/lib/db/reads';
import { inTransaction } from '../../server/lib/db/transaction';
import { Account } from '../../server/modules/accounts/account.entity';
import { freshTestDatabase, type TestDatabase } from '../helpers/test-database';

// readTogether on the suite's engine: reads at once on the pool, one after another on a transaction's one
// connection (PostgreSQL runs one query at a time per connection; pg queues a second one with a deprecation
// warning in pg 8 and refuses it in pg 9).

let database: TestDatabase;
let ds: DataSource;
beforeAll(async () => {
  database = await freshTestDatabase();
  ds = await openDatabase(database.target);
});
afterAll(async () => {
  await ds.destroy();
  await database.drop();
});

/** Three reads that log when each starts and ends. */
function reads(em: EntityManager, log: string[]) {
  const read = (name: string) => async () => {
    log.push(`${name} starts`);
    const n = await em.count(Account);
    log.push(`${name} ends`);
    return `${name}:${n}`;
  };
  return [read('a'), read('b'), read('c')] as const;
}

describe('readTogether', () => {
  it('When the manager is a transaction\'s, then each read starts only after the one before it ended, and the results come in order', async () => {
    const log: string[] = [];
    const results = await inTransaction(ds, (tx) => readTogether(tx, reads(tx, log)));
    expect(results).toEqual(['a:0', 'b:0', 'c:0']);
    expect(log).toEqual(['a starts', 'a ends', 'b starts', 'b ends', 'c starts', 'c ends']);
  });

  it('When the manager is the data source\'s own, then the reads are all started at once, and the results come in order', async () => {
    const log: string[] = [];
    const results = await readTogether(ds.manager, reads(ds.manager, log));
    expect(results).toEqual(['a:0', 'b:0', 'c:0']);
    expect(log.slice(0, 3)).toEqual(['a starts', 'b starts', 'c starts']);
  });
});
