import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { readTogether } from '../../lib/db/reads';
import { AppError } from '../../lib/errors/app-error';
import { check } from '../../lib/http/validate';
import type { LinkViewer } from '../../lib/http/auth';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { IMAGE_EXTENSIONS } from '../../lib/storage/image-type';
import { reencodePhoto } from '../../lib/storage/reencode-photo';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { signPhotoAccess } from '../blocks/photo-access';
import { Contract } from './contract.entity';
import { LogEntry, LogPhoto, SignOff } from './contract-records.entity';
import { figuresOf, findContract, latestSignOff, lockContract, movesOf, termsInForce } from './contract-state';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { decodeCursor, encodeCursor } from './cursor';
import { assertCanRead, assertParty, partyOf } from './contracts.policy';
import type { ContractTerms } from '../../../lib/contract-terms';
import { isAfterLocalDay, parseIsoInstant, startOfLocalDay } from '../../../lib/dates';
import { formatDay, formatNumber } from '../../../lib/format';
import { GrazingInputError } from '../../../lib/grazing/errors';
import { parseMoves } from '../../../lib/grazing/head-days';
import { afterEndDateFlag } from '../../../lib/grazing/log-figures';
import { afterOutByFlag } from '../../../lib/grazing/log-days';
import {
  DEFAULT_LOG_PAGE,
  LOG_CLOCK_SKEW_MINUTES,
  logEntrySchema,
  logPageQuerySchema,
  type ContractParty,
  type LogEntryInput,
  type LogEntryKind,
  type LogEntryView,
  type LogFigures,
  type LogPage,
  type LogPageQuery,
  type LogPhotoView,
  type VoidLogEntryInput,
  voidLogEntrySchema,
} from '../../../lib/schemas/contract';

// The grazing log, written from the truck: the grazier logs moves (animals in and out), tallies and
// observations; the grower may add observations of their own. A phone that lost its signal sends the same
// entry again with the same client id, and it is stored once (the unique index on (contract, client id) is
// the guarantee; a replay answers 200 with the stored entry, even when two copies race). Times are checked
// against the server's clock and the contract's first day in the block's zone; an entry after the
// animals-out-by date is kept and flagged, never refused — the record shows what happened.

/** Photos per log entry (the 8 MB cap and the JPEG/PNG/WebP check are the block photos' rules). */
export const MAX_PHOTOS_PER_ENTRY = 6;

function fail(field: string, message: string): AppError {
  return AppError.badRequest('Some fields need attention', { [field]: message });
}

/** The fields a kind carries: a move its change, a tally its count, an observation neither. */
function assertShape(input: LogEntryInput): void {
  const fields: Record<string, string> = {};
  if (input.kind === 'move') {
    if (input.change === undefined) fields.change = 'A move needs the change: +n animals in, −n out';
    if (input.count !== undefined) fields.count = 'A move carries no count: log a tally for a head count';
  } else if (input.kind === 'tally') {
    if (input.count === undefined) fields.count = 'A tally needs the head counted';
    if (input.change !== undefined) fields.change = 'A tally changes no head count: log a move for animals in or out';
  } else {
    if (input.change !== undefined) fields.change = 'An observation changes no head count: log a move for animals in or out';
    if (input.count !== undefined) fields.count = 'An observation carries no count: log a tally for a head count';
  }
  if (Object.keys(fields).length > 0) throw AppError.badRequest('Some fields need attention', fields);
}

/** Kinds the party may add in the contract's present state (the buttons the log screen shows). */
function writableKinds(party: ContractParty | null, c: Pick<Contract, 'status'>, latest: SignOff | null): LogEntryKind[] {
  if (!party || !['signed', 'grazing', 'sign-off'].includes(c.status)) return [];
  if (party === 'grower') return ['observation'];
  // While the grower weighs a proposal the head-days must not move under them; tallies and notes may.
  if (c.status === 'sign-off' && latest?.status === 'proposed') return ['tally', 'observation'];
  return ['move', 'tally', 'observation'];
}

