import { tz, TZDate } from '@date-fns/tz';
import { addDays, format, startOfDay } from 'date-fns';
import fc from 'fast-check';
import { addDaysToKey, localDateKey, startOfLocalDay } from '../../lib/dates';
import { GrazingInputError, HEAD_DAY_DECIMALS, headDaysFromMoves } from '../../lib/grazing/head-days';

const MS_PER_DAY = 86_400_000;
const LA = 'America/Los_Angeles';
const units = (headDays: number) => Math.round(headDays * 10 ** HEAD_DAY_DECIMALS);
const sumUnits = (byDay: Array<{ headDays: number }>) => byDay.reduce((a, d) => a + units(d.headDays), 0);

/** Length of a local calendar day in hours, from the independent reference (date-fns + @date-fns/tz). */
function referenceDayHours(dateKey: string, timeZone: string): number {
  const [y, m, d] = dateKey.split('-').map(Number);
  const start = startOfDay(new TZDate(y, m - 1, d, 12, timeZone));
  const next = startOfDay(addDays(start, 1));
  return (next.getTime() - start.getTime()) / 3_600_000;
}

describe('headDaysFromMoves: simple cases (UTC)', () => {
  it('integrates the head count over elapsed time and splits at midnights', () => {
    // Invented example: 100 head in at 08:00 on the 10th, 40 out at 20:00 on the 11th, count until 08:00 on the 12th.
    const r = headDaysFromMoves({
      moves: [
        { at: '2027-01-10T08:00:00Z', change: 100 },
        { at: '2027-01-11T20:00:00Z', change: -40 },
      ],
      until: '2027-01-12T08:00:00Z',
    });
    const day10 = (100 * 16) / 24;
    const day11 = (100 * 20) / 24 + (60 * 4) / 24;
    const day12 = (60 * 8) / 24;
    expect(r.byDay.map((d) => d.date)).toEqual(['2027-01-10', '2027-01-11', '2027-01-12']);
    expect(r.byDay[0].headDays).toBeCloseTo(day10, 4);
    expect(r.byDay[1].headDays).toBeCloseTo(day11, 4);
    expect(r.byDay[2].headDays).toBeCloseTo(day12, 4);
    expect(r.headDays).toBeCloseTo(day10 + day11 + day12, 4);
    expect(sumUnits(r.byDay)).toBe(units(r.headDays));
  });

  it('counts animals still on at `until`, and an empty block earns zero days in between', () => {
    const r = headDaysFromMoves({
      moves: [
        { at: '2027-02-01T00:00:00Z', change: 10 },
        { at: '2027-02-02T00:00:00Z', change: -10 },
        { at: '2027-02-04T00:00:00Z', change: 5 },
      ],
      until: '2027-02-05T12:00:00Z',
    });
    expect(r.byDay).toEqual([
      { date: '2027-02-01', headDays: 10 },
      { date: '2027-02-02', headDays: 0 },
      { date: '2027-02-03', headDays: 0 },
      { date: '2027-02-04', headDays: 5 },
      { date: '2027-02-05', headDays: 2.5 },
    ]);
    expect(r.headDays).toBe(17.5);
  });

  it('applies several moves at the same instant in list order', () => {
    const r = headDaysFromMoves({
      moves: [
        { at: '2027-02-01T00:00:00Z', change: 10 },
        { at: '2027-02-01T12:00:00Z', change: -10 },
        { at: '2027-02-01T12:00:00Z', change: 4 },
      ],
      until: '2027-02-02T00:00:00Z',
    });
    expect(r.headDays).toBeCloseTo(10 * 0.5 + 4 * 0.5, 10);
  });

  it('honours the offset written in each instant', () => {
    // 12:00-08:00 is 20:00Z: 24 head for 4 h before UTC midnight, then 24 h.
    const r = headDaysFromMoves({ moves: [{ at: '2027-01-10T12:00:00-08:00', change: 24 }], until: '2027-01-12T00:00:00Z' });
    expect(r.byDay).toEqual([
      { date: '2027-01-10', headDays: 4 },
      { date: '2027-01-11', headDays: 24 },
    ]);
  });

  it('a stay that ends exactly at midnight has no entry for the next day', () => {
    const r = headDaysFromMoves({ moves: [{ at: '2027-01-10T00:00:00Z', change: 3 }], until: '2027-01-12T00:00:00Z' });
    expect(r.byDay.map((d) => d.date)).toEqual(['2027-01-10', '2027-01-11']);
    expect(r.headDays).toBe(6);
  });
});

