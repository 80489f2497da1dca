import { addDaysToKey, isValidTimeZone, localDateKey, parseIsoInstant, startOfLocalDay } from '../dates';
import { GrazingInputError } from './errors';

export { GrazingInputError } from './errors';

// A head-day is one animal on the land for one day of 24 h. Head-days are the integral of the head count
// over time: Σ head × elapsed ms ÷ 86 400 000. They are billed on elapsed time, not calendar days, so a
// daylight-saving day of 23 or 25 local hours credits 23/24 or 25/24 of a head-day per animal: no hour
// is lost or counted twice.
//
// Precision policy (HEAD_DAY_DECIMALS = 4):
// - Internally everything is exact: instants are integer ms and head-ms are summed as BigInt.
// - `headDays` is the exact total rounded half-up to 0.0001 head-day.
// - Each `byDay` value is its exact day total rounded to 0.0001 by the largest-remainder method, so the
//   rounded days add up exactly (as whole ten-thousandths) to `headDays`, and each day is within 0.0001
//   of its exact value. Summing the returned floats may still show binary noise (e.g. 0.1 + 0.2), so
//   compare sums to a tolerance of about 1e-9 per day, or sum `Math.round(v * 10 000)`.

export const HEAD_DAY_DECIMALS = 4;
const UNITS_PER_HEAD_DAY = 10n ** BigInt(HEAD_DAY_DECIMALS);
const MS_PER_DAY = 86_400_000n;
/** head-ms in one 0.0001 head-day: 86 400 000 / 10 000. */
const HEAD_MS_PER_UNIT = MS_PER_DAY / UNITS_PER_HEAD_DAY;

export interface HeadCountMove {
  /** ISO 8601 instant with offset, e.g. "2027-03-08T07:30:00-08:00". */
  at: string;
  /** Animals in (+n) or out (−n). */
  change: number;
}

export interface HeadDaysInput {
  moves: HeadCountMove[];
  /** ISO 8601 instant with offset at which counting stops (animals still on are counted up to it). */
  until: string;
  /** IANA zone whose local midnights split `byDay`; default 'UTC'. Use the block's zone. */
  timeZone?: string;
}

export interface HeadDaysByDay {
  /** Local calendar date in `timeZone`, 'YYYY-MM-DD'. */
  date: string;
  headDays: number;
}

export interface HeadDaysResult {
  headDays: number;
  byDay: HeadDaysByDay[];
}

interface ParsedMove {
  t: number;
  change: number;
}

/**
 * Checks moves the way the request schema does and returns them as instants, so the server's 400 and the
 * function's error blame the same field. Moves at the same instant are allowed and applied in list order.
 */
export function parseMoves(moves: HeadCountMove[]): ParsedMove[] {
  if (!Array.isArray(moves)) throw new GrazingInputError('moves', 'Moves must be a list');
  const parsed: ParsedMove[] = [];
  let count = 0;
  moves.forEach((move, i) => {
    const t = parseIsoInstant(move?.at);
    if (t === null) {
      throw new GrazingInputError(`moves[${i}].at`, 'Move time must be a date and time with a UTC offset, like 2027-03-08T07:30:00-08:00');
    }
    if (!Number.isSafeInteger(move.change)) {
      throw new GrazingInputError(`moves[${i}].change`, 'Change must be a whole number of animals');
    }
    if (i > 0 && t < parsed[i - 1].t) {
      throw new GrazingInputError(`moves[${i}].at`, 'Moves must be in time order: this move is earlier than the one before it');
    }
    count += move.change;
    if (count < 0) {
      throw new GrazingInputError(`moves[${i}].change`, `This move takes out more animals than are on the block (${count - move.change})`);
    }
    parsed.push({ t, change: move.change });
  });
  return parsed;
}