function assertWritable(party: ContractParty, c: Pick<Contract, 'status'>, latest: SignOff | null, kind: LogEntryKind): void {
  if (party === 'grower' && kind !== 'observation') throw AppError.forbidden('Only the grazier logs moves and tallies; you may add observations');
  if (c.status === 'to-sign') throw AppError.conflict('The log opens once both parties have signed the contract', 'not_signed');
  if (c.status === 'cancelled') throw AppError.conflict('This contract was cancelled', 'contract_cancelled');
  if (['agreed', 'invoiced', 'paid'].includes(c.status)) throw AppError.conflict('The head-days are agreed: the log takes no new entries (an amendment both sign is the only change now)', 'log_closed');
  if (!writableKinds(party, c, latest).includes(kind)) {
    throw AppError.conflict('The grower is reviewing the head-days you proposed: moves wait until they answer', 'sign_off_pending');
  }
}

/** `at` is an instant no later than now (plus the phone's allowed skew) and not before the first day of the stay at the block. */
function assertTime(atMs: number, terms: ContractTerms, nowMs: number): void {
  if (atMs > nowMs + LOG_CLOCK_SKEW_MINUTES * 60_000) throw fail('at', 'Time is in the future: log what has happened');
  const first = startOfLocalDay(terms.startDate, terms.block.timeZone);
  if (atMs < first) throw fail('at', `Time is before the contract's first day, ${formatDay(terms.startDate)} at the block`);
}

/** Head on the block just after `atMs` by the stored moves (for the tally check). */
function headAt(moves: Array<{ atMs: number; change: number }>, atMs: number): number {
  return moves.filter((m) => m.atMs <= atMs).reduce((n, m) => n + m.change, 0);
}

/** Flags that follow from the terms in force (recomputed on every read, so an amended out-by date moves them). */
function dateFlags(e: { atMs: number }, terms: ContractTerms): string[] {
  if (isAfterLocalDay(e.atMs, terms.outBy, terms.block.timeZone)) return [afterOutByFlag(terms.outBy)];
  if (isAfterLocalDay(e.atMs, terms.endDate, terms.block.timeZone)) return [afterEndDateFlag(terms.endDate)];
  return [];
}

export interface LogEntryContext {
  party: ContractParty;
  status: Contract['status'];
  latest: SignOff | null;
  terms: ContractTerms;
  nowMs: number;
  /** The stored moves in time order (movesOf). */
  moves: Array<{ id: string; at: string; atMs: number; change: number }>;
}

/**
 * Every rule a new entry must meet, in the order a person would fix them: the fields its kind carries,
 * who may write it now, its time, and for a move the head count. Returns the flags it is stored with.
 * (The demo seed writes its logs through this too, so the demo shows nothing the API would refuse.)
 */
export function vetLogEntry(input: LogEntryInput, c: LogEntryContext): { atMs: number; flags: string[] } {
  assertShape(input);
  const atMs = parseIsoInstant(input.at)!;
  assertWritable(c.party, c, c.latest, input.kind);
  if (c.party === 'grower' && input.losses != null) throw fail('losses', 'Losses are the grazier’s to record: describe what you saw in the note');
  assertTime(atMs, c.terms, c.nowMs);
  const flags: string[] = [];
  if (input.kind === 'move') {
    const withNew = [...c.moves, { id: '', at: input.at, atMs, change: input.change! }].sort((a, b) => a.atMs - b.atMs);
    try {
      parseMoves(withNew.map(({ at, change }) => ({ at, change })));
    } catch (err) {
      if (!(err instanceof GrazingInputError)) throw err;
      const onBlock = headAt(c.moves, atMs);
      throw fail(
        'change',
        input.change! < 0 && -input.change! > onBlock
          ? `This move takes out ${formatNumber(-input.change!)} head, but the log has ${formatNumber(onBlock)} on the block then`
          : 'This move would leave fewer than zero head on the block at a later move out: check the times of the moves',
      );
    }
  }
  if (input.kind === 'tally') {
    const onBlock = headAt(c.moves, atMs);
    if (input.count !== onBlock) flags.push(`Tally of ${formatNumber(input.count!)} differs from the ${formatNumber(onBlock)} head the moves put on the block`);
  }
  return { atMs, flags };
}

