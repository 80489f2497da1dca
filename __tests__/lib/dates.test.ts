import { tz } from '@date-fns/tz';
import { format } from 'date-fns';
import fc from 'fast-check';
import { addDaysToKey, isAfterLocalDay, isValidTimeZone, localDateKey, parseIsoInstant, timeZoneOffsetMs } from '../../lib/dates';

describe('parseIsoInstant', () => {
  it('reads instants with an offset, agreeing with Date.parse', () => {
    for (const text of ['2027-03-08T07:30:00-08:00', '2027-03-08T15:30:00Z', '2027-03-08T15:30Z', '2027-03-08T21:00:00.125+05:30', '2027-03-08T15:30:00.1234567Z']) {
      expect(parseIsoInstant(text)).toBe(Date.parse(text));
    }
  });

  it('round-trips any instant written by toISOString (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(1000, 0, 1), max: Date.UTC(9999, 11, 31) }), (t) => {
        expect(parseIsoInstant(new Date(t).toISOString())).toBe(t);
      }),
    );
  });

  it('refuses local times without an offset and impossible dates', () => {
    for (const text of ['2027-03-08T07:30:00', '2027-03-08', '2027-02-29T00:00:00Z', '2027-04-31T00:00:00Z', '2027-03-08T24:00:00Z', '2027-03-08T07:60:00Z', '2027-03-08T07:30:00+19:00', ' 2027-03-08T07:30:00Z', 12 as unknown as string]) {
      expect(parseIsoInstant(text)).toBeNull();
    }
    expect(parseIsoInstant('2028-02-29T00:00:00Z')).toBe(Date.UTC(2028, 1, 29));
  });
});

describe('calendar helpers', () => {
  it('adds days across month and year ends, and leap days', () => {
    expect(addDaysToKey('2027-12-31', 1)).toBe('2028-01-01');
    expect(addDaysToKey('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDaysToKey('2028-03-01', -1)).toBe('2028-02-29');
  });

  it('knows IANA zones and refuses others', () => {
    expect(isValidTimeZone('America/Los_Angeles')).toBe(true);
    expect(isValidTimeZone('UTC')).toBe(true);
    expect(isValidTimeZone('Mars/Olympus_Mons')).toBe(false);
    expect(isValidTimeZone('+05:00')).toBe(false);
    expect(isValidTimeZone('')).toBe(false);
  });

  it('offsets agree with date-fns/@date-fns/tz (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(2000, 0, 1), max: Date.UTC(2040, 0, 1) }),
        fc.constantFrom('America/Los_Angeles', 'Asia/Kathmandu', 'Australia/Lord_Howe', 'Europe/Dublin'),
        (t, zone) => {
          // "xxx" prints the zone's offset at that instant, e.g. "-08:00".
          const text = format(t, 'xxx', { in: tz(zone) });
          const sign = text[0] === '-' ? -1 : 1;
          const minutes = Number(text.slice(1, 3)) * 60 + Number(text.slice(4, 6));
          expect(timeZoneOffsetMs(t, zone)).toBe(sign * minutes * 60_000);
        },
      ),
    );
  });
});

describe('isAfterLocalDay', () => {
  test('It answers exactly localDateKey(t) > day, near the day’s end in any zone (DST days included) and far from it', () => {
    const zones = ['America/Los_Angeles', 'Pacific/Kiritimati', 'Pacific/Pago_Pago', 'America/Santiago', 'Australia/Lord_Howe', 'UTC'];
    const days = ['2027-03-14', '2027-11-07', '2026-09-06', '2027-04-04', '2027-01-15'];
    for (const zone of zones) {
      for (const day of days) {
        const end = Date.parse(`${day}T00:00:00Z`) + 86_400_000;
        // Every 20 minutes across two days either side of the UTC end of the day, and a few far away.
        const instants = [end - 40 * 86_400_000, end + 40 * 86_400_000];
        for (let t = end - 2 * 86_400_000; t <= end + 2 * 86_400_000; t += 20 * 60_000) instants.push(t, t + 59_999);
        for (const t of instants) expect([zone, day, t, isAfterLocalDay(t, day, zone)]).toEqual([zone, day, t, localDateKey(t, zone) > day]);
      }
    }
  });
});
