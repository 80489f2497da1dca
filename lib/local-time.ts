import { localDateKey, parseIsoInstant, timeZoneOffsetMs } from './dates';

// Wall-clock times at the block. A grazier in the truck reads the time off their phone and means the time
// where the animals are (the block's IANA zone), so entries are typed as local wall time, sent as an ISO 8601
// instant with the block's offset, and shown back in the block's zone — never the browser's.

const MS_PER_DAY = 86_400_000;
const WALL = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;

function pad(n: number, width = 2): string {
  return String(Math.abs(n)).padStart(width, '0');
}

/** "YYYY-MM-DDTHH:MM" — the value an `<input type="datetime-local">` holds — for an instant in `timeZone`. */
export function wallTimeIn(instantMs: number, timeZone: string): string {
  const local = new Date(instantMs + timeZoneOffsetMs(instantMs, timeZone));
  return `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())}T${pad(local.getUTCHours())}:${pad(local.getUTCMinutes())}`;
}

/**
 * The instant a wall time "YYYY-MM-DDTHH:MM" names in `timeZone`, or null if the text is not one.
 * In the hour a spring-forward skips, the clock before the jump is used (02:30 becomes 03:30 daylight time);
 * in the hour a fall-back repeats, the earlier of the two instants is taken.
 */
export function instantFromWallTime(wall: string, timeZone: string): number | null {
  const m = WALL.exec(wall);
  if (!m) return null;
  const [year, month, day, hour, minute] = m.slice(1).map(Number);
  if (month < 1 || month > 12 || day < 1 || day > new Date(Date.UTC(year, month, 0)).getUTCDate() || hour > 23 || minute > 59) return null;
  const asUtc = Date.UTC(year, month - 1, day, hour, minute);
  const before = asUtc - timeZoneOffsetMs(asUtc - MS_PER_DAY, timeZone);
  const after = asUtc - timeZoneOffsetMs(asUtc + MS_PER_DAY, timeZone);
  const exact = [before, after, asUtc - timeZoneOffsetMs(asUtc, timeZone)].filter((t) => wallTimeIn(t, timeZone) === wall);
  return exact.length > 0 ? Math.min(...exact) : before;
}

/** "2027-01-20T07:30:00-08:00": the instant with the block's offset at that moment, as the log API wants it. */
export function isoInZone(instantMs: number, timeZone: string): string {
  const whole = Math.floor(instantMs / 1000) * 1000;
  const offsetMin = Math.round(timeZoneOffsetMs(whole, timeZone) / 60_000);
  const sign = offsetMin < 0 ? '-' : '+';
  return `${wallTimeIn(whole, timeZone)}:${pad(new Date(whole).getUTCSeconds())}${sign}${pad(Math.trunc(offsetMin / 60))}:${pad(offsetMin % 60)}`;
}

const timeFormatters = new Map<string, Intl.DateTimeFormat>();

function clockIn(instantMs: number, timeZone: string): string {
  let f = timeFormatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, hour: 'numeric', minute: '2-digit', hourCycle: 'h12' });
    timeFormatters.set(timeZone, f);
  }
  return f.format(new Date(instantMs));
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "Jan 20, 7:30 AM" at the block (the year is left out: a log covers weeks, not years). */
export function formatMoment(at: string | number, timeZone: string): string {
  const ms = typeof at === 'number' ? at : parseIsoInstant(at);
  if (ms === null || !Number.isFinite(ms)) return typeof at === 'string' ? at : '—';
  const key = localDateKey(ms, timeZone);
  return `${MONTHS[Number(key.slice(5, 7)) - 1]} ${Number(key.slice(8, 10))}, ${clockIn(ms, timeZone)}`;
}

/** "7:30 AM" at the block. */
export function formatClock(at: string | number, timeZone: string): string {
  const ms = typeof at === 'number' ? at : parseIsoInstant(at);
  if (ms === null || !Number.isFinite(ms)) return '—';
  return clockIn(ms, timeZone);
}
