import { localDateKey, parseIsoInstant } from '@/lib/dates';
import { dailyIntakeLb } from '@/lib/grazing/capacity';
import { GrazingInputError, headDaysFromMoves } from '@/lib/grazing/head-days';
import { formatDay } from '@/lib/format';
import { isoInZone } from '@/lib/local-time';
import type { ContractView, LogEntryView, LogFigures } from '@/lib/schemas/contract';
import type { QueuedEntry } from './log-queue';

// The log as the grazier sees it in the truck: what the server has, plus what this phone holds that the
// server has not confirmed yet. Figures come from the server; only when entries are waiting does the phone
// work out head-days itself, with the same headDaysFromMoves the server uses.

export interface LogRow {
  entry: LogEntryView;
  /** The queued copy while the server has not got it (waiting, or sent but not in the copy of the log shown yet). */
  queued: QueuedEntry | null;
}

type ContractFacts = Pick<ContractView, 'timeZone' | 'outBy' | 'bodyWeightLb' | 'normalised' | 'grazier' | 'grower'>;

/** How the phone marks an entry the server has not seen yet; the server's own flags replace it once sent. */
export function localFlags(at: string, c: Pick<ContractView, 'timeZone' | 'outBy'>): string[] {
  const t = parseIsoInstant(at);
  if (t === null) return [];
  return localDateKey(t, c.timeZone) > c.outBy ? [`After the animals-out-by date (${formatDay(c.outBy)})`] : [];
}

function viewOf(q: QueuedEntry, c: ContractFacts): LogEntryView {
  const e = q.entry;
  return {
    id: `queued:${e.clientId}`,
    clientId: e.clientId,
    kind: e.kind as LogEntryView['kind'],
    at: e.at,
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
export function mergeLog(items: readonly LogEntryView[], queued: readonly QueuedEntry[], c: ContractFacts): LogRow[] {
  const rows: LogRow[] = [...items.map((entry) => ({ entry, queued: null })), ...outstanding(items, queued).map((q) => ({ entry: viewOf(q, c), queued: q }))];
  const time = (r: LogRow) => parseIsoInstant(r.entry.at) ?? 0;
  return rows.sort((a, b) => time(b) - time(a) || (b.entry.recordedAt < a.entry.recordedAt ? -1 : 1));
}

export interface FiguresWithQueue {
  figures: LogFigures;
  /** Entries waiting on this phone that the figures include. */
  queuedMoves: number;
  /** Set when the waiting entries do not add up (more out than in): the server's figures are shown instead. */
  problem: string | null;
}

/**
 * The server's figures, or — with moves waiting on this phone — head on the block, head-days so far and
 * forage eaten worked out from every move, counted up to now (or to the last move once all are out).
 * Forage eaten uses the server's own lb per head-day when it has one, else the contract's intake.
 */
export function figuresWithQueue(c: ContractFacts, items: readonly LogEntryView[], figures: LogFigures, queued: readonly QueuedEntry[], nowMs: number): FiguresWithQueue {
  const waitingMoves = outstanding(items, queued).filter((q) => q.entry.kind === 'move' && typeof q.entry.change === 'number');
  if (waitingMoves.length === 0) return { figures, queuedMoves: 0, problem: null };

  const moves = [
    ...items.filter((i) => i.kind === 'move' && i.change != null).map((i) => ({ at: i.at, change: i.change as number })),
    ...waitingMoves.map((q) => ({ at: q.entry.at, change: q.entry.change as number })),
  ]
    .map((m) => ({ ...m, t: parseIsoInstant(m.at) ?? 0 }))
    .sort((a, b) => a.t - b.t);
  const headNow = moves.reduce((n, m) => n + m.change, 0);
  const last = moves[moves.length - 1].t;
  const until = headNow > 0 ? Math.max(nowMs, last) : last;
  try {
    const { headDays, byDay } = headDaysFromMoves({ moves: moves.map(({ at, change }) => ({ at, change })), until: isoInZone(until, c.timeZone), timeZone: c.timeZone });
    const lbPerHeadDay = figures.headDaysSoFar > 0 ? figures.eatenLb / figures.headDaysSoFar : dailyIntakeLb({ bodyWeightLb: c.bodyWeightLb, intakePctBodyWeight: c.normalised.intakePctBodyWeight });
    return { figures: { ...figures, headNow, headDaysSoFar: headDays, byDay, eatenLb: headDays * lbPerHeadDay }, queuedMoves: waitingMoves.length, problem: null };
  } catch (err) {
    if (!(err instanceof GrazingInputError)) throw err;
    return { figures, queuedMoves: waitingMoves.length, problem: `The moves waiting to send do not add up: ${err.message.charAt(0).toLowerCase()}${err.message.slice(1)}.` };
  }
}
