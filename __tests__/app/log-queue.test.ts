import { ApiError } from '@/hooks/api/client';
import { createMemoryStore } from '@/hooks/offline/device-store-types';
import { createLogQueue, SENT_KEPT_MS, type LogEntryToSend } from '@/hooks/offline/log-queue';
import type { LogEntryView } from '@/lib/schemas/contract';

const WADE = 'acct-wade';
const C1 = 'contract-1';

/** A stand-in for POST /api/contracts/:id/log: one stored entry per clientId, as the server promises. */
function fakeServer() {
  const stored = new Map<string, LogEntryView>();
  const calls: string[] = [];
  /** What the next calls do instead of storing: throw this error, or store and then lose the answer. */
  const script: Array<ApiError | 'lose-answer'> = [];
  const send = jest.fn(async (contractId: string, entry: LogEntryToSend): Promise<LogEntryView> => {
    calls.push(entry.clientId);
    const step = script.shift();
    if (step instanceof ApiError) throw step;
    const existing = stored.get(entry.clientId);
    const view: LogEntryView = existing ?? {
      id: `srv-${stored.size + 1}`,
      clientId: entry.clientId,
      kind: entry.kind as LogEntryView['kind'],
      at: entry.at,
      change: entry.change ?? null,
      count: entry.count ?? null,
      paddock: entry.paddock ?? null,
      residualHeightIn: null,
      takenPct: null,
      trampledPct: null,
      bareGroundPct: null,
      waterChecked: null,
      fenceChecked: null,
      losses: null,
      note: entry.note ?? null,
      author: 'grazier',
      flags: [],
      recordedAt: '2027-01-20T16:00:00.000Z',
    };
    stored.set(entry.clientId, view);
    expect(contractId).toBe(C1);
    if (step === 'lose-answer') throw new ApiError(0, 'offline', 'Fieldfold could not be reached.');
    return view;
  });
  return { stored, calls, script, send };
}

function setup() {
  let clock = Date.parse('2027-01-20T15:30:00Z');
  const server = fakeServer();
  const store = createMemoryStore();
  const queue = createLogQueue({ store, send: server.send, now: () => clock });
  return { queue, server, store, tick: (ms: number) => (clock += ms) };
}

const moveIn: LogEntryToSend = { clientId: 'c-move-in-0001', kind: 'move', at: '2027-01-20T07:30:00-08:00', change: 600, paddock: 'Row 1–20' };
const tally: LogEntryToSend = { clientId: 'c-tally-00002', kind: 'tally', at: '2027-01-21T07:30:00-08:00', count: 598 };