/** Splits the exact per-day head-ms into 0.0001 head-day units that add up to the rounded total. */
function roundDays(headMsByDay: bigint[]): { totalUnits: bigint; dayUnits: bigint[] } {
  const total = headMsByDay.reduce((a, b) => a + b, 0n);
  // Half-up on a non-negative quantity: floor(x + ½).
  const totalUnits = (total * 2n + HEAD_MS_PER_UNIT) / (2n * HEAD_MS_PER_UNIT);
  const dayUnits = headMsByDay.map((ms) => ms / HEAD_MS_PER_UNIT);
  let missing = totalUnits - dayUnits.reduce((a, b) => a + b, 0n);
  // Hand the units lost to flooring to the days with the largest remainders; ties go to the earlier day.
  const order = headMsByDay
    .map((ms, i) => ({ i, rem: ms % HEAD_MS_PER_UNIT }))
    .filter((d) => d.rem > 0n)
    .sort((a, b) => (a.rem === b.rem ? a.i - b.i : a.rem > b.rem ? -1 : 1));
  for (const { i } of order) {
    if (missing <= 0n) break;
    dayUnits[i] += 1n;
    missing -= 1n;
  }
  return { totalUnits, dayUnits };
}

function unitsToHeadDays(units: bigint): number {
  // Both operands are exact doubles, so the division gives the double nearest the decimal value.
  return Number(units) / Number(UNITS_PER_HEAD_DAY);
}

export function headDaysFromMoves(input: HeadDaysInput): HeadDaysResult {
  const timeZone = input.timeZone ?? 'UTC';
  if (!isValidTimeZone(timeZone)) {
    throw new GrazingInputError('timeZone', 'Time zone must be an IANA name such as America/Los_Angeles');
  }
  const moves = parseMoves(input.moves);
  const until = parseIsoInstant(input.until);
  if (until === null) {
    throw new GrazingInputError('until', 'End time must be a date and time with a UTC offset, like 2027-03-15T00:00:00-07:00');
  }
  if (moves.length > 0 && until < moves[moves.length - 1].t) {
    throw new GrazingInputError('until', 'End time must not be before the last move');
  }
  if (moves.length === 0) return { headDays: 0, byDay: [] };

  const dates: string[] = [];
  const headMsByDay: bigint[] = [];

  let t = moves[0].t;
  let count = 0;
  let next = 0; // index of the next move not yet applied
  const applyMovesAt = (instant: number) => {
    while (next < moves.length && moves[next].t === instant) {
      count += moves[next].change;
      next += 1;
    }
  };
  applyMovesAt(t);

  let date = localDateKey(t, timeZone);
  let dayEnd = startOfLocalDay(addDaysToKey(date, 1), timeZone);
  // Only where a fall-back crosses midnight can the next date have begun already; move on to it then.
  while (dayEnd <= t) {
    date = addDaysToKey(date, 1);
    dayEnd = startOfLocalDay(addDaysToKey(date, 1), timeZone);
  }
  let dayHeadMs = 0n;

  while (t < until) {
    const nextMove = next < moves.length ? moves[next].t : Number.POSITIVE_INFINITY;
    const stop = Math.min(nextMove, dayEnd, until);
    dayHeadMs += BigInt(count) * BigInt(stop - t);
    t = stop;
    if (t === dayEnd || t === until) {
      dates.push(date);
      headMsByDay.push(dayHeadMs);
      dayHeadMs = 0n;
      if (t === dayEnd && t < until) {
        date = addDaysToKey(date, 1);
        dayEnd = startOfLocalDay(addDaysToKey(date, 1), timeZone);
        // A local date of zero length (possible only under odd historical rules) earns nothing: skip it.
        while (dayEnd <= t) {
          date = addDaysToKey(date, 1);
          dayEnd = startOfLocalDay(addDaysToKey(date, 1), timeZone);
        }
      }
    }
    applyMovesAt(t);
  }

  const { totalUnits, dayUnits } = roundDays(headMsByDay);
  return {
    headDays: unitsToHeadDays(totalUnits),
    byDay: dates.map((d, i) => ({ date: d, headDays: unitsToHeadDays(dayUnits[i]) })),
  };
}
