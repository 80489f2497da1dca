import crypto from 'node:crypto';
import { type EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { assertJsonObject, check } from '../../lib/http/validate';
import { hasRole } from '../../lib/http/auth';
import { inTransaction } from '../../lib/db/transaction';
import { queueMail } from '../../lib/mail/outbox';
import { blockChangedMails, blockWithdrawnMails } from './blocks.mails';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { Bid } from '../bids/bid.entity';
import { Contract } from '../contracts/contract.entity';
import { Block } from './block.entity';
import { assertCanViewBlock, assertEditable, assertOwnsBlock, type BlockFacts } from './blocks.policy';
import { blockCard, blockInputOf, blockViews, homeOf, flockOf } from './block-views';
import { findBlockPage, type ListViewer } from './block-list';
import {
  blockInputSchema,
  blockListQuerySchema,
  DEFAULT_TIME_ZONE,
  type BlockInput,
  type BlockListQuery,
  type BlockListResponse,
  type BlockView,
} from '../../../lib/schemas/block';
import { blockLbDmPerAcre } from '../../../lib/grazing/block-forage';
import { grazeSpan, publishProblem, stayConflicts } from '../../../lib/grazing/graze-window';
import { allowableForage, dailyIntakeLb } from '../../../lib/grazing/capacity';
import { intakeForFlock } from '../../../lib/grazing/flock-intake';
import { earliestSafeDate } from '../../../lib/grazing/safety';
import { todayIn } from '../../../lib/day-keys';

// A grower's blocks: create as a draft, edit, publish for bids, withdraw; and the market a grazier browses.

export type BlockRecord = Omit<Block, 'id' | 'ownerId' | 'status' | 'publishedAt' | 'awardedAt' | 'withdrawnAt' | 'createdAt' | 'updatedAt'>;

/** Validates a block body with the shared schema (400 naming every field). */
async function checkBlock(body: unknown): Promise<BlockInput> {
  return (await check(blockInputSchema, body)) as BlockInput;
}

/** A block body checked exactly as POST /api/blocks checks it, as the columns to store (the demo seed uses it). */
export async function validBlockRecord(body: unknown): Promise<BlockRecord> {
  return blockRecord(await checkBlock(body));
}

/** The columns a validated input gives, including the figures the server derives (each exactly lib's result). */
function blockRecord(input: BlockInput): BlockRecord {
  const sprayRecords = input.sprayRecords ?? [];
  const lbDmPerAcre = blockLbDmPerAcre(input);
  const span = grazeSpan({ ...input, sprayRecords });
  return {
    name: input.name,
    crop: input.crop,
    acres: input.acres,
    placeName: input.placeName ?? null,
    latitude: input.latitude,
    longitude: input.longitude,
    timeZone: input.timeZone ?? DEFAULT_TIME_ZONE,
    forageMethod: input.forageMethod,
    forageSamples: input.forageMethod === 'samples' ? input.forageSamples! : null,
    forageHeight: input.forageMethod === 'height' ? input.forageHeight! : null,
    // Exactly the lib result: what the calculator shows for the same samples or heights.
    lbDmPerAcre,
    targetUtilizationPct: input.targetUtilizationPct,
    residualHeightIn: input.residualHeightIn ?? null,
    windowStart: input.windowStart,
    windowEnd: input.windowEnd,
    outBy: input.outBy,
    harvestDate: input.harvestDate ?? null,
    sprayRecords,
    earliestSafeDate: earliestSafeDate(sprayRecords),
    grazeFrom: span.from,
    grazeUntil: span.until,
    allowableLb: allowableForage({ acres: input.acres, lbDmPerAcre, utilizationPct: input.targetUtilizationPct }).allowableLb,
    waterOnSite: input.waterOnSite,
    perimeterFence: input.perimeterFence,
    truckAccess: input.truckAccess,
    speciesAllowed: input.speciesAllowed,
    youngPlantings: input.youngPlantings,
    notes: input.notes ?? null,
  };
}

const FORAGE_KEYS = ['forageMethod', 'lbDmPerAcre', 'forageSamples', 'forageHeight'] as const;

/**
 * A PATCH body merged into the stored block. The forage fields travel as a group: a patch that touches any
 * of them replaces the measurement, so switching from samples to a direct figure leaves no stale samples.
 */
function mergePatch(current: BlockInput, patch: Record<string, unknown>): Record<string, unknown> {
  const merged: Record<string, unknown> = { ...current };
  if (FORAGE_KEYS.some((k) => k in patch)) {
    delete merged.lbDmPerAcre;
    delete merged.forageSamples;
    delete merged.forageHeight;
  }
  return Object.assign(merged, patch);
}

function changedFields(before: BlockInput, after: BlockInput): string[] {
  const keys = new Set([...Object.keys(before), ...Object.keys(after)]) as Set<keyof BlockInput>;
  return [...keys].filter((k) => JSON.stringify(before[k] ?? null) !== JSON.stringify(after[k] ?? null));
}

/** What the policy needs beyond the block and the viewer. */
export async function blockFacts(em: EntityManager, viewer: Account, block: Block | null): Promise<BlockFacts> {
  if (!block || block.ownerId === viewer.id) return { contractedToViewer: false };
  return { contractedToViewer: await em.existsBy(Contract, { blockId: block.id, grazierId: viewer.id }) };
}

async function loadBlock(em: EntityManager, id: string): Promise<Block | null> {
  return em.findOneBy(Block, { id });
}

function today(ctx: ServiceContext, block: Pick<Block, 'timeZone'>): string {
  return todayIn(block.timeZone, ctx.now());
}

async function viewOne(ctx: ServiceContext, viewer: Account, id: string): Promise<BlockView> {
  const block = await loadBlock(ctx.ds.manager, id);
  if (!block) throw AppError.notFound('Block');
  return (await blockViews(ctx, viewer, [block]))[0];
}

export async function createBlock(ctx: ServiceContext, owner: Account, body: unknown): Promise<BlockView> {
  const input = await checkBlock(body);
  const record = blockRecord(input);
  const id = crypto.randomUUID();
  await inTransaction(ctx.ds, (tx) => tx.insert(Block, { id, ownerId: owner.id, status: 'draft', ...record }));
  return viewOne(ctx, owner, id);
}

/**
 * Edits a draft or open block. An open block may have live bids, and an edit must never change a live
 * bid's footing behind the grazier's back:
 *  - a change the grower chooses (window, out-by, harvest date, species) that a live bid no longer fits
 *    is refused with 409 `live_bids_conflict`, naming the bids and rules, so the grower can ask those
 *    graziers to change their bids first;
 *  - spray records are facts about the land and are never refused: a live bid that now starts inside a
 *    restriction is flagged (its `conflicts`) and cannot be awarded until its grazier moves the start;
 *  - every grazier with a live bid is mailed the list of changed fields.
 */
export async function updateBlock(ctx: ServiceContext, caller: Account, id: string, patch: unknown): Promise<BlockView> {
  assertJsonObject(patch);
  await inTransaction(ctx.ds, async (tx) => {
    const block = await loadBlock(tx, id);
    assertOwnsBlock(caller, block, await blockFacts(tx, caller, block));
    assertEditable(block);
    const before = blockInputOf(block);
    const input = await checkBlock(mergePatch(before, patch));
    const next = blockRecord(input);
    const changed = changedFields(before, input);
    let liveBids: Bid[] = [];
    if (block.status === 'open' && changed.length > 0) {
      const problem = publishProblem(next, today(ctx, next));
      // A spray record that closes the window is accepted (see above); chosen dates that do are not.
      if (problem && problem.code !== 'spray_restriction_covers_window') throw AppError.conflict(problem.message, problem.code);
      liveBids = await tx.findBy(Bid, { blockId: block.id, status: 'live' });
      const chosen = { ...next, sprayRecords: block.sprayRecords };
      const refused = liveBids.map((b) => ({ b, conflicts: stayConflicts(b, chosen) })).filter((x) => x.conflicts.length > 0);
      if (refused.length > 0) {
        const detail = refused.map(({ b, conflicts }) => `the bid for ${b.startDate} to ${b.endDate} (${b.headCount} head): ${conflicts[0].message}`).join('; ');
        throw AppError.conflict(
          `${refused.length} live bid${refused.length === 1 ? '' : 's'} would no longer fit this change — ${detail}. ` +
            'Ask those graziers to change their bids first, or keep the current dates.',
          'live_bids_conflict',
        );
      }
    }
    await tx.update(Block, { id: block.id }, next);
    if (liveBids.length > 0) await queueMail(tx, await blockChangedMails(tx, ctx.links, { ...block, ...next } as Block, liveBids, changed), ctx.now());
  });
  ctx.outbox.kick();
  return viewOne(ctx, caller, id);
}

/** Draft → open. Refused (409, naming the reason) when no safe day is left to graze before animals must be out. */
export async function publishBlock(ctx: ServiceContext, caller: Account, id: string): Promise<BlockView> {
  await inTransaction(ctx.ds, async (tx) => {
    const block = await loadBlock(tx, id);
    assertOwnsBlock(caller, block, await blockFacts(tx, caller, block));
    if (block.status === 'open') throw AppError.conflict('This block is already open for bids', 'already_open');
    if (block.status !== 'draft') throw AppError.conflict(`This block is ${block.status}; only a draft can be published`, 'block_not_draft');
    const problem = publishProblem(block, today(ctx, block));
    if (problem) throw AppError.conflict(problem.message, problem.code);
    const res = await tx.update(Block, { id: block.id, status: 'draft' }, { status: 'open', publishedAt: new Date(ctx.now()) });
    if (res.affected !== 1) throw AppError.conflict('This block changed meanwhile; reload it', 'block_changed');
  });
  return viewOne(ctx, caller, id);
}

/** Draft or open → withdrawn; every live bid is declined and its grazier told. */
export async function withdrawBlock(ctx: ServiceContext, caller: Account, id: string): Promise<BlockView> {
  await inTransaction(ctx.ds, async (tx) => {
    const block = await loadBlock(tx, id);
    assertOwnsBlock(caller, block, await blockFacts(tx, caller, block));
    if (block.status !== 'draft' && block.status !== 'open') {
      throw AppError.conflict(`This block is ${block.status}; only a draft or open block can be withdrawn`, 'block_not_withdrawable');
    }
    const at = new Date(ctx.now());
    await tx.update(Block, { id: block.id }, { status: 'withdrawn', withdrawnAt: at });
    const declined = await tx.findBy(Bid, { blockId: block.id, status: 'live' });
    if (declined.length > 0) await tx.update(Bid, { blockId: block.id, status: 'live' }, { status: 'declined', decidedAt: at });
    await queueMail(tx, await blockWithdrawnMails(tx, ctx.links, block, declined), ctx.now());
  });
  ctx.outbox.kick();
  return viewOne(ctx, caller, id);
}

export async function getBlock(ctx: ServiceContext, viewer: Account, id: string): Promise<BlockView> {
  const block = await loadBlock(ctx.ds.manager, id);
  assertCanViewBlock(viewer, block, await blockFacts(ctx.ds.manager, viewer, block));
  return (await blockViews(ctx, viewer, [block]))[0];
}

/** Which list a caller gets: their own blocks (grower) or the open market (grazier). */
function listView(viewer: Account, asked: BlockListQuery['view']): 'mine' | 'market' {
  const isGrower = hasRole(viewer, 'grower');
  const isGrazier = hasRole(viewer, 'grazier');
  if (asked === 'mine' && !isGrower) throw AppError.forbidden('Only a grower account has blocks of its own');
  if (asked === 'market' && !isGrazier) throw AppError.forbidden('Only a grazier account browses open blocks');
  if (asked) return asked;
  // An account with both roles sees the list of the role it is using.
  if (isGrower && isGrazier) return viewer.activeRole === 'grower' ? 'mine' : 'market';
  if (isGrower) return 'mine';
  if (isGrazier) return 'market';
  throw AppError.forbidden('Only growers and graziers have blocks to list');
}

/**
 * Growers get their own blocks (any state); graziers the open blocks of others that still have a day to
 * graze, filtered and sorted by what matters to a flock on the move. Figures that need the viewer's home
 * base or flock are refused with 400 when the profile lacks them, rather than silently ignored. The list
 * runs in SQL and loads only the page (block-list.ts).
 */
export async function listBlocks(ctx: ServiceContext, viewer: Account, rawQuery: unknown): Promise<BlockListResponse> {
  const q = (await check(blockListQuerySchema, rawQuery)) as BlockListQuery;
  const view = listView(viewer, q.view);
  const home = homeOf(viewer);
  const flock = flockOf(viewer);
  const fields: Record<string, string> = {};
  if (q.maxMiles !== undefined && !home) fields.maxMiles = 'Set your home base in your profile to filter by distance';
  if (q.sort === 'distance' && !home) fields.sort = 'Set your home base in your profile to sort by distance';
  if (q.minDays !== undefined && !flock) fields.minDays = 'Describe your flock in your profile to filter by days of feed';
  if (q.sort === 'days' && !flock) fields.sort = 'Describe your flock in your profile to sort by days of feed';
  if (q.status !== undefined && view === 'market') fields.status = 'The market lists open blocks only';
  if (Object.keys(fields).length > 0) throw AppError.badRequest('Some filters need a profile detail or do not apply', fields);

  const intake = flock ? intakeForFlock(flock.species, flock.animalClass) : null;
  const listViewer: ListViewer = {
    id: viewer.id,
    home,
    flock: flock && intake ? { intakeLbPerHead: dailyIntakeLb({ bodyWeightLb: flock.bodyWeightLb, intakePctBodyWeight: intake.pct }), headCount: flock.headCount } : null,
  };
  const sort = q.sort ?? (view === 'mine' ? 'newest' : home ? 'distance' : 'window');
  const page = q.page ?? 1;
  const pageSize = q.pageSize ?? 20;
  const { blocks, total, totalCapped } = await findBlockPage(ctx.ds, ctx.now(), listViewer, view, { ...q, sort, page, pageSize });
  return { items: (await blockViews(ctx, viewer, blocks)).map(blockCard), total, totalCapped, page, pageSize };
}
