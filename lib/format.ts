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
