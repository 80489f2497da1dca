import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { assertJsonObject, check } from '../../lib/http/validate';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { queueMail } from '../../lib/mail/outbox';
import { awardMails, bidToGrowerMails } from './bids.mails';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { assertCanBidOn, assertCanViewBlock, canViewBlock, isOwner } from '../blocks/blocks.policy';
import { blockFacts } from '../blocks/blocks.service';
import { contractViews, createContract } from '../contracts/contracts.service';
import { Bid } from './bid.entity';
import { assertAwardable, assertAwarder, assertBidder, assertBidLive, assertBlockOpen, assertBlockTakesAward, assertCanSeeBid, assertStayFits } from './bids.policy';
import { bidInputOf, bidViews } from './bid-views';
import { stayConflicts } from '../../../lib/grazing/graze-window';
import { normaliseBid } from '../../../lib/grazing/bid-compare';
import { GrazingInputError } from '../../../lib/grazing/errors';
import { parseRate, rateToString } from '../../../lib/money';
import { todayIn } from '../../../lib/day-keys';
import { bidInputSchema, bidListQuerySchema, DEFAULT_BID_PAGE_SIZE, type BidInput, type BidListQuery, type BidView } from '../../../lib/schemas/bid';
import type { Page } from '../../../lib/schemas/paging';
import type { ContractView } from '../../../lib/schemas/contract';

// Bids: a grazier offers a stay on an open block; the grower compares the bids and awards one.

async function checkBid(body: unknown): Promise<BidInput> {
  return (await check(bidInputSchema, body)) as BidInput;
}

/** The columns of a validated bid; the rate is kept in its canonical text ("0.180" → "0.18", same value). */
function bidRecord(input: BidInput) {
  return {
    basis: input.basis,
    rate: rateToString(parseRate(input.rate)),
    headCount: input.headCount,
    species: input.species,
    animalClass: input.animalClass,
    bodyWeightLb: input.bodyWeightLb,
    startDate: input.startDate,
    endDate: input.endDate,
    services: input.services ?? [],
    note: input.note ?? null,
  };
}

/** A bid body checked exactly as POST /api/blocks/:id/bids checks it against `block` on `today` (the demo seed uses it). */
export async function validBidRecord(body: unknown, block: Block, today: string) {
  const input = await checkBid(body);
  assertStayFits(stayConflicts(input, block, today));
  assertPriceable(input, block);
  return bidRecord(input);
}

/** The bid must price out within exact integer cents on this block (lib's chargeLines refuses past that). */
function assertPriceable(input: BidInput, block: Block): void {
  try {
    normaliseBid(input, block);
  } catch (err) {
    if (err instanceof GrazingInputError) throw AppError.badRequest('The bid does not fit this block', { rate: 'The estimated total is too large: check the rate and the basis' });
    throw err;
  }
}

function todayAt(ctx: ServiceContext, block: Block): string {
  return todayIn(block.timeZone, ctx.now());
}

async function viewOf(em: EntityManager, id: string): Promise<BidView> {
  return (await bidViews(em, [await em.findOneByOrFail(Bid, { id })]))[0];
}

/** A grazier bids on an open block: the stay must fit the block's window, spray restrictions and out-by date. */
export async function placeBid(ctx: ServiceContext, caller: Account, blockId: string, body: unknown): Promise<BidView> {
  const input = await checkBid(body);
  const bidExists = () => AppError.conflict('You already have a live bid on this block: change that bid, or withdraw it first', 'bid_exists');
  // Two bids from one grazier racing past the check (several processes) meet the unique live-bid index: also 409.
  const { bid } = await inTransaction(ctx.ds, async (tx) => {
    const block = await tx.findOneBy(Block, { id: blockId });
    assertCanViewBlock(caller, block, await blockFacts(tx, caller, block));
    assertCanBidOn(caller, block);
    if (await tx.existsBy(Bid, { blockId, grazierId: caller.id, status: 'live' })) throw bidExists();
    assertStayFits(stayConflicts(input, block, todayAt(ctx, block)));
    assertPriceable(input, block);
    const bid = tx.create(Bid, { id: crypto.randomUUID(), blockId, grazierId: caller.id, status: 'live', ...bidRecord(input) });
    await tx.insert(Bid, bid);
    await queueMail(tx, await bidToGrowerMails(tx, ctx.links, block, await viewOf(tx, bid.id), 'New bid'), ctx.now());
    return { bid };
  }).catch((err: unknown) => {
    throw isUniqueViolation(err) ? bidExists() : err;
  });
  ctx.outbox.kick();
  return viewOf(ctx.ds.manager, bid.id);
}

