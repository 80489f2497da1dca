import { addDaysToKey, localDateKey } from './dates';

// Calendar days as 'YYYY-MM-DD' strings (ISO 8601 dates, proleptic Gregorian): blocks, bids and contracts
// agree on days, not instants. For four-digit years the text order is the date order, so two keys
// compare with plain `<`. Instants become days only through a named IANA zone (the block's), via lib/dates.

export const DAY_KEY_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Years a Fieldfold date may fall in; anything else is a typing slip (2207 for 2027), not a plan. */
export const MIN_YEAR = 2000;
export const MAX_YEAR = 2100;

/** True for a real calendar day written as 'YYYY-MM-DD' (no 2027-02-30, no 2027-13-01). */
export function isDayKey(value: unknown): value is string {
  if (typeof value !== 'string') return false;
  const m = DAY_KEY_PATTERN.exec(value);
  if (!m) return false;
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  if (month < 1 || month > 12 || day < 1) return false;
  return day <= new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function utcMidnight(key: string): number {
  const m = DAY_KEY_PATTERN.exec(key);
  if (!m || !isDayKey(key)) throw new RangeError(`Not a calendar day: ${key}`);
  const d = new Date(0);
  // setUTCFullYear keeps years 0–99 where ISO 8601 means them (Date.UTC would map them to 19xx).
  d.setUTCFullYear(Number(m[1]), Number(m[2]) - 1, Number(m[3]));
  return d.getTime();
}

/** Whole calendar days from `from` to `to` (negative when `to` is earlier). Days, not 24-hour spans: DST does not enter. */
export function daysBetween(from: string, to: string): number {
  return Math.round((utcMidnight(to) - utcMidnight(from)) / 86_400_000);
}

/** The calendar day `days` after `key`. */
export function addDays(key: string, days: number): string {
  return addDaysToKey(key, days);
}

export function laterDay(a: string, b: string): string {
  return a >= b ? a : b;
}

export function earlierDay(a: string, b: string): string {
  return a <= b ? a : b;
}

/** Today's date at the block, e.g. what "the out-by date has passed" means to the people standing there. */
export function todayIn(timeZone: string, nowMs: number): string {
  return localDateKey(nowMs, timeZone);
}
