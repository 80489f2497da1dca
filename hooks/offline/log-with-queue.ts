import { localDateKey, parseIsoInstant } from '@/lib/dates';
import { dailyIntakeLb } from '@/lib/grazing/capacity';
import { GrazingInputError, headDaysFromMoves, type HeadDaysByDay } from '@/lib/grazing/head-days';
import { afterOutByFlag } from '@/lib/grazing/log-days';
import { afterEndDateFlag } from '@/lib/grazing/log-figures';
import { isoInZone } from '@/lib/local-time';
import type { LogEntryRecord, LogFiguresView } from '@/hooks/api/contracts';
import type { ContractView, LogEntryView } from '@/lib/schemas/contract';
import type { QueuedEntry } from './log-queue';

// The log as the grazier sees it in the truck: what the server has, plus what this phone holds that the
// server has not confirmed yet. Figures come from the server; only when entries are waiting does the phone
// work out head-days itself, with the same headDaysFromMoves the server uses.

export interface LogRow {
  entry: LogEntryRecord;
  /** The queued copy while the server has not got it (waiting, or sent but not in the copy of the log shown yet). */
  queued: QueuedEntry | null;
}

type ContractFacts = Pick<ContractView, 'timeZone' | 'outBy' | 'endDate' | 'bodyWeightLb' | 'normalised' | 'grazier' | 'grower'>;

/** How the phone marks an entry the server has not seen yet, in the server's words; its own flags replace these once sent. */
export function localFlags(at: string, c: Pick<ContractView, 'timeZone' | 'outBy' | 'endDate'>): string[] {
  const t = parseIsoInstant(at);
  if (t === null) return [];
  const day = localDateKey(t, c.timeZone);
  if (day > c.outBy) return [afterOutByFlag(c.outBy)];
  return day > c.endDate ? [afterEndDateFlag(c.endDate)] : [];
}

/** A queued entry's facts with the server's nulls for what was left out (as the log view has them). */
export function queuedFacts(q: QueuedEntry) {
  const e = q.entry;
  return {
    kind: e.kind as LogEntryView['kind'],
    change: e.change ?? null,
    count: e.count ?? null,
    paddock: e.paddock ?? null,
    residualHeightIn: e.residualHeightIn ?? null,
    takenPct: e.takenPct ?? null,
    trampledPct: e.trampledPct ?? null,
    bareGroundPct: e.bareGroundPct ?? null,
    waterChecked: e.waterChecked ?? null,
    fenceChecked: e.fenceChecked ?? null,
    losses: e.losses ?? null,
  };
}

function viewOf(q: QueuedEntry, c: ContractFacts): LogEntryView {
  const e = q.entry;
  return {
    id: `queued:${e.clientId}`,
    clientId: e.clientId,
    at: e.at,
    ...queuedFacts(q),
    note: e.note ?? null,
    author: q.accountId === c.grower.id ? 'grower' : 'grazier',
    flags: localFlags(e.at, c),
    recordedAt: q.queuedAt,
  };
}

/** Queued entries the log shown does not contain yet; refused ones are not part of the record. */
export function outstanding(items: readonly LogEntryView[], queued: readonly QueuedEntry[]): QueuedEntry[] {
  const known = new Set(items.map((i) => i.clientId));
  return queued.filter((q) => q.state !== 'refused' && !known.has(q.entry.clientId));
}

/** Server entries and outstanding queued ones, newest first. */
export function mergeLog(items: readonly LogEntryRecord[], queued: readonly QueuedEntry[], c: ContractFacts): LogRow[] {
  const rows: LogRow[] = [...items.map((entry) => ({ entry, queued: null })), ...outstanding(items, queued).map((q) => ({ entry: viewOf(q, c), queued: q }))];
  const time = (r: LogRow) => parseIsoInstant(r.entry.at) ?? 0;
  return rows.sort((a, b) => time(b) - time(a) || (b.entry.recordedAt < a.entry.recordedAt ? -1 : 1));
}

export interface FiguresWithQueue {
  figures: LogFiguresView;
  /** Moves waiting on this phone that the figures include. */
  queuedMoves: number;
  /** Set when the waiting moves could not be counted in (they do not add up, or older entries are not loaded). */
  problem: string | null;
}

