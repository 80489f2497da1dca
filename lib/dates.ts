import { GrazingInputError } from './grazing/errors';

// Calendar arithmetic in an IANA time zone with nothing but `Intl.DateTimeFormat`, so lib/ stays free of
// date libraries and runs the same in the server (Node, full ICU) and the app (Hermes / browsers).
// Instants are epoch milliseconds; calendar days are 'YYYY-MM-DD' strings (ISO 8601, proleptic Gregorian).

const MS_PER_DAY = 86_400_000;

// ISO 8601 instant with an explicit offset: a moment, never a floating local time. Seconds and
// fractions are optional; years are limited to four digits.
const ISO_INSTANT = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?(Z|[+-](\d{2}):?(\d{2}))$/;
const DATE_KEY = /^(\d{4})-(\d{2})-(\d{2})$/;

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/**
 * Epoch ms of an ISO 8601 instant with offset ("2027-03-14T00:00:00-08:00", "…Z"), or null if the text is
 * not one or names an impossible time (Feb 30, 25:00, offset beyond ±18:00). Fractions beyond a
 * millisecond are truncated (Date has no finer resolution).
 */
export function parseIsoInstant(text: unknown): number | null {
  if (typeof text !== 'string') return null;
  const m = ISO_INSTANT.exec(text);
  if (!m) return null;
  const [, y, mo, d, h, mi, s = '0', frac = '', zone, oh = '0', om = '0'] = m;
  const year = Number(y);
  const month = Number(mo);
  const day = Number(d);
  const hour = Number(h);
  const minute = Number(mi);
  const second = Number(s);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  if (hour > 23 || minute > 59 || second > 59) return null;
  const offsetMinutes = zone === 'Z' ? 0 : (zone[0] === '-' ? -1 : 1) * (Number(oh) * 60 + Number(om));
  if (Number(om) > 59 || Math.abs(offsetMinutes) > 18 * 60) return null;
  const ms = Number(frac.padEnd(3, '0').slice(0, 3));
  const wall = Date.UTC(year, month - 1, day, hour, minute, second, ms);
  // Date.UTC maps years 0–99 to 1900–1999; setUTCFullYear puts them back where ISO 8601 means them.
  const fixed = year < 100 ? new Date(wall).setUTCFullYear(year) : wall;
  return fixed - offsetMinutes * 60_000;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    // en-US with h23 gives plain ASCII digits and hours 0–23 (hour12:false alone can print "24").
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** True when `Intl` knows the zone (IANA names and links such as "America/Los_Angeles", "UTC"). */
export function isValidTimeZone(timeZone: unknown): timeZone is string {
  // Some engines also accept offset strings ("+05:00") as zones; we want named zones whose rules follow DST.
  if (typeof timeZone !== 'string' || !/^[A-Za-z]/.test(timeZone)) return false;
  try {
    formatterFor(timeZone);
    return true;
  } catch {
    return false;
  }
}

function requireTimeZone(timeZone: string): void {
  if (!isValidTimeZone(timeZone)) throw new GrazingInputError('timeZone', 'Time zone must be an IANA name such as America/Los_Angeles');
}

interface WallTime {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

function wallTime(instantMs: number, timeZone: string): WallTime {
  // Years of the common era only (the ISO parser accepts four-digit years; grazing logs are modern).
  const w: WallTime = { year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0 };
  for (const p of formatterFor(timeZone).formatToParts(new Date(instantMs))) {
    switch (p.type) {
      case 'year':
      case 'month':
      case 'day':
      case 'minute':
      case 'second':
        w[p.type] = Number(p.value);
        break;
      case 'hour':
        w.hour = Number(p.value) % 24;
        break;
    }
  }
  return w;
}

function utcFromWall(w: WallTime): number {
  const d = new Date(0);
  d.setUTCFullYear(w.year, w.month - 1, w.day);
  d.setUTCHours(w.hour, w.minute, w.second, 0);
  return d.getTime();
}

/** Offset of local wall time from UTC at `instantMs` in ms (e.g. −8 h in Los Angeles in winter). */
export function timeZoneOffsetMs(instantMs: number, timeZone: string): number {
  requireTimeZone(timeZone);
  // Intl prints whole seconds, so compare against the instant truncated to its second.
  const wholeSecond = instantMs - (((instantMs % 1000) + 1000) % 1000);
  return utcFromWall(wallTime(wholeSecond, timeZone)) - wholeSecond;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, '0');
}

function dateKeyOf(year: number, month: number, day: number): string {
  return `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`;
}

/** Local calendar date ('YYYY-MM-DD') of an instant in `timeZone`. */
export function localDateKey(instantMs: number, timeZone: string): string {
  requireTimeZone(timeZone);
  const w = wallTime(instantMs, timeZone);
  return dateKeyOf(w.year, w.month, w.day);
}

/** Local UTC offsets lie within this (the tz database has −12 h … +14 h); a bound for the shortcut below. */
const MAX_OFFSET_MS = 18 * 3_600_000;

/**
 * localDateKey(instantMs, timeZone) > dateKey, without asking Intl for instants more than a day from that
 * date's end (whatever the zone's offset, their local date is certain): a log compares every entry with its
 * end and out-by dates, and nearly all of them are days away.
 */
export function isAfterLocalDay(instantMs: number, dateKey: string, timeZone: string): boolean {
  // Midnight after dateKey as if it were UTC: local wall time at instantMs is instantMs + offset.
  const wallEnd = parseDateKeyUtc(dateKey) + MS_PER_DAY;
  if (instantMs + MAX_OFFSET_MS < wallEnd) return false;
  if (instantMs - MAX_OFFSET_MS >= wallEnd) return true;
  return localDateKey(instantMs, timeZone) > dateKey;
}

function parseDateKeyUtc(dateKey: string): number {
  const { year, month, day } = parseDateKey(dateKey);
  return utcFromWall({ year, month, day, hour: 0, minute: 0, second: 0 });
}

function parseDateKey(dateKey: string): { year: number; month: number; day: number } {
  const m = DATE_KEY.exec(dateKey);
  if (!m) throw new GrazingInputError('date', 'Date must look like 2027-01-15');
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) {
    throw new GrazingInputError('date', 'Date is not a real calendar day');
  }
  return { year, month, day };
}

