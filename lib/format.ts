// Display formatting shared by screens, PDFs and mail. US-style grouping; the trade's units after a thin space.

// toLocaleString builds a new formatter on every call; a printed log formats thousands of numbers.
const numberFormats = new Map<number, Intl.NumberFormat>();

export function formatNumber(value: number, maxDecimals = 0): string {
  if (!Number.isFinite(value)) return '—';
  let f = numberFormats.get(maxDecimals);
  if (!f) {
    f = new Intl.NumberFormat('en-US', { maximumFractionDigits: maxDecimals, minimumFractionDigits: 0 });
    numberFormats.set(maxDecimals, f);
  }
  return f.format(value);
}

/** Whole days of feed, rounded down: a block is never promised for a day it cannot feed. */
export function formatWholeDays(days: number): string {
  if (!Number.isFinite(days)) return '—';
  const whole = Math.floor(days + 1e-9);
  return `${formatNumber(whole)} day${whole === 1 ? '' : 's'}`;
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** 'YYYY-MM-DD' → "Jan 12, 2027" (a calendar day, so no time zone is involved). */
export function formatDay(key: string | null | undefined): string {
  if (!key) return '—';
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(key);
  if (!m) return key;
  return `${MONTHS[Number(m[2]) - 1]} ${Number(m[3])}, ${m[1]}`;
}

/** A short range: "Jan 12 – Mar 3, 2027", or with both years when they differ. */
export function formatDayRange(from: string, to: string): string {
  if (from.slice(0, 4) === to.slice(0, 4)) return `${formatDay(from).replace(/, \d{4}$/, '')} – ${formatDay(to)}`;
  return `${formatDay(from)} – ${formatDay(to)}`;
}

/** The first 8 letters and digits of an id ("7c1e2f4a"), as file names, footers and screens quote a record. */
export function shortId(id: string): string {
  return id.replace(/[^A-Za-z0-9]/g, '').slice(0, 8).toLowerCase();
}