const round4 = (v: number) => Math.round(v * 10_000) / 10_000;

/** Two day-by-day breakdowns added together, day by day (each value at the 0.0001 head-day precision). */
function addByDay(a: readonly HeadDaysByDay[], b: readonly HeadDaysByDay[]): HeadDaysByDay[] {
  const sum = new Map<string, number>();
  for (const d of [...a, ...b]) sum.set(d.date, round4((sum.get(d.date) ?? 0) + d.headDays));
  return [...sum.entries()].sort(([x], [y]) => (x < y ? -1 : 1)).map(([date, headDays]) => ({ date, headDays }));
}

/**
 * The server's figures, or — with moves waiting on this phone — head on the block, head-days so far and
 * forage eaten with those moves counted in, up to now (or to the last move once all are out), by the same
 * headDaysFromMoves the server uses. Two ways, both exact:
 * - the waiting moves all come after the instant the server counted to (`until`, the usual case: written
 *   offline after the last visit): the server's count, carried on from its head on the block;
 * - otherwise every move of the log, when all of it is loaded (`complete`).
 * Forage eaten uses the server's intake per head when it says, else the contract's.
 */
export function figuresWithQueue(
  c: ContractFacts,
  items: readonly LogEntryRecord[],
  figures: LogFiguresView,
  queued: readonly QueuedEntry[],
  nowMs: number,
  complete: boolean,
): FiguresWithQueue {
  const waiting = outstanding(items, queued)
    .filter((q) => q.entry.kind === 'move' && typeof q.entry.change === 'number')
    .map((q) => ({ at: q.entry.at, change: q.entry.change as number, t: parseIsoInstant(q.entry.at) ?? 0 }))
    .sort((a, b) => a.t - b.t);
  if (waiting.length === 0) return { figures, queuedMoves: 0, problem: null };

  const untilMs = figures.until ? parseIsoInstant(figures.until) : null;
  const serverHasMoves = untilMs !== null || figures.headNow > 0 || figures.headDaysSoFar > 0;
  let start: { at: string; change: number; t: number }[];
  let base = { headDays: 0, byDay: [] as HeadDaysByDay[] };
  if (untilMs !== null && waiting[0].t >= untilMs) {
    start = [{ at: figures.until!, change: figures.headNow, t: untilMs }];
    base = { headDays: figures.headDaysSoFar, byDay: figures.byDay };
  } else if (!serverHasMoves || complete) {
    start = items
      .filter((i) => i.kind === 'move' && i.change != null && !i.voided)
      .map((i) => ({ at: i.at, change: i.change as number, t: parseIsoInstant(i.at) ?? 0 }));
  } else {
    return { figures, queuedMoves: waiting.length, problem: 'A waiting move is dated before the figures on screen: they update once it is sent.' };
  }

  const moves = [...start, ...waiting].sort((a, b) => a.t - b.t);
  const headNow = moves.reduce((n, m) => n + m.change, 0);
  const last = moves[moves.length - 1].t;
  const until = headNow > 0 ? Math.max(nowMs, last) : last;
  try {
    const counted = headDaysFromMoves({ moves: moves.map(({ at, change }) => ({ at, change })), until: isoInZone(until, c.timeZone), timeZone: c.timeZone });
    const headDays = round4(base.headDays + counted.headDays);
    const byDay = addByDay(base.byDay, counted.byDay.filter((d) => d.headDays > 0));
    const lbPerHeadDay =
      figures.dailyIntakeLbPerHead ??
      (figures.headDaysSoFar > 0 ? figures.eatenLb / figures.headDaysSoFar : dailyIntakeLb({ bodyWeightLb: c.bodyWeightLb, intakePctBodyWeight: c.normalised.intakePctBodyWeight }));
    return {
      figures: { ...figures, headNow, headDaysSoFar: headDays, byDay, eatenLb: headDays * lbPerHeadDay, until: new Date(until).toISOString() },
      queuedMoves: waiting.length,
      problem: null,
    };
  } catch (err) {
    if (!(err instanceof GrazingInputError)) throw err;
    return { figures, queuedMoves: waiting.length, problem: `The moves waiting to send do not add up: ${err.message.charAt(0).toLowerCase()}${err.message.slice(1)}.` };
  }
}
