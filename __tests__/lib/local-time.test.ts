import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import fc from 'fast-check';
import { formatMoment, instantFromWallTime, isoInZone, wallTimeIn } from '../../lib/local-time';

// Reference: date-fns 4 with @date-fns/tz (an independent implementation of IANA zone rules).
const LA = 'America/Los_Angeles';
const ZONES = [LA, 'America/Denver', 'Australia/Adelaide', 'Asia/Kathmandu', 'Europe/London', 'UTC'];

describe('Wall time at the block', () => {
  it('When a grazier types 07:30 on Jan 20 in California, then the log gets 07:30 at −08:00', () => {
    const t = instantFromWallTime('2027-01-20T07:30', LA)!;
    expect(new Date(t).toISOString()).toBe('2027-01-20T15:30:00.000Z');
    expect(isoInZone(t, LA)).toBe('2027-01-20T07:30:00-08:00');
    expect(formatMoment(t, LA)).toBe('Jan 20, 7:30 AM');
  });

  it('When the wall time falls in the hour spring-forward skips, then the clock before the jump is used', () => {
    // 2027-03-14 02:30 does not exist in Los Angeles (clocks go 02:00 → 03:00): read as 03:30 daylight time.
    const t = instantFromWallTime('2027-03-14T02:30', LA)!;
    expect(isoInZone(t, LA)).toBe('2027-03-14T03:30:00-07:00');
  });

  it('When the wall time is repeated by a fall-back, then the earlier instant is taken', () => {
    const t = instantFromWallTime('2027-11-07T01:30', LA)!;
    expect(isoInZone(t, LA)).toBe('2027-11-07T01:30:00-07:00');
  });

  it('When the text is not a wall time, then there is no instant', () => {
    expect(instantFromWallTime('2027-02-30T07:00', LA)).toBeNull();
    expect(instantFromWallTime('2027-01-20 07:00', LA)).toBeNull();
    expect(instantFromWallTime('2027-01-20T24:00', LA)).toBeNull();
  });

  it('wall time and ISO text agree with date-fns/@date-fns/tz, and wall → instant → wall round-trips (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: Date.UTC(2020, 0, 1) / 60_000, max: Date.UTC(2035, 0, 1) / 60_000 }), fc.constantFrom(...ZONES), (minute, zone) => {
        const ms = minute * 60_000;
        const ref = new TZDate(ms, zone);
        expect(wallTimeIn(ms, zone)).toBe(format(ref, "yyyy-MM-dd'T'HH:mm"));
        expect(isoInZone(ms, zone)).toBe(format(ref, "yyyy-MM-dd'T'HH:mm:ssxxx"));
        expect(Date.parse(isoInZone(ms, zone))).toBe(ms);
        const back = instantFromWallTime(wallTimeIn(ms, zone), zone)!;
        // The same wall time, and the same instant except in a repeated fall-back hour (then the earlier one).
        expect(wallTimeIn(back, zone)).toBe(wallTimeIn(ms, zone));
        expect(back).toBeLessThanOrEqual(ms);
      }),
      { numRuns: 400 },
    );
  });
});
