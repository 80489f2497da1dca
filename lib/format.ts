// Display formatting shared by screens, PDFs and mail. US-style grouping; the trade's units after a thin space.

export function formatNumber(value: number, maxDecimals = 0): string {
  if (!Number.isFinite(value)) return '—';
  return value.toLocaleString('en-US', { maximumFractionDigits: maxDecimals, minimumFractionDigits: 0 });
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