describe('headDaysFromMoves: daylight-saving weeks in America/Los_Angeles', () => {
  // The US rule (second Sunday of March, first Sunday of November) puts the 2027 changes on 2027-03-14 and
  // 2027-11-07 [memory]; the day lengths are read from @date-fns/tz below rather than assumed.

  it('spring-forward week: 600 head Monday 00:00 to Monday 00:00 is 600 × 167 h ÷ 24', () => {
    const start = '2027-03-08T00:00:00-08:00';
    const until = '2027-03-15T00:00:00-07:00';
    // Reference day boundaries: local midnight of Monday 8th and Monday 15th from date-fns/@date-fns/tz.
    expect(Date.parse(start)).toBe(startOfDay(new TZDate(2027, 2, 8, 12, LA)).getTime());
    expect(Date.parse(until)).toBe(startOfDay(new TZDate(2027, 2, 15, 12, LA)).getTime());
    const hours = (Date.parse(until) - Date.parse(start)) / 3_600_000;
    expect(hours).toBe(167);

    const r = headDaysFromMoves({ moves: [{ at: start, change: 600 }], until, timeZone: LA });
    expect(r.headDays).toBeCloseTo((600 * hours) / 24, 10);
    expect(r.byDay).toHaveLength(7);
    for (const day of r.byDay) {
      expect(day.headDays).toBeCloseTo((600 * referenceDayHours(day.date, LA)) / 24, 10);
    }
    const dstDay = r.byDay.find((d) => d.date === '2027-03-14');
    expect(referenceDayHours('2027-03-14', LA)).toBe(23);
    expect(dstDay?.headDays).toBeCloseTo((600 * 23) / 24, 10);
    expect(sumUnits(r.byDay)).toBe(units(r.headDays));
  });

  it('fall-back week: 600 head Monday 00:00 to Monday 00:00 is 600 × 169 h ÷ 24', () => {
    const start = '2027-11-01T00:00:00-07:00';
    const until = '2027-11-08T00:00:00-08:00';
    expect(Date.parse(start)).toBe(startOfDay(new TZDate(2027, 10, 1, 12, LA)).getTime());
    expect(Date.parse(until)).toBe(startOfDay(new TZDate(2027, 10, 8, 12, LA)).getTime());
    const hours = (Date.parse(until) - Date.parse(start)) / 3_600_000;
    expect(hours).toBe(169);

    const r = headDaysFromMoves({ moves: [{ at: start, change: 600 }], until, timeZone: LA });
    expect(r.headDays).toBeCloseTo((600 * hours) / 24, 10);
    expect(r.byDay).toHaveLength(7);
    for (const day of r.byDay) {
      expect(day.headDays).toBeCloseTo((600 * referenceDayHours(day.date, LA)) / 24, 10);
    }
    expect(referenceDayHours('2027-11-07', LA)).toBe(25);
    expect(r.byDay.find((d) => d.date === '2027-11-07')?.headDays).toBeCloseTo((600 * 25) / 24, 10);
    expect(sumUnits(r.byDay)).toBe(units(r.headDays));
  });

  it('the same week in UTC has the same total but different day splits', () => {
    const moves = [{ at: '2027-11-01T00:00:00-07:00', change: 600 }];
    const until = '2027-11-08T00:00:00-08:00';
    const utc = headDaysFromMoves({ moves, until });
    const local = headDaysFromMoves({ moves, until, timeZone: LA });
    expect(utc.headDays).toBe(local.headDays);
    expect(utc.byDay[0]).toEqual({ date: '2027-11-01', headDays: (600 * 17) / 24 });
  });
});

