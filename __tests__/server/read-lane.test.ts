import fs from 'node:fs';
import { ReadLane } from '../../server/lib/http/read-lane';

// better-sqlite3 works on the event loop, so a search holds everything else while it runs. The read lane lets
// the I/O that arrived meanwhile (a write's body, a webhook) be served between searches, not behind all of them.
// One fs.stat is one trip through libuv's thread pool, like one request's I/O.

/** Holds the event loop like a synchronous query of `ms` milliseconds. */
function busy(ms: number) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    // spin
  }
}

describe('ReadLane', () => {
  it('When six searches are queued and a file stat completes meanwhile, then its callback runs after at most two of them, not after all six', async () => {
    const lane = new ReadLane();
    const order: string[] = [];
    const searches = Array.from({ length: 6 }, (_, i) =>
      lane.run(async () => {
        busy(25);
        order.push(`search ${i}`);
        return i;
      }),
    );
    const read = new Promise<void>((resolve) => fs.stat(__filename, () => (order.push('file read'), resolve())));
    expect(await Promise.all(searches)).toEqual([0, 1, 2, 3, 4, 5]);
    await read;
    expect(order.indexOf('file read')).toBeLessThanOrEqual(2);
    expect(order.filter((x) => x.startsWith('search'))).toEqual(['search 0', 'search 1', 'search 2', 'search 3', 'search 4', 'search 5']);
  });

  it('When the same searches run back to back without the lane, then the file stat waits for all six (what the lane prevents)', async () => {
    const order: string[] = [];
    const read = new Promise<void>((resolve) => fs.stat(__filename, () => (order.push('file read'), resolve())));
    await Promise.all(
      Array.from({ length: 6 }, async (_, i) => {
        busy(25);
        order.push(`search ${i}`);
      }),
    );
    await read;
    expect(order.indexOf('file read')).toBe(6);
  });

  it('When a search fails, then its caller gets the error and the next search still runs', async () => {
    const lane = new ReadLane();
    const failed = lane.run(async () => {
      throw new Error('no such block');
    });
    const next = lane.run(async () => 'served');
    await expect(failed).rejects.toThrow('no such block');
    await expect(next).resolves.toBe('served');
    expect(lane.waiting).toBe(0);
  });

  it('When the work throws before it returns a promise (a bad route parameter read as the call is built), then its caller gets the error and the lane goes on', async () => {
    const lane = new ReadLane();
    const failed = lane.run((): Promise<string> => {
      throw new Error('Record not found');
    });
    const next = lane.run(async () => 'served');
    await expect(failed).rejects.toThrow('Record not found');
    await expect(next).resolves.toBe('served');
    expect(lane.waiting).toBe(0);
  });
});
