import { localDateKey, parseIsoInstant } from '../dates';
import { formatDay, formatNumber } from '../format';
import { GrazingInputError } from './errors';
import { headDaysFromMoves } from './head-days';

// A grazing log read day by day, as the printed record and the log screen show it: for each local calendar
// day at the block, the head on the block when the day ended, the head-days earned that day (the same
// headDaysFromMoves the invoice uses, split at the block's local midnights), and that day's entries with
// the flags a reader must not miss. Flags never change a number; they point at entries to look at.

export type LogEntryKind = 'move' | 'tally' | 'observation';

export interface LogEntryFacts {
  /** ISO 8601 instant with offset. */
  at: string;
  kind: LogEntryKind;
  /** A move: animals in (+n) or out (−n). */
  change?: number | null;
  /** A tally: animals counted on the block (a check; head-days come from moves only). */
  count?: number | null;
  /** Stubble left, inches. */
  residualHeightIn?: number | null;
  /** Estimated share of the forage taken so far, %. */
  takenPct?: number | null;
  waterChecked?: boolean | null;
  fenceChecked?: boolean | null;
  note?: string | null;
  /** Display name of whoever wrote the entry. */
  by?: string | null;
  /** Flags the caller already knows (e.g. "written 3 days after the fact", "corrected by the grazier"). */
  flags?: readonly string[];
}

export interface LogDayEntry extends LogEntryFacts {
  /** The caller's flags plus those computed here. */
  flags: string[];
}

export interface LogDay {
  /** Local calendar day at the block, 'YYYY-MM-DD'. */
  date: string;
  /** Head on the block at the end of the day (or at `until` on the last day). */
  headAtEnd: number;
  /** Head-days earned that day, 4 decimals (the parts add up exactly to the total). */
  headDays: number;
  entries: LogDayEntry[];
  /** About the day itself, e.g. animals still on the block after the out-by date. */
  flags: string[];
}

export interface LogDaysInput {
  entries: readonly LogEntryFacts[];
  /** ISO instant with offset at which counting stops (now, or when the last animals left). */
  until: string;
  /** The block's IANA zone. */
  timeZone: string;
  /** The contract's animals-out-by day, 'YYYY-MM-DD'. */
  outBy: string;
}

export interface LogDaysResult {
  days: LogDay[];
  /** Total head-days from the moves, rounded half-up to 0.0001 (headDaysFromMoves). */
  headDays: number;
  /** How many entries and days carry at least one flag. */
  flaggedCount: number;
}

/** The flag for an entry dated after the out-by day; exported so screens and the PDF say it the same way. */
export function afterOutByFlag(outBy: string): string {
  return `After the animals-out-by date (${formatDay(outBy)})`;
}

export function logDays(input: LogDaysInput): LogDaysResult {
  const parsed = input.entries.map((e, i) => {
    const t = parseIsoInstant(e.at);
    if (t === null) throw new GrazingInputError(`entries[${i}].at`, 'Entry time must be a date and time with a UTC offset');
    return { e, t, i };
  });
  // Entries in time order; entries at the same instant keep the order they were written in.
  parsed.sort((a, b) => a.t - b.t || a.i - b.i);

  const moves = parsed.filter((p) => p.e.kind === 'move' && typeof p.e.change === 'number' && p.e.change !== 0);
  const counted = headDaysFromMoves({
    moves: moves.map((p) => ({ at: p.e.at, change: p.e.change as number })),
    until: input.until,
    timeZone: input.timeZone,
  });

  const byDate = new Map<string, LogDay>();
  const dayOf = (date: string): LogDay => {
    let d = byDate.get(date);
    if (!d) {
      d = { date, headAtEnd: 0, headDays: 0, entries: [], flags: [] };
      byDate.set(date, d);
    }
    return d;
  };
  for (const b of counted.byDay) dayOf(b.date).headDays = b.headDays;

  // Walk the entries once, keeping the head count the moves give, to fill each day's end count and to
  // check tallies against it.
  let head = 0;
  for (const { e, t } of parsed) {
    const date = localDateKey(t, input.timeZone);
    const flags = [...(e.flags ?? [])];
    if (e.kind === 'move' && typeof e.change === 'number') head += e.change;
    if (date > input.outBy) flags.push(afterOutByFlag(input.outBy));
    if (e.kind === 'tally' && typeof e.count === 'number' && e.count !== head) {
      flags.push(`Tally of ${formatNumber(e.count)} differs from the ${formatNumber(head)} head the moves put on the block`);
    }
    dayOf(date).entries.push({ ...e, flags });
  }

  const days = [...byDate.values()].sort((a, b) => (a.date < b.date ? -1 : 1));
  head = 0;
  let next = 0;
  for (const day of days) {
    while (next < moves.length && localDateKey(moves[next].t, input.timeZone) <= day.date) {
      head += moves[next].e.change as number;
      next += 1;
    }
    day.headAtEnd = head;
    if (day.date > input.outBy && day.headDays > 0) {
      day.flags.push(`Animals on the block after the out-by date (${formatDay(input.outBy)})`);
    }
  }

  const flaggedCount = days.reduce((n, d) => n + (d.flags.length > 0 ? 1 : 0) + d.entries.filter((e) => e.flags.length > 0).length, 0);
  return { days, headDays: counted.headDays, flaggedCount };
}