describe('local day boundaries agree with date-fns + @date-fns/tz', () => {
  const zones = [
    'UTC',
    LA,
    'America/New_York',
    'America/Sao_Paulo',
    'Europe/London',
    'Europe/Berlin',
    'Australia/Sydney',
    'Australia/Lord_Howe', // 30-minute DST shift
    'Asia/Kolkata', // +05:30, no DST
    'Asia/Kathmandu', // +05:45
    'Pacific/Chatham', // +12:45 / +13:45
    'Pacific/Auckland',
    'Africa/Casablanca',
    'America/Santiago', // DST change at midnight: local 00:00 is skipped in September
  ];
  const instant = fc.integer({ min: Date.UTC(1995, 0, 1), max: Date.UTC(2045, 0, 1) });

  it('local date of an instant (property)', () => {
    fc.assert(
      fc.property(instant, fc.constantFrom(...zones), (t, zone) => {
        expect(localDateKey(t, zone)).toBe(format(t, 'yyyy-MM-dd', { in: tz(zone) }));
      }),
      { numRuns: 500 },
    );
  });

  it('start of the local day (property)', () => {
    fc.assert(
      fc.property(instant, fc.constantFrom(...zones), (t, zone) => {
        const key = localDateKey(t, zone);
        expect(startOfLocalDay(key, zone)).toBe(startOfDay(t, { in: tz(zone) }).getTime());
      }),
      { numRuns: 500 },
    );
  });

  it('the length of every day of 2027 in the listed zones, DST days included', () => {
    const odd: string[] = [];
    for (const zone of zones) {
      for (let day = 0; day < 365; day++) {
        const key = addDaysToKey('2027-01-01', day);
        const hours = (startOfLocalDay(addDaysToKey(key, 1), zone) - startOfLocalDay(key, zone)) / 3_600_000;
        expect(hours).toBe(referenceDayHours(key, zone));
        if (hours !== 24) odd.push(`${zone} ${key} ${hours}`);
      }
    }
    // The sweep did meet the daylight-saving days it is meant to check.
    expect(odd).toEqual(expect.arrayContaining([`${LA} 2027-03-14 23`, `${LA} 2027-11-07 25`, 'Australia/Lord_Howe 2027-04-04 24.5']));
  });

  it('a zone whose DST skips midnight itself (America/Santiago): the day starts at the jump', () => {
    // In Chile the clock goes from 23:59:59 to 01:00 at the September change, so local 00:00 does not
    // exist; the day begins at the first instant whose local date is that day. Found by scanning.
    for (let day = 0; day < 366; day++) {
      const key = addDaysToKey('2024-01-01', day);
      const start = startOfLocalDay(key, 'America/Santiago');
      expect(localDateKey(start, 'America/Santiago')).toBe(key);
      expect(localDateKey(start - 1000, 'America/Santiago')).toBe(addDaysToKey(key, -1));
    }
  });
});