/** The stored row of a vetted entry. */
export function logEntryRow(input: LogEntryInput, r: { contractId: string; party: ContractParty; authorId: string; atMs: number; flags: string[]; recordedAt: Date }): LogEntry {
  return Object.assign(new LogEntry(), {
    id: crypto.randomUUID(),
    contractId: r.contractId,
    clientId: input.clientId,
    kind: input.kind,
    at: input.at,
    atMs: r.atMs,
    change: input.change ?? null,
    count: input.count ?? null,
    paddock: input.paddock ?? null,
    residualHeightIn: input.residualHeightIn ?? null,
    takenPct: input.takenPct ?? null,
    trampledPct: input.trampledPct ?? null,
    bareGroundPct: input.bareGroundPct ?? null,
    waterChecked: input.waterChecked ?? null,
    fenceChecked: input.fenceChecked ?? null,
    losses: input.losses ?? null,
    note: input.note ?? null,
    author: r.party,
    authorId: r.authorId,
    flags: r.flags,
    recordedAt: r.recordedAt,
    voidedAt: null,
    voidReason: null,
  });
}

export async function addLogEntry(ctx: ServiceContext, caller: Account, id: string, body: unknown): Promise<{ entry: LogEntryView; created: boolean; figures: LogFigures }> {
  const input = (await check(logEntrySchema, body)) as LogEntryInput;
  assertShape(input);
  const atMs = parseIsoInstant(input.at)!;
  let outcome: { entryId: string; created: boolean };
  try {
    outcome = await inTransaction(ctx.ds, async (tx) => {
      const contract = await lockContract(tx, id);
      assertParty(caller, contract);
      const stored = await entryByClientId.one(tx, { contractId: contract.id, clientId: input.clientId });
      if (stored) return { entryId: stored.id, created: false };

      const party = partyOf(caller, contract)!;
      const { terms } = await termsInForce(tx, contract, true);
      const { flags } = vetLogEntry(input, { party, status: contract.status, latest: await latestSignOff(tx, contract.id), terms, nowMs: ctx.now(), moves: await movesOf(tx, contract.id) });

      const entry = logEntryRow(input, { contractId: contract.id, party, authorId: caller.id, atMs, flags, recordedAt: new Date(ctx.now()) });
      await tx.insert(LogEntry, entry);
      // The first animals in start the stay.
      if (input.kind === 'move' && input.change! > 0 && contract.status === 'signed') {
        await tx.update(Contract, { id: contract.id, status: 'signed' }, { status: 'grazing', grazingStartedAt: new Date(ctx.now()) });
      }
      return { entryId: entry.id, created: true };
    });
  } catch (err) {
    // Two copies raced past the lookup (several processes): the index kept one; answer with it.
    if (!isUniqueViolation(err)) throw err;
    const stored = await ctx.ds.manager.findOneBy(LogEntry, { contractId: id, clientId: input.clientId });
    if (!stored) throw err;
    outcome = { entryId: stored.id, created: false };
  }
  const em = ctx.ds.manager;
  const [contract, entry] = await Promise.all([findContract(em, id), entryById.one(em, { id: outcome.entryId })]);
  if (!contract || !entry) throw new Error(`log entry ${outcome.entryId} of contract ${id} not found after its commit`);
  const { terms } = await termsInForce(em, contract);
  const [view] = await entryViews(ctx, em, contract, terms, [entry], caller);
  return { entry: view, created: outcome.created, figures: await figuresOf(em, contract, terms, ctx.now()) };
}