/** The grazier changes their live bid; it is checked again in full against the block as it is now. */
export async function updateBid(ctx: ServiceContext, caller: Account, bidId: string, patch: unknown): Promise<BidView> {
  assertJsonObject(patch);
  await inTransaction(ctx.ds, async (tx) => {
    const bid = await tx.findOneBy(Bid, { id: bidId });
    const block = bid ? await tx.findOneBy(Block, { id: bid.blockId }) : null;
    assertBidder(caller, bid, block);
    assertBidLive(bid);
    assertBlockOpen(block!);
    const input = await checkBid({ ...bidInputOf(bid), ...patch });
    assertStayFits(stayConflicts(input, block!, todayAt(ctx, block!)));
    assertPriceable(input, block!);
    await tx.update(Bid, { id: bid.id, status: 'live' }, bidRecord(input));
    await queueMail(tx, await bidToGrowerMails(tx, ctx.links, block!, await viewOf(tx, bid.id), 'Bid changed'), ctx.now());
  });
  ctx.outbox.kick();
  return viewOf(ctx.ds.manager, bidId);
}

export async function withdrawBid(ctx: ServiceContext, caller: Account, bidId: string): Promise<BidView> {
  await inTransaction(ctx.ds, async (tx) => {
    const bid = await tx.findOneBy(Bid, { id: bidId });
    const block = bid ? await tx.findOneBy(Block, { id: bid.blockId }) : null;
    assertBidder(caller, bid, block);
    assertBidLive(bid);
    assertBlockOpen(block!);
    await tx.update(Bid, { id: bid.id, status: 'live' }, { status: 'withdrawn' });
  });
  return viewOf(ctx.ds.manager, bidId);
}

export async function getBid(ctx: ServiceContext, viewer: Account, bidId: string): Promise<BidView> {
  const bid = await ctx.ds.manager.findOneBy(Bid, { id: bidId });
  const block = bid ? await ctx.ds.manager.findOneBy(Block, { id: bid.blockId }) : null;
  assertCanSeeBid(viewer, bid, block);
  return (await bidViews(ctx.ds.manager, [bid]))[0];
}

// A page of bids for each shape of filter (block, grazier, status; oldest or newest first), each statement built once.
const BID_FILTER_COLUMNS = { blockId: 'block_id', grazierId: 'grazier_id', status: 'status' } as const;
type BidFilter = Partial<Record<keyof typeof BID_FILTER_COLUMNS, string>>;
const bidQueries = new Map<string, { page: PreparedSelect<Bid>; count: PreparedSelect<Bid> }>();

function bidQueriesFor(filter: BidFilter, newestFirst: boolean) {
  const keys = (Object.keys(BID_FILTER_COLUMNS) as Array<keyof typeof BID_FILTER_COLUMNS>).filter((k) => filter[k] !== undefined);
  const shape = `${keys.join(',')}|${newestFirst ? 'desc' : 'asc'}`;
  let q = bidQueries.get(shape);
  if (!q) {
    const where = (em: EntityManager) => {
      const qb = em.createQueryBuilder(Bid, 'b');
      keys.forEach((k, i) => (i === 0 ? qb.where(`b.${BID_FILTER_COLUMNS[k]} = :${k}`) : qb.andWhere(`b.${BID_FILTER_COLUMNS[k]} = :${k}`)));
      return qb;
    };
    q = {
      page: new PreparedSelect((em) => where(em).orderBy('b.created_at', newestFirst ? 'DESC' : 'ASC').addOrderBy('b.id', 'ASC'), { offset: true }),
      count: new PreparedSelect((em) => where(em).select('COUNT(*)', 'n')),
    };
    bidQueries.set(shape, q);
  }
  return q;
}

/** The page of `bids` a list query asks for, oldest or newest first, and how many there are. */
async function bidPage(ctx: ServiceContext, where: BidFilter, q: BidListQuery, newestFirst: boolean, block?: Block): Promise<Page<BidView>> {
  const page = q.page ?? 1;
  const pageSize = q.pageSize ?? DEFAULT_BID_PAGE_SIZE;
  const em = ctx.ds.manager;
  const filter: BidFilter = { ...where, ...(q.status ? { status: q.status } : {}) };
  const queries = bidQueriesFor(filter, newestFirst);
  const bids = await queries.page.many(em, { ...filter, limit: pageSize, offset: (page - 1) * pageSize });
  // A first page that is not full holds them all: no count needed.
  const total = page === 1 && bids.length < pageSize ? bids.length : Number((await queries.count.raw<{ n: number | string }>(em, filter))[0].n);
  return { items: await bidViews(em, bids, block ? [block] : []), total, page, pageSize };
}

