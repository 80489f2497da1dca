import { AppError } from '../../lib/errors/app-error';
import { hasRole } from '../../lib/http/auth';
import type { Account } from '../accounts/account.entity';
import type { Block } from './block.entity';

// Who may see and change a block. A block's existence is private until it is open: anyone the rules below
// do not let see it gets 404 (not 403), so draft and withdrawn blocks cannot be probed by id. A caller who
// can see the block but may not do the thing gets 403.

export interface BlockFacts {
  /** The block is the subject of a contract with this viewer as grazier. */
  contractedToViewer: boolean;
}

export function isOwner(viewer: Account, block: Block): boolean {
  return block.ownerId === viewer.id;
}

/** Owner: always. Grazier: while open, or once it is contracted to them. Nobody else. */
export function canViewBlock(viewer: Account, block: Block, facts: BlockFacts): boolean {
  if (isOwner(viewer, block)) return true;
  if (!hasRole(viewer, 'grazier')) return false;
  return block.status === 'open' || facts.contractedToViewer;
}

export function assertCanViewBlock(viewer: Account, block: Block | null, facts: BlockFacts): asserts block is Block {
  if (!block || !canViewBlock(viewer, block, facts)) throw AppError.notFound('Block');
}

export function assertOwnsBlock(viewer: Account, block: Block | null, facts: BlockFacts): asserts block is Block {
  assertCanViewBlock(viewer, block, facts);
  if (!isOwner(viewer, block)) throw AppError.forbidden('Only the grower who posted this block may do this');
}

/** Draft and open blocks can be edited (open ones with care for live bids: see blocks.service updateBlock). */
export function assertEditable(block: Block): void {
  if (block.status !== 'draft' && block.status !== 'open') {
    throw AppError.conflict(`This block is ${block.status}; only draft or open blocks can be changed`, 'block_not_editable');
  }
}

export function canBidOn(viewer: Account, block: Block): boolean {
  return block.status === 'open' && !isOwner(viewer, block) && hasRole(viewer, 'grazier');
}

export function assertCanBidOn(viewer: Account, block: Block): void {
  if (isOwner(viewer, block)) throw AppError.forbidden('You cannot bid on your own block');
  if (block.status !== 'open') throw AppError.conflict(`This block is ${block.status} and takes no bids`, 'block_not_open');
}
