import { HEAD_DAY_DECIMALS } from '../../lib/grazing/head-days';
import { afterOutByFlag, logDays, type LogEntryFacts } from '../../lib/grazing/log-days';

// Invented entries on a block in Los Angeles time; expected head-days are worked by hand beside each case.
const TZ = 'America/Los_Angeles';
const units = (v: number) => Math.round(v * 10 ** HEAD_DAY_DECIMALS);

describe('logDays', () => {
  const entries: LogEntryFacts[] = [
    { at: '2027-01-10T18:00:00-08:00', kind: 'move', change: 200 },
    { at: '2027-01-10T19:00:00-08:00', kind: 'observation', residualHeightIn: 6, waterChecked: true },
    { at: '2027-01-12T07:00:00-08:00', kind: 'tally', count: 198 },
    { at: '2027-01-12T12:00:00-08:00', kind: 'move', change: -50, flags: ['Written two days late'] },
    { at: '2027-01-13T06:00:00-08:00', kind: 'move', change: -150 },
  ];
  const r = logDays({ entries, until: '2027-01-13T06:00:00-08:00', timeZone: TZ, outBy: '2027-01-12' });

  it('When moves span several days, then each day has the head at its end and the head-days it earned', () => {
    // Jan 10: 200 × 6 h = 50; Jan 11: 200 × 24 h = 200; Jan 12: 200 × 12 h + 150 × 12 h = 175; Jan 13: 150 × 6 h = 37.5.
    expect(r.days.map((d) => [d.date, d.headAtEnd, d.headDays])).toEqual([
      ['2027-01-10', 200, 50],
      ['2027-01-11', 200, 200],
      ['2027-01-12', 150, 175],
      ['2027-01-13', 0, 37.5],
    ]);
    expect(r.headDays).toBe(462.5);
    expect(r.days.reduce((n, d) => n + units(d.headDays), 0)).toBe(units(r.headDays));
  });

  it('When a day has no entries, then it is still listed with its head-days', () => {
    expect(r.days[1].entries).toEqual([]);
  });

  it('When a tally disagrees, an entry falls after the out-by date or the caller flagged it, then the entry carries the flag', () => {
    expect(r.days[2].entries[0].flags).toEqual(['Tally of 198 differs from the 200 head the moves put on the block']);
    expect(r.days[2].entries[1].flags).toEqual(['Written two days late']);
    expect(r.days[3].entries[0].flags).toEqual([afterOutByFlag('2027-01-12')]);
    expect(r.days[3].flags).toEqual(['Animals on the block after the out-by date (Jan 12, 2027)']);
    expect(r.days[0].entries.every((e) => e.flags.length === 0)).toBe(true);
    expect(r.flaggedCount).toBe(4);
  });

  it('When entries are given out of order, then they are placed in time order within their day', () => {
    const shuffled = logDays({ entries: [entries[1], entries[0], ...entries.slice(2)], until: '2027-01-13T06:00:00-08:00', timeZone: TZ, outBy: '2027-01-12' });
    expect(shuffled.days[0].entries.map((e) => e.kind)).toEqual(['move', 'observation']);
    expect(shuffled.headDays).toBe(462.5);
  });

  it('When an entry time has no offset, then it is refused naming the entry', () => {
    expect(() => logDays({ entries: [{ at: '2027-01-10T18:00', kind: 'move', change: 1 }], until: '2027-01-11T00:00:00Z', timeZone: TZ, outBy: '2027-01-12' })).toThrow(
      expect.objectContaining({ field: 'entries[0].at' }),
    );
  });
});