/** The calendar date `days` after (or before, if negative) `dateKey`. */
export function addDaysToKey(dateKey: string, days: number): string {
  const { year, month, day } = parseDateKey(dateKey);
  const d = new Date(utcFromWall({ year, month, day, hour: 0, minute: 0, second: 0 }) + days * MS_PER_DAY);
  return dateKeyOf(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate());
}

/**
 * UTC instant (epoch ms) at which the local calendar day `dateKey` begins in `timeZone`.
 *
 * Normally that is local 00:00, found by iterating: guess = wall − offset(guess) until the offset stops
 * changing (at most a couple of rounds, since an offset changes at most once near any midnight). Where
 * a DST jump skips midnight itself (e.g. America/Santiago, Asia/Beirut), the day begins at the jump,
 * the first instant whose local date is `dateKey`; a binary search on whole seconds finds it.
 * Where midnight happens twice (a fall-back at 01:00 to 00:00), the earlier one starts the day.
 */
export function startOfLocalDay(dateKey: string, timeZone: string): number {
  const key = `${timeZone} ${dateKey}`;
  let start = dayStarts.get(key);
  if (start === undefined) {
    start = findStartOfLocalDay(dateKey, timeZone);
    // A log's figures and its PDF ask for the same few hundred days again and again: keep the answers (bounded).
    if (dayStarts.size >= MAX_DAY_STARTS) dayStarts.clear();
    dayStarts.set(key, start);
  }
  return start;
}

const MAX_DAY_STARTS = 20_000;
const dayStarts = new Map<string, number>();

function findStartOfLocalDay(dateKey: string, timeZone: string): number {
  requireTimeZone(timeZone);
  const { year, month, day } = parseDateKey(dateKey);
  const wall = utcFromWall({ year, month, day, hour: 0, minute: 0, second: 0 });

  const before = timeZoneOffsetMs(wall - MS_PER_DAY, timeZone);
  const after = timeZoneOffsetMs(wall + MS_PER_DAY, timeZone);
  if (before === after) {
    // No offset change within a day either side (nearly every day): local 00:00 is wall − offset.
    const t = wall - before;
    if (utcFromWall(wallTime(t, timeZone)) === wall) return t;
  }

  const candidates = new Set<number>();
  for (const seed of [wall - MS_PER_DAY, wall, wall + MS_PER_DAY]) {
    let guess = wall - timeZoneOffsetMs(seed, timeZone);
    for (let i = 0; i < 4; i++) {
      const next = wall - timeZoneOffsetMs(guess, timeZone);
      if (next === guess) break;
      guess = next;
    }
    candidates.add(guess);
  }
  const exact = [...candidates].filter((t) => utcFromWall(wallTime(t, timeZone)) === wall).sort((a, b) => a - b);
  // A fall-back across midnight can make 00:00 occur twice; the day starts at the first one.
  if (exact.length > 0) return exact[0];

  // Midnight does not exist locally on this date: search the first whole second whose date is dateKey.
  // Offsets lie within ±18 h, so two days either side bracket the answer.
  let lo = Math.floor((wall - 2 * MS_PER_DAY) / 1000); // local date before dateKey
  let hi = Math.floor((wall + 2 * MS_PER_DAY) / 1000); // local date after or on dateKey
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (localDateKey(mid * 1000, timeZone) >= dateKey) hi = mid;
    else lo = mid;
  }
  return hi * 1000;
}