describe('headDaysFromMoves: properties', () => {
  const zone = fc.constantFrom('UTC', LA, 'Europe/London', 'Australia/Lord_Howe', 'Asia/Kathmandu', 'America/Santiago');
  // Random stays across 2027 in whole minutes, with changes that never drop the count below zero.
  const stay = fc
    .record({
      start: fc.integer({ min: Date.UTC(2027, 0, 1) / 60_000, max: Date.UTC(2027, 11, 1) / 60_000 }),
      steps: fc.array(fc.record({ gapMin: fc.integer({ min: 0, max: 3 * 24 * 60 }), change: fc.integer({ min: -500, max: 800 }) }), {
        minLength: 1,
        maxLength: 25,
      }),
      tailMin: fc.integer({ min: 0, max: 5 * 24 * 60 }),
    })
    .map(({ start, steps, tailMin }) => {
      let t = start * 60_000;
      let count = 0;
      const moves: Array<{ at: string; change: number }> = [];
      for (const s of steps) {
        t += s.gapMin * 60_000;
        const change = Math.max(s.change, -count) || 1;
        count += change;
        moves.push({ at: new Date(t).toISOString(), change });
      }
      return { moves, until: new Date(t + tailMin * 60_000).toISOString() };
    });

  /** Straight integration, no day splitting: Σ count × elapsed ms ÷ 86 400 000. */
  function exactHeadDays(moves: Array<{ at: string; change: number }>, until: string): number {
    let total = 0;
    let count = 0;
    moves.forEach((m, i) => {
      count += m.change;
      const end = i + 1 < moves.length ? Date.parse(moves[i + 1].at) : Date.parse(until);
      total += count * (end - Date.parse(m.at));
    });
    return total / MS_PER_DAY;
  }

  it('headDays is the exact integral rounded to 4 decimals, and the days add up to it', () => {
    fc.assert(
      fc.property(stay, zone, ({ moves, until }, timeZone) => {
        const r = headDaysFromMoves({ moves, until, timeZone });
        const exact = exactHeadDays(moves, until);
        expect(Math.abs(r.headDays - exact)).toBeLessThanOrEqual(0.00005 + 1e-9);
        expect(sumUnits(r.byDay)).toBe(units(r.headDays));
        expect(Math.abs(r.byDay.reduce((a, d) => a + d.headDays, 0) - r.headDays)).toBeLessThan(1e-6);
        // Dates are consecutive local days in the zone.
        r.byDay.forEach((d, i) => {
          if (i > 0) expect(d.date).toBe(addDaysToKey(r.byDay[i - 1].date, 1));
          // Each value is the double nearest a whole number of ten-thousandths.
          expect(d.headDays).toBe(units(d.headDays) / 10 ** HEAD_DAY_DECIMALS);
        });
        if (r.byDay.length > 0) {
          expect(r.byDay[0].date).toBe(format(Date.parse(moves[0].at), 'yyyy-MM-dd', { in: tz(timeZone) }));
        }
      }),
      { numRuns: 200 },
    );
  });

  it('each day is within 0.0001 of its own exact integral', () => {
    fc.assert(
      fc.property(stay, zone, ({ moves, until }, timeZone) => {
        const r = headDaysFromMoves({ moves, until, timeZone });
        for (const d of r.byDay) {
          // Exact head-days inside the reference's local day [start, next start).
          const [y, m, dd] = d.date.split('-').map(Number);
          const dayStart = startOfDay(new TZDate(y, m - 1, dd, 12, timeZone)).getTime();
          const dayEnd = startOfDay(addDays(new TZDate(dayStart, timeZone), 1)).getTime();
          let within = 0;
          let count = 0;
          moves.forEach((mv, i) => {
            count += mv.change;
            const a = Math.max(Date.parse(mv.at), dayStart);
            const b = Math.min(i + 1 < moves.length ? Date.parse(moves[i + 1].at) : Date.parse(until), dayEnd);
            if (b > a) within += count * (b - a);
          });
          expect(Math.abs(d.headDays - within / MS_PER_DAY)).toBeLessThanOrEqual(0.0001 + 1e-9);
        }
      }),
      { numRuns: 100 },
    );
  });
});

describe('headDaysFromMoves: refused input', () => {
  const expectField = (fn: () => unknown, field: string) => {
    let caught: unknown;
    try {
      fn();
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(GrazingInputError);
    expect((caught as GrazingInputError).field).toBe(field);
  };

  it('moves out of order', () => {
    expectField(
      () =>
        headDaysFromMoves({
          moves: [
            { at: '2027-01-02T00:00:00Z', change: 5 },
            { at: '2027-01-01T00:00:00Z', change: 5 },
          ],
          until: '2027-01-03T00:00:00Z',
        }),
      'moves[1].at',
    );
  });

  it('a change that takes the count below zero', () => {
    expectField(
      () =>
        headDaysFromMoves({
          moves: [
            { at: '2027-01-01T00:00:00Z', change: 5 },
            { at: '2027-01-01T06:00:00Z', change: -3 },
            { at: '2027-01-02T00:00:00Z', change: -3 },
          ],
          until: '2027-01-03T00:00:00Z',
        }),
      'moves[2].change',
    );
  });

  it('until before the last move, a bad instant, a fractional change, an unknown zone', () => {
    const moves = [{ at: '2027-01-02T00:00:00Z', change: 5 }];
    expectField(() => headDaysFromMoves({ moves, until: '2027-01-01T00:00:00Z' }), 'until');
    expectField(() => headDaysFromMoves({ moves: [{ at: '2027-01-02 00:00', change: 5 }], until: '2027-01-03T00:00:00Z' }), 'moves[0].at');
    expectField(() => headDaysFromMoves({ moves: [{ at: '2027-01-02T00:00:00', change: 5 }], until: '2027-01-03T00:00:00Z' }), 'moves[0].at');
    expectField(() => headDaysFromMoves({ moves: [{ at: '2027-01-02T00:00:00Z', change: 1.5 }], until: '2027-01-03T00:00:00Z' }), 'moves[0].change');
    expectField(() => headDaysFromMoves({ moves, until: '2027-01-03T00:00:00Z', timeZone: 'Mars/Olympus_Mons' }), 'timeZone');
  });
});