const partyNames = new PreparedSelect((em) => em.createQueryBuilder(Account, 'a').select('a.id', 'id').addSelect('a.name', 'name').where('a.id IN (:...ids)'));
const entryPhotos = new PreparedSelect((em) => em.createQueryBuilder(LogPhoto, 'p').where('p.entry_id IN (:...ids)').orderBy('p.created_at', 'ASC'));
const entryByClientId = new PreparedSelect((em) => em.createQueryBuilder(LogEntry, 'e').where('e.contract_id = :contractId AND e.client_id = :clientId'));
const entryById = new PreparedSelect((em) => em.createQueryBuilder(LogEntry, 'e').where('e.id = :id'));

async function entryViews(ctx: ServiceContext, em: EntityManager, contract: Contract, terms: ContractTerms, entries: LogEntry[], viewer: LinkViewer): Promise<LogEntryView[]> {
  if (entries.length === 0) return [];
  const [people, photos] = await readTogether(em, [
    () => partyNames.raw<{ id: string; name: string }>(em, { ids: [contract.growerId, contract.grazierId] }),
    () => entryPhotos.many(em, { ids: entries.map((e) => e.id) }),
  ]);
  const nameOf = new Map(people.map((p) => [p.id, p.name]));
  const photosOf = new Map<string, LogPhotoView[]>();
  for (const p of photos) {
    photosOf.set(p.entryId, [...(photosOf.get(p.entryId) ?? []), photoView(ctx, p, viewer)]);
  }
  return entries.map((e) => ({
    id: e.id,
    clientId: e.clientId,
    kind: e.kind,
    at: e.at,
    change: e.change,
    count: e.count,
    paddock: e.paddock,
    residualHeightIn: e.residualHeightIn,
    takenPct: e.takenPct,
    trampledPct: e.trampledPct,
    bareGroundPct: e.bareGroundPct,
    waterChecked: e.waterChecked,
    fenceChecked: e.fenceChecked,
    losses: e.losses,
    note: e.note,
    author: e.author,
    flags: [...(e.voidedAt ? [`Voided: ${e.voidReason ?? ''}`] : []), ...dateFlags(e, terms), ...e.flags],
    recordedAt: e.recordedAt.toISOString(),
    authorName: nameOf.get(e.authorId) ?? 'Unknown',
    voided: e.voidedAt ? { at: e.voidedAt.toISOString(), reason: e.voidReason ?? '' } : null,
    photos: photosOf.get(e.id) ?? [],
  }));
}

/**
 * The author voids a mistaken entry while the log is open (a wrong count, a move logged twice): it stays in
 * the record, struck out with the reason, and counts for nothing. Voiding a move must leave the head count
 * at or above zero all along (a move in cannot go while its move out stands).
 */
export async function voidLogEntry(ctx: ServiceContext, caller: Account, id: string, entryId: string, body: unknown): Promise<{ entry: LogEntryView; figures: LogFigures }> {
  const input = (await check(voidLogEntrySchema, body)) as VoidLogEntryInput;
  await inTransaction(ctx.ds, async (tx) => {
    const contract = await lockContract(tx, id);
    assertParty(caller, contract);
    const entry = await tx.findOneBy(LogEntry, { id: entryId, contractId: id });
    if (!entry) throw AppError.notFound('Log entry');
    if (entry.authorId !== caller.id) throw AppError.forbidden('Only the author of an entry may void it');
    if (entry.voidedAt) throw AppError.conflict('This entry is voided already', 'already_voided');
    assertWritable(partyOf(caller, contract)!, contract, await latestSignOff(tx, id), entry.kind);
    if (entry.kind === 'move') {
      const remaining = (await movesOf(tx, id)).filter((m) => m.id !== entry.id);
      try {
        parseMoves(remaining.map(({ at, change }) => ({ at, change })));
      } catch (err) {
        if (!(err instanceof GrazingInputError)) throw err;
        throw AppError.conflict('Without this move a later move out would take more head than the log has on the block: void that one first', 'void_below_zero');
      }
    }
    const res = await tx
      .createQueryBuilder()
      .update(LogEntry)
      .set({ voidedAt: new Date(ctx.now()), voidReason: input.reason })
      .where('id = :entryId AND voided_at IS NULL', { entryId })
      .execute();
    if (res.affected !== 1) throw AppError.conflict('This entry is voided already', 'already_voided');
  });
  const em = ctx.ds.manager;
  const contract = await em.findOneByOrFail(Contract, { id });
  const { terms } = await termsInForce(em, contract);
  const [view] = await entryViews(ctx, em, contract, terms, [await em.findOneByOrFail(LogEntry, { id: entryId })], caller);
  return { entry: view, figures: await figuresOf(em, contract, terms, ctx.now()) };
}

