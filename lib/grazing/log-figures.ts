import { parseIsoInstant, startOfLocalDay } from '../dates';
import { daysBetween, todayIn } from '../day-keys';
import { formatDay, formatNumber } from '../format';
import { dailyIntakeLb } from './capacity';
import { GrazingInputError } from './errors';
import { intakeForFlock, type FlockSpecies } from './flock-intake';
import { headDaysFromMoves, parseMoves, type HeadCountMove, type HeadDaysByDay } from './head-days';

// The running figures of a grazing log, for the log screen, the sign-off and the PDF: head on the block,
// head-days so far (lib/grazing/head-days, split at the block's local midnights), forage eaten against the
// grower's target take, where the stay is heading, and how many days are left before the agreed end date and
// the animals-out-by date — with warnings as either approaches.
//
// Conventions:
// - Head-days come from the moves only. A tally or a loss is a record, not a change of the count: the
//   grazier logs a move out for animals that left, died or were removed (the warnings say so).
// - Forage eaten = head-days × intake per head per day, the intake of lib/grazing/flock-intake (NCAT ATTRA
//   "Grazier's Math" rules of thumb: dry ewes 2.5 %, lactating ewes 4.5 %, goats 4.5 % of body weight).
//   It is an estimate from the animals' demand, not a measurement of the sward; residual heights the
//   grazier logs are the measurement, and a residual below the agreed one warns on its own.
// - The projection assumes the head on the block now stay until the start of the agreed end date (a stay
//   of endDate − startDate days, as lib/grazing/bid-compare counts it).

/** Warn this many days ahead of the agreed end date and the out-by date: a product choice, not a published figure. */
export const DAYS_WARNING = 3;
/** Warn when this share of the target take is eaten: a product choice (time to plan the move), not a published figure. */
export const NEAR_TARGET_SHARE = 0.9;

export interface LogStay {
  startDate: string;
  endDate: string;
  outBy: string;
  headCount: number;
  species: FlockSpecies;
  animalClass: string;
  bodyWeightLb: number;
}

export interface LogBlock {
  acres: number;
  lbDmPerAcre: number;
  targetUtilizationPct: number;
  residualHeightIn: number | null;
}

export interface LogFiguresInput {
  /** Moves in the order they were written; sorted here by time (moves at one instant keep that order). */
  moves: HeadCountMove[];
  /** The residual height of the latest entry that measured one, inches (for the warnings). */
  latestResidualHeightIn?: number | null;
  /** Animals lost so far, summed over the entries (a record; head-days come from the moves). */
  lossesSoFar?: number;
  /** Epoch ms of now; figures count up to now while animals are on, or to the last move once they are off. */
  nowMs: number;
  timeZone: string;
  stay: LogStay;
  block: LogBlock;
}

export type LogAlertKey =
  | 'after-out-by'
  | 'out-by-near'
  | 'after-end-date'
  | 'end-date-near'
  | 'target-reached'
  | 'target-near'
  | 'projected-over-target'
  | 'residual-below'
  | 'head-over-contract'
  | 'losses-logged';

export interface LogAlert {
  key: LogAlertKey;
  tone: 'danger' | 'caution' | 'info';
  text: string;
}

export interface LogFiguresResult {
  headNow: number;
  headDaysSoFar: number;
  byDay: HeadDaysByDay[];
  /** ISO instant the head-days are counted up to. */
  until: string | null;
  /** When the first animals came in, and when the last left (null while any are on). */
  firstInAt: string | null;
  lastOutAt: string | null;
  /** head × stay days of the agreed terms, for comparison. */
  plannedHeadDays: number;
  intakePctBodyWeight: number;
  dailyIntakeLbPerHead: number;
  intakeBasis: string;
  intakeSource: string;
  standingLb: number;
  targetTakeLb: number;
  eatenLb: number;
  /** Eaten ÷ standing, %. */
  utilizationSoFarPct: number;
  projectedEatenLb: number;
  projectedUtilizationPct: number;
  targetUtilizationPct: number;
  /** Whole days from today at the block to the agreed end date, and to the out-by date (0 once reached). */
  daysLeftInWindow: number;
  daysToOutBy: number;
  lossesSoFar: number;
  latestResidualHeightIn: number | null;
  alerts: LogAlert[];
  /** The alerts' texts (what LogFigures in lib/schemas/contract carries). */
  warnings: string[];
}

