import type { QueuedEntry } from '@/hooks/offline/log-queue';
import { figuresWithQueue, mergeLog } from '@/hooks/offline/log-with-queue';
import { contractFixture, entryFixture, figuresFixture, wade } from '../helpers/contract-fixtures';

// Head-days worked out on the phone for moves still waiting to send. Hand figures: 600 head from
// Jan 20 07:30 to Jan 22 08:00 at the block (PST, −08:00) is 48.5 h → 600 × 48.5 ÷ 24 = 1 212.5 head-days.
const contract = contractFixture();
const moveIn = entryFixture({ clientId: 'c-in-20jan-0001', kind: 'move', at: '2027-01-20T07:30:00-08:00', change: 600 });

function queued(clientId: string, at: string, change: number, state: QueuedEntry['state'] = 'waiting'): QueuedEntry {
  return { accountId: wade.id, contractId: contract.id, entry: { clientId, kind: 'move', at, change }, queuedAt: at, state, attempts: 0, lastTriedAt: null, problem: null, fields: {}, sentAt: null, stored: null };
}

describe('Figures with moves waiting on the phone', () => {
  it('When the waiting move comes after the instant the server counted to, then the count carries on from the server’s (1 212.5 + 600 × 2 h ÷ 24 = 1 262.5)', () => {
    const server = figuresFixture({ until: '2027-01-22T16:00:00.000Z', dailyIntakeLbPerHead: 3.75 });
    const out = queued('c-out-22jan-001', '2027-01-22T10:00:00-08:00', -600);
    // Older pages not loaded: the incremental way does not need them.
    const r = figuresWithQueue(contract, [moveIn], server, [out], Date.parse('2027-01-22T20:00:00Z'), false);
    expect(r.problem).toBeNull();
    expect(r.queuedMoves).toBe(1);
    expect(r.figures.headNow).toBe(0);
    expect(r.figures.headDaysSoFar).toBe(1262.5);
    expect(r.figures.byDay).toEqual([
      { date: '2027-01-20', headDays: 412.5 },
      { date: '2027-01-21', headDays: 600 },
      { date: '2027-01-22', headDays: 250 },
    ]);
    expect(r.figures.eatenLb).toBeCloseTo(1262.5 * 3.75, 9);
  });

  it('When a waiting move is dated before what the server counted and older entries are not loaded, then the server’s figures stay, with a note', () => {
    const server = figuresFixture({ until: '2027-01-22T16:00:00.000Z' });
    const backdated = queued('c-out-21jan-001', '2027-01-21T18:00:00-08:00', -100);
    const r = figuresWithQueue(contract, [moveIn], server, [backdated], Date.parse('2027-01-22T20:00:00Z'), false);
    expect(r.figures).toBe(server);
    expect(r.problem).toMatch(/update once it is sent/);
  });

  it('When the whole log is loaded, then every move is counted again, voided ones left out', () => {
    const server = figuresFixture({ until: '2027-01-22T16:00:00.000Z' });
    const voidedIn = entryFixture({ clientId: 'c-dup-in-00001', kind: 'move', at: '2027-01-20T07:40:00-08:00', change: 600, voided: { at: '2027-01-20T18:00:00.000Z', reason: 'Logged twice' } });
    // 100 head out on Jan 21 at 07:30: 600 × 24 h + 500 × 24.5 h → (14 400 + 12 250) ÷ 24 = 1 110.4167
    const backdated = queued('c-out-21jan-001', '2027-01-21T07:30:00-08:00', -100);
    const r = figuresWithQueue(contract, [moveIn, voidedIn], server, [backdated], Date.parse('2027-01-22T16:00:00Z'), true);
    expect(r.problem).toBeNull();
    expect(r.figures.headNow).toBe(500);
    expect(r.figures.headDaysSoFar).toBe(1110.4167);
  });

  it('When the waiting moves take out more than are on the block, then the screen says they do not add up', () => {
    const server = figuresFixture({ until: '2027-01-22T16:00:00.000Z' });
    const r = figuresWithQueue(contract, [moveIn], server, [queued('c-out-too-many1', '2027-01-22T09:00:00-08:00', -700)], Date.parse('2027-01-22T18:00:00Z'), false);
    expect(r.figures).toBe(server);
    expect(r.problem).toMatch(/^The moves waiting to send do not add up: this move takes out more animals than are on the block \(600\)\.$/);
  });

  it('When an entry is both in the server’s log and still listed on the phone, then it shows once; refused ones are not in the record', () => {
    const sentCopy = queued('c-in-20jan-0001', '2027-01-20T07:30:00-08:00', 600, 'sent');
    const refused = queued('c-refused-00001', '2027-01-22T07:00:00-08:00', -600, 'refused');
    const waiting = queued('c-wait-0000001', '2027-01-22T07:30:00-08:00', -600);
    const rows = mergeLog([moveIn], [sentCopy, refused, waiting], contract);
    expect(rows.map((r) => [r.entry.clientId, r.queued ? r.queued.state : 'server'])).toEqual([
      ['c-wait-0000001', 'waiting'],
      ['c-in-20jan-0001', 'server'],
    ]);
  });
});