describe('The offline log queue', () => {
  it('When the same entry is queued twice (a double tap, a retried save), then it is kept once and sent once', async () => {
    const { queue, server } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    await queue.enqueue(WADE, C1, { ...moveIn });
    expect(await queue.list(WADE, C1)).toHaveLength(1);

    const r = await queue.flush(WADE);
    expect(r).toEqual({ sent: 1, refused: 0, waiting: 0, stoppedBy: null });
    // Queuing it again after it went out changes nothing and sends nothing.
    await queue.enqueue(WADE, C1, moveIn);
    await queue.flush(WADE);
    expect(server.calls).toEqual(['c-move-in-0001']);
    const [item] = await queue.list(WADE, C1);
    expect(item).toMatchObject({ state: 'sent', attempts: 1, sentAt: '2027-01-20T15:30:00.000Z', stored: { id: 'srv-1', clientId: 'c-move-in-0001' } });
  });

  it('When there is no connection, then entries wait on the device, the round stops, and the next round sends them in order', async () => {
    const { queue, server, tick } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    tick(60_000);
    await queue.enqueue(WADE, C1, tally);
    server.script.push(new ApiError(0, 'offline', 'Fieldfold could not be reached.'));

    const offline = await queue.flush(WADE);
    expect(offline).toEqual({ sent: 0, refused: 0, waiting: 2, stoppedBy: 'offline' });
    // Only the first was tried: with no network there is no point trying the rest.
    expect(server.calls).toEqual(['c-move-in-0001']);
    const waiting = await queue.list(WADE, C1);
    expect(waiting.map((i) => [i.state, i.attempts])).toEqual([
      ['waiting', 1],
      ['waiting', 0],
    ]);
    expect(waiting[0].problem).toMatch(/No connection/);

    tick(30_000);
    const online = await queue.flush(WADE);
    expect(online).toEqual({ sent: 2, refused: 0, waiting: 0, stoppedBy: null });
    expect(server.calls).toEqual(['c-move-in-0001', 'c-move-in-0001', 'c-tally-00002']);
    expect([...server.stored.keys()]).toEqual(['c-move-in-0001', 'c-tally-00002']);
  });

  it('When the server stored an entry but the answer was lost, then the retry carries the same clientId and the server keeps one', async () => {
    const { queue, server } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    server.script.push('lose-answer');
    expect((await queue.flush(WADE)).stoppedBy).toBe('offline');
    expect(server.stored.size).toBe(1);

    await queue.flush(WADE);
    expect(server.calls).toEqual(['c-move-in-0001', 'c-move-in-0001']);
    expect(server.stored.size).toBe(1);
    expect((await queue.list(WADE, C1))[0]).toMatchObject({ state: 'sent', attempts: 2, stored: { id: 'srv-1' } });
  });

  it("When the server refuses an entry (400), then it stays, marked with the server's message and fields, the rest still go, and a fix or a discard settles it", async () => {
    const { queue, server } = setup();
    const future = { ...moveIn, clientId: 'c-future-0003', at: '2027-02-20T07:30:00-08:00' };
    await queue.enqueue(WADE, C1, future);
    await queue.enqueue(WADE, C1, tally);
    server.script.push(new ApiError(400, 'invalid', 'The entry is not valid', { at: 'Time must not be in the future' }));

    expect(await queue.flush(WADE)).toEqual({ sent: 1, refused: 1, waiting: 0, stoppedBy: null });
    const [refused] = (await queue.list(WADE, C1)).filter((i) => i.state === 'refused');
    expect(refused).toMatchObject({ entry: { clientId: 'c-future-0003' }, problem: 'The entry is not valid', fields: { at: 'Time must not be in the future' } });

    // A refused entry is not tried again by itself.
    await queue.flush(WADE);
    expect(server.calls.filter((c) => c === 'c-future-0003')).toHaveLength(1);

    // Fixed (same clientId, corrected time): back to waiting without its old message, then sent.
    await queue.enqueue(WADE, C1, { ...future, at: '2027-01-20T09:00:00-08:00' });
    expect((await queue.list(WADE, C1)).find((i) => i.entry.clientId === 'c-future-0003')).toMatchObject({ state: 'waiting', problem: null, fields: {} });
    await queue.flush(WADE);
    expect(server.stored.get('c-future-0003')?.at).toBe('2027-01-20T09:00:00-08:00');

    // A sent entry cannot be discarded; a refused one can.
    expect(await queue.discard(WADE, C1, 'c-future-0003')).toBe(false);
    const slip = { ...tally, clientId: 'c-slip-000004', count: -1 };
    await queue.enqueue(WADE, C1, slip);
    server.script.push(new ApiError(400, 'invalid', 'Head counted must not be negative', { count: 'Head counted must not be negative' }));
    await queue.flush(WADE);
    expect(await queue.discard(WADE, C1, 'c-slip-000004')).toBe(true);
    expect((await queue.list(WADE, C1)).map((i) => i.entry.clientId)).toEqual(['c-future-0003', 'c-tally-00002']);
  });

  it('When the sign-in ran out (401) or the server is down (503, 429), then the entry waits rather than being marked refused', async () => {
    const { queue, server } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    for (const [err, stop] of [
      [new ApiError(401, 'unauthorized', 'Sign in first'), 'signed-out'],
      [new ApiError(503, 'unavailable', 'Down for maintenance'), 'server'],
      [new ApiError(429, 'rate_limited', 'Too many requests'), 'server'],
    ] as const) {
      server.script.push(err);
      expect((await queue.flush(WADE)).stoppedBy).toBe(stop);
      expect((await queue.list(WADE, C1))[0].state).toBe('waiting');
    }
    await queue.flush(WADE);
    expect((await queue.list(WADE, C1))[0]).toMatchObject({ state: 'sent', attempts: 4 });
  });

  it('When the online event and the interval start a round at the same moment, then they share one round and nothing is sent twice', async () => {
    const { queue, server } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    await queue.enqueue(WADE, C1, tally);
    const [a, b] = await Promise.all([queue.flush(WADE), queue.flush(WADE)]);
    expect(a).toBe(b);
    expect(server.calls).toEqual(['c-move-in-0001', 'c-tally-00002']);
    expect(queue.isFlushing(WADE)).toBe(false);
  });

  it("When another account signs in on the same phone, then it neither sees nor sends the first account's entries", async () => {
    const { queue, server } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    expect(await queue.list('acct-mirela')).toEqual([]);
    expect((await queue.flush('acct-mirela')).sent).toBe(0);
    expect(server.calls).toEqual([]);
  });

  it('When a sent entry is older than the days it is listed for, then the next round forgets it', async () => {
    const { queue, store, tick } = setup();
    await queue.enqueue(WADE, C1, moveIn);
    await queue.flush(WADE);
    tick(SENT_KEPT_MS - 1);
    await queue.flush(WADE);
    expect(await queue.list(WADE, C1)).toHaveLength(1);
    tick(2);
    await queue.flush(WADE);
    expect(await queue.list(WADE, C1)).toEqual([]);
    expect(await store.keys('log-queue/')).toEqual([]);
  });

  it('When the queue changes, then subscribers hear of it (the screen redraws its waiting list)', async () => {
    const { queue } = setup();
    const heard = jest.fn();
    const stop = queue.subscribe(heard);
    await queue.enqueue(WADE, C1, moveIn);
    expect(heard).toHaveBeenCalledTimes(1);
    await queue.flush(WADE);
    expect(heard.mock.calls.length).toBeGreaterThanOrEqual(3); // round started, entry sent, round over
    stop();
    await queue.enqueue(WADE, C1, tally);
    const calls = heard.mock.calls.length;
    await queue.discard(WADE, C1, tally.clientId);
    expect(heard.mock.calls.length).toBe(calls);
  });
});