/**
 * A page of the log, newest first, with the running figures over the whole log. A page is cut in SQL by
 * keyset (time, id), so the work per request is bounded by the page size and the number of moves.
 */
// A page of the log, newest first: from the top, or after a cursor (time, id).
const logPage = {
  first: new PreparedSelect((em) => em.createQueryBuilder(LogEntry, 'e').where('e.contract_id = :id').orderBy('e.at_ms', 'DESC').addOrderBy('e.id', 'DESC'), { limit: true }),
  after: new PreparedSelect(
    (em) =>
      em
        .createQueryBuilder(LogEntry, 'e')
        .where('e.contract_id = :id')
        .andWhere('(e.at_ms < :atMs OR (e.at_ms = :atMs AND e.id < :entryId))')
        .orderBy('e.at_ms', 'DESC')
        .addOrderBy('e.id', 'DESC'),
    { limit: true },
  ),
};

export async function listLog(ctx: ServiceContext, viewer: Account, id: string, query: Record<string, unknown> = {}): Promise<LogPage> {
  const q = (await check(logPageQuerySchema, query)) as LogPageQuery;
  const em = ctx.ds.manager;
  const contract = await findContract(em, id);
  assertCanRead(viewer, contract);
  const limit = q.limit ?? DEFAULT_LOG_PAGE;
  let rows: LogEntry[];
  if (q.cursor) {
    const [atMs, entryId] = decodeCursor(q.cursor, (p): p is [number, string] => p.length === 2 && Number.isSafeInteger(p[0]) && typeof p[1] === 'string');
    rows = await logPage.after.many(em, { id, atMs, entryId, limit: limit + 1 });
  } else rows = await logPage.first.many(em, { id, limit: limit + 1 });
  const page = rows.slice(0, limit);
  const { terms } = await termsInForce(em, contract);
  const last = page.at(-1);
  return {
    items: await entryViews(ctx, em, contract, terms, page, viewer),
    figures: await figuresOf(em, contract, terms, ctx.now()),
    nextCursor: rows.length > limit && last ? encodeCursor([last.atMs, last.id]) : null,
    canWrite: writableKinds(partyOf(viewer, contract), contract, await latestSignOff(em, contract.id)),
  };
}

const wholeLog = new PreparedSelect((em) =>
  em.createQueryBuilder(LogEntry, 'e').where('e.contract_id = :id').orderBy('e.at_ms', 'ASC').addOrderBy('e.recorded_at', 'ASC').addOrderBy('e.id', 'ASC'),
);

/** Every entry in time order (for the PDF, rendered after a commit, never on a request's write path). */
export async function allEntryViews(ctx: ServiceContext, contract: Contract, terms: ContractTerms): Promise<LogEntryView[]> {
  const em = ctx.ds.manager;
  const rows = await wholeLog.many(em, { id: contract.id });
  // Rendered into a PDF, not shown to a signed-in viewer: photo links made without a session never open.
  return entryViews(ctx, em, contract, terms, rows, { id: contract.grazierId });
}

// ——— photos on entries ———

