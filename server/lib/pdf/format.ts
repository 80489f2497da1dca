import { localDateKey, parseIsoInstant } from '../../../lib/dates';
import { formatDay } from '../../../lib/format';

export { shortId } from '../../../lib/format';

// Times on a printed record are in the block's zone, with the zone named, since the two parties and whoever
// reads the file later may sit elsewhere.

const clocks = new Map<string, Intl.DateTimeFormat>();
const clocks24 = new Map<string, Intl.DateTimeFormat>();

function clockIn(timeZone: string): Intl.DateTimeFormat {
  let f = clocks.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, hour: 'numeric', minute: '2-digit', hour12: true, timeZoneName: 'short' });
    clocks.set(timeZone, f);
  }
  return f;
}

function instant(iso: string): number {
  const t = parseIsoInstant(iso);
  if (t === null) throw new Error(`Not an ISO instant with offset: ${iso}`);
  return t;
}

/** "Mar 3, 2027, 9:02 AM PST" in `timeZone`. */
export function formatMoment(iso: string, timeZone: string): string {
  const t = instant(iso);
  const parts = clockIn(timeZone).formatToParts(new Date(t));
  const get = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
  return `${formatDay(localDateKey(t, timeZone))}, ${get('hour')}:${get('minute')} ${get('dayPeriod')} ${get('timeZoneName')}`;
}

/** "07:30" — the local 24-hour clock, for the log table where the date is in its own column. */
export function formatClock(iso: string, timeZone: string): string {
  let f = clocks24.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    clocks24.set(timeZone, f);
  }
  return f.format(new Date(instant(iso)));
}
