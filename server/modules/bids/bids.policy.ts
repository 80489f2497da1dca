import { AppError } from '../../lib/errors/app-error';
import type { Account } from '../accounts/account.entity';
import type { Block } from '../blocks/block.entity';
import type { Bid } from './bid.entity';
import type { StayConflict } from '../../../lib/grazing/graze-window';

// Who may see and act on a bid. A bid is private to two people: the grazier who made it and the grower whose
// block it is on. To anyone else it does not exist (404) — another grazier never learns that a bid exists,
// let alone its price. Between the two parties, the wrong one gets 403.

export function isBidder(viewer: Account, bid: Bid): boolean {
  return bid.grazierId === viewer.id;
}

export function assertCanSeeBid(viewer: Account, bid: Bid | null, block: Block | null): asserts bid is Bid {
  if (!bid || !block || (!isBidder(viewer, bid) && block.ownerId !== viewer.id)) throw AppError.notFound('Bid');
}

/** Changing or withdrawing a bid is for its grazier alone. */
export function assertBidder(viewer: Account, bid: Bid | null, block: Block | null): asserts bid is Bid {
  assertCanSeeBid(viewer, bid, block);
  if (!isBidder(viewer, bid)) throw AppError.forbidden('Only the grazier who made this bid may change or withdraw it');
}

/** Awarding is for the grower who owns the block. */
export function assertAwarder(viewer: Account, bid: Bid | null, block: Block | null): asserts bid is Bid {
  assertCanSeeBid(viewer, bid, block);
  if (block!.ownerId !== viewer.id) throw AppError.forbidden('Only the grower who posted this block may award it');
}

export function assertBidLive(bid: Bid): void {
  if (bid.status !== 'live') throw AppError.conflict(`This bid is ${bid.status}; only a live bid can be changed, withdrawn or awarded`, 'bid_not_live');
}

/** Bids change only while their block is open (a live bid on any other block would be a bug; refuse anyway). */
export function assertBlockOpen(block: Block): void {
  if (block.status !== 'open') throw AppError.conflict(`This block is ${block.status}; bids on it can no longer change`, 'block_not_open');
}

export function assertBlockTakesAward(block: Block): void {
  if (block.status === 'awarded') throw AppError.conflict('This block has already been awarded', 'already_awarded');
  if (block.status !== 'open') throw AppError.conflict(`This block is ${block.status}; only an open block can be awarded`, 'block_not_open');
}

/** 400 naming each bid field that breaks a rule of the block (first reason per field). */
export function assertStayFits(conflicts: StayConflict[]): void {
  if (conflicts.length === 0) return;
  const fields: Record<string, string> = {};
  for (const c of conflicts) if (!(c.field in fields)) fields[c.field] = c.message;
  throw AppError.badRequest('The bid does not fit this block', fields);
}

/** A bid the block has moved away from (e.g. a new spray record) cannot become a contract until it is changed. */
export function assertAwardable(conflicts: StayConflict[]): void {
  if (conflicts.length === 0) return;
  throw AppError.conflict(`This bid no longer fits the block (${conflicts[0].message}); ask the grazier to change it first`, 'bid_conflicts_block');
}