function photoView(ctx: ServiceContext, p: LogPhoto, viewer: LinkViewer): LogPhotoView {
  // The block photos' signed link, with the contract in the owner claim: a token names one photo of one
  // record for one viewer, and the photo route checks all three.
  const token = signPhotoAccess(ctx.tokenSecret, { photoId: p.id, blockId: p.contractId, viewer });
  return {
    id: p.id,
    url: `/api/contracts/${encodeURIComponent(p.contractId)}/log/${encodeURIComponent(p.entryId)}/photos/${encodeURIComponent(p.id)}?access=${encodeURIComponent(token)}`,
    mimeType: p.mimeType,
    sizeBytes: p.sizeBytes,
    createdAt: p.createdAt.toISOString(),
  };
}

async function entryForPhoto(em: EntityManager, caller: Account, contractId: string, entryId: string): Promise<{ contract: Contract; entry: LogEntry }> {
  const contract = await em.findOneBy(Contract, { id: contractId });
  assertParty(caller, contract);
  const entry = await em.findOneBy(LogEntry, { id: entryId, contractId });
  if (!entry) throw AppError.notFound('Log entry');
  if (entry.authorId !== caller.id) throw AppError.forbidden('Only the author of an entry adds photos to it');
  if (['agreed', 'invoiced', 'paid', 'cancelled'].includes(contract.status)) throw AppError.conflict('The log is closed: it takes no new photos', 'log_closed');
  if ((await em.countBy(LogPhoto, { entryId })) >= MAX_PHOTOS_PER_ENTRY) {
    throw AppError.conflict(`An entry can have at most ${MAX_PHOTOS_PER_ENTRY} photos`, 'too_many_photos');
  }
  return { contract, entry };
}

/** Checked before the upload is read, so a stranger's or a seventh upload is refused without taking 8 MB. */
export async function assertCanAddLogPhoto(ctx: ServiceContext, caller: Account, contractId: string, entryId: string): Promise<void> {
  await entryForPhoto(ctx.ds.manager, caller, contractId, entryId);
}

export async function addLogPhoto(ctx: ServiceContext, caller: Account, contractId: string, entryId: string, file: { buffer: Buffer } | undefined): Promise<LogPhotoView> {
  if (!file) throw AppError.badRequest('Choose a photo to upload', { photo: 'Choose a photo to upload (form field "photo")' });
  // Stored as sharp writes it anew: upright, no EXIF/GPS, within 2048 px (server/lib/storage/reencode-photo.ts).
  const { bytes, type } = await reencodePhoto(file.buffer, 'photo');
  const fileName = await ctx.photos.save(bytes, IMAGE_EXTENSIONS[type]);
  try {
    const photo = await inTransaction(ctx.ds, async (tx) => {
      // Checked again inside the queue: two uploads in flight must not make one too many.
      await entryForPhoto(tx, caller, contractId, entryId);
      const row = tx.create(LogPhoto, { id: crypto.randomUUID(), entryId, contractId, fileName, mimeType: type, sizeBytes: bytes.length, createdAt: new Date(ctx.now()) });
      await tx.insert(LogPhoto, row);
      return row;
    });
    return photoView(ctx, photo, caller);
  } catch (err) {
    await ctx.photos.remove(fileName);
    throw err;
  }
}

/** The file of a log photo, for a viewer who may read the contract (404 otherwise). */
export async function openLogPhoto(ctx: ServiceContext, viewerId: string, contractId: string, entryId: string, photoId: string) {
  const em = ctx.ds.manager;
  const viewer = await em.findOneBy(Account, { id: viewerId });
  if (!viewer) throw AppError.notFound('Photo');
  assertCanRead(viewer, await em.findOneBy(Contract, { id: contractId }));
  const photo = await em.findOneBy(LogPhoto, { id: photoId, entryId, contractId });
  if (!photo) throw AppError.notFound('Photo');
  return { path: ctx.photos.pathOf(photo.fileName), mimeType: photo.mimeType };
}