function isoOf(ms: number): string {
  return new Date(ms).toISOString();
}

/** Moves sorted by time; moves at the same instant keep the order they were written in. */
export function movesInTimeOrder<M extends { at: string }>(moves: readonly M[]): M[] {
  return moves
    .map((m, i) => {
      const t = parseIsoInstant(m.at);
      if (t === null) throw new GrazingInputError(`moves[${i}].at`, 'Move time must be a date and time with a UTC offset');
      return { m, t, i };
    })
    .sort((a, b) => a.t - b.t || a.i - b.i)
    .map(({ m }) => m);
}

export function logFigures(input: LogFiguresInput): LogFiguresResult {
  const { stay, block, timeZone } = input;
  const moves = movesInTimeOrder(input.moves);
  const parsed = parseMoves(moves);
  const headNow = parsed.reduce((n, m) => n + m.change, 0);

  let until: number | null = null;
  let firstInAt: string | null = null;
  let lastOutAt: string | null = null;
  if (parsed.length > 0) {
    const last = parsed[parsed.length - 1].t;
    until = headNow > 0 ? Math.max(input.nowMs, last) : last;
    const firstIn = parsed.findIndex((m) => m.change > 0);
    firstInAt = firstIn >= 0 ? moves[firstIn].at : null;
    lastOutAt = headNow === 0 && firstIn >= 0 ? moves[moves.length - 1].at : null;
  }
  const counted = until === null ? { headDays: 0, byDay: [] } : headDaysFromMoves({ moves, until: isoOf(until), timeZone });

  const intake = intakeForFlock(stay.species, stay.animalClass);
  const perHead = dailyIntakeLb({ bodyWeightLb: stay.bodyWeightLb, intakePctBodyWeight: intake.pct }, 'stay');
  const standingLb = block.acres * block.lbDmPerAcre;
  const targetTakeLb = (standingLb * block.targetUtilizationPct) / 100;
  const eatenLb = counted.headDays * perHead;

  const plannedEnd = startOfLocalDay(stay.endDate, timeZone);
  const from = until ?? input.nowMs;
  const remainingDays = headNow > 0 ? Math.max(0, plannedEnd - from) / 86_400_000 : 0;
  const projectedEatenLb = eatenLb + headNow * remainingDays * perHead;
  const pct = (lb: number) => (standingLb > 0 ? (lb / standingLb) * 100 : 0);

  const today = todayIn(timeZone, input.nowMs);
  const daysLeftInWindow = Math.max(0, daysBetween(today, stay.endDate));
  const daysToOutBy = Math.max(0, daysBetween(today, stay.outBy));

  const lossesSoFar = input.lossesSoFar ?? 0;
  const latestResidualHeightIn = input.latestResidualHeightIn ?? null;

  const alerts: LogAlert[] = [];
  if (headNow > 0) {
    if (today > stay.outBy) {
      alerts.push({
        key: 'after-out-by',
        tone: 'danger',
        text: `Animals are still on the block after the animals-out-by date (${formatDay(stay.outBy)}): move them out now. The date is a contract term set before harvest.`,
      });
    } else if (daysToOutBy <= DAYS_WARNING) {
      alerts.push({
        key: 'out-by-near',
        tone: 'caution',
        text: daysToOutBy === 0 ? `The animals-out-by date is today (${formatDay(stay.outBy)}).` : `${daysToOutBy} day${daysToOutBy === 1 ? '' : 's'} to the animals-out-by date (${formatDay(stay.outBy)}).`,
      });
    }
    if (today > stay.endDate) {
      alerts.push({ key: 'after-end-date', tone: 'caution', text: `Past the agreed end date (${formatDay(stay.endDate)}): move out, or agree new dates with an amendment.` });
    } else if (daysLeftInWindow <= DAYS_WARNING && stay.endDate < stay.outBy) {
      alerts.push({
        key: 'end-date-near',
        tone: 'info',
        text: daysLeftInWindow === 0 ? `The agreed stay ends today (${formatDay(stay.endDate)}).` : `${daysLeftInWindow} day${daysLeftInWindow === 1 ? '' : 's'} left of the agreed stay (ends ${formatDay(stay.endDate)}).`,
      });
    }
  }
  const lb = (v: number) => `${formatNumber(v)} lb`;
  if (targetTakeLb > 0 && eatenLb >= targetTakeLb) {
    alerts.push({
      key: 'target-reached',
      tone: headNow > 0 ? 'danger' : 'caution',
      text: `The target take is reached: about ${lb(eatenLb)} of dry matter eaten against the ${lb(targetTakeLb)} target (${formatNumber(block.targetUtilizationPct)} % of the standing forage)${headNow > 0 ? ': move the animals on' : ''}.`,
    });
  } else if (headNow > 0 && targetTakeLb > 0 && eatenLb >= NEAR_TARGET_SHARE * targetTakeLb) {
    alerts.push({ key: 'target-near', tone: 'caution', text: `Near the target take: about ${lb(eatenLb)} eaten of the ${lb(targetTakeLb)} target. Check the residual and plan the move.` });
  } else if (headNow > 0 && pct(projectedEatenLb) > block.targetUtilizationPct) {
    alerts.push({
      key: 'projected-over-target',
      tone: 'caution',
      text: `At this rate the stay will take about ${formatNumber(pct(projectedEatenLb))} % of the standing forage by ${formatDay(stay.endDate)}, above the target of ${formatNumber(block.targetUtilizationPct)} %.`,
    });
  }
  if (block.residualHeightIn != null && latestResidualHeightIn != null && latestResidualHeightIn < block.residualHeightIn) {
    alerts.push({
      key: 'residual-below',
      tone: 'caution',
      text: `The last residual logged is ${formatNumber(latestResidualHeightIn, 1)} in, below the ${formatNumber(block.residualHeightIn, 1)} in the grower asked to leave.`,
    });
  }
  if (headNow > stay.headCount) {
    alerts.push({ key: 'head-over-contract', tone: 'caution', text: `${formatNumber(headNow)} head on the block, more than the ${formatNumber(stay.headCount)} in the contract: agree an amendment.` });
  }
  if (lossesSoFar > 0) {
    alerts.push({
      key: 'losses-logged',
      tone: 'info',
      text: `${formatNumber(lossesSoFar)} loss${lossesSoFar === 1 ? '' : 'es'} logged. Head-days come from the moves: log a move out for animals that died or were removed.`,
    });
  }

  const order = { danger: 0, caution: 1, info: 2 } as const;
  alerts.sort((a, b) => order[a.tone] - order[b.tone]);
  const stayDays = daysBetween(stay.startDate, stay.endDate);
  return {
    headNow,
    headDaysSoFar: counted.headDays,
    byDay: counted.byDay,
    until: until === null ? null : isoOf(until),
    firstInAt,
    lastOutAt,
    plannedHeadDays: stay.headCount * Math.max(0, stayDays),
    intakePctBodyWeight: intake.pct,
    dailyIntakeLbPerHead: perHead,
    intakeBasis: intake.basis,
    intakeSource: intake.source,
    standingLb,
    targetTakeLb,
    eatenLb,
    utilizationSoFarPct: pct(eatenLb),
    projectedEatenLb,
    projectedUtilizationPct: pct(projectedEatenLb),
    targetUtilizationPct: block.targetUtilizationPct,
    daysLeftInWindow,
    daysToOutBy,
    lossesSoFar,
    latestResidualHeightIn,
    alerts,
    warnings: alerts.map((a) => a.text),
  };
}

/** The flag on an entry dated after the agreed end date (but not after out-by). */
export function afterEndDateFlag(endDate: string): string {
  return `After the agreed end date (${formatDay(endDate)})`;
}