const blockById = new PreparedSelect((em) => em.createQueryBuilder(Block, 'b').where('b.id = :id'));

/**
 * Bids on a block, oldest first, a page at a time. The owner sees all of them (every state), normalised for
 * comparison; anyone else sees only their own — and if they may not see the block and have no bid on it,
 * the block does not exist (404).
 */
export async function listBlockBids(ctx: ServiceContext, viewer: Account, blockId: string, query: unknown = {}): Promise<Page<BidView>> {
  const q = (await check(bidListQuerySchema, query)) as BidListQuery;
  const em = ctx.ds.manager;
  const block = await blockById.one(em, { id: blockId });
  if (!block) throw AppError.notFound('Block');
  if (isOwner(viewer, block)) return bidPage(ctx, { blockId }, q, false, block);
  const own = await bidPage(ctx, { blockId, grazierId: viewer.id }, q, false, block);
  if (own.total === 0 && !canViewBlock(viewer, block, await blockFacts(em, viewer, block)) && !(await em.existsBy(Bid, { blockId, grazierId: viewer.id }))) {
    throw AppError.notFound('Block');
  }
  return own;
}

/** A grazier's own bids across blocks, newest first, a page at a time; `status` narrows them. */
export async function listMyBids(ctx: ServiceContext, viewer: Account, query: unknown): Promise<Page<BidView>> {
  const q = (await check(bidListQuerySchema, query)) as BidListQuery;
  return bidPage(ctx, { grazierId: viewer.id }, q, true);
}

/**
 * The grower awards a bid. In one transaction: the caller must own the block (checked first, so a stranger
 * learns nothing from a 409) → the block must be open → the bid live and still fitting the block → mark the
 * block awarded → accept the bid → decline the others → create the contract to be signed. Marking the
 * block is a conditional UPDATE (… WHERE status = 'open'): if another award got there first it changes
 * no row and this one rolls back with 409, so two racing awards make exactly one contract. It is the first
 * write, so on PostgreSQL a second award waits on the block's row and never holds a bid the first one must
 * decline (the other order deadlocks); should the loser still meet a unique key (one accepted bid per block,
 * one contract per block), that is the same 409. Mail goes out after the commit; a mail failure is logged and
 * never undoes the award.
 */
export async function awardBid(ctx: ServiceContext, caller: Account, bidId: string): Promise<ContractView> {
  const { contract } = await awardInTransaction(ctx, caller, bidId).catch((err: unknown) => {
    throw isUniqueViolation(err) ? AppError.conflict('This block has already been awarded', 'already_awarded') : err;
  });
  ctx.outbox.kick();
  const [view] = await contractViews(ctx.ds.manager, [contract]);
  return view;
}

function awardInTransaction(ctx: ServiceContext, caller: Account, bidId: string) {
  return inTransaction(ctx.ds, async (tx) => {
    const bid = await tx.findOneBy(Bid, { id: bidId });
    const block = bid ? await tx.findOneBy(Block, { id: bid.blockId }) : null;
    assertAwarder(caller, bid, block);
    assertBlockTakesAward(block!);
    assertBidLive(bid);
    assertAwardable(stayConflicts(bid, block!));

    const at = new Date(ctx.now());
    await markBlockAwarded(tx, block!, at);
    await acceptBid(tx, bid, at);
    const declined = await declineOtherBids(tx, bid, at);
    const contract = await createContract(tx, block!, bid);
    await queueMail(tx, await awardMails(tx, ctx.links, block!, bid, declined, contract.id), ctx.now());
    return { contract };
  });
}

async function acceptBid(tx: EntityManager, bid: Bid, at: Date): Promise<void> {
  const res = await tx.update(Bid, { id: bid.id, status: 'live' }, { status: 'accepted', decidedAt: at });
  if (res.affected !== 1) throw AppError.conflict('This bid changed meanwhile; reload the bids', 'bid_not_live');
}

async function declineOtherBids(tx: EntityManager, winner: Bid, at: Date): Promise<Bid[]> {
  const others = (await tx.findBy(Bid, { blockId: winner.blockId, status: 'live' })).filter((b) => b.id !== winner.id);
  for (const b of others) await tx.update(Bid, { id: b.id, status: 'live' }, { status: 'declined', decidedAt: at });
  return others;
}

/** Exported for the test that a stale read cannot award a block twice. */
export async function markBlockAwarded(tx: EntityManager, block: Block, at: Date): Promise<void> {
  const res = await tx.update(Block, { id: block.id, status: 'open' }, { status: 'awarded', awardedAt: at });
  if (res.affected !== 1) throw AppError.conflict('This block has already been awarded', 'already_awarded');
}
