import type { EntityManager } from 'typeorm';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { readTogether } from '../../lib/db/reads';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { Contract } from '../contracts/contract.entity';
import { blockSummary, cautionFlags } from '../blocks/block-views';
import type { Bid } from './bid.entity';
import { normaliseBid } from '../../../lib/grazing/bid-compare';
import { stayConflicts } from '../../../lib/grazing/graze-window';
import { cautionsForBlock } from '../../../lib/grazing/safety';
import type { BidInput, BidView } from '../../../lib/schemas/bid';
import type { CautionFlagView } from '../../../lib/schemas/block';
import { pickTerms } from '../../../lib/terms';

const completedPerGrazier = new PreparedSelect((em) =>
  em
    .createQueryBuilder(Contract, 'c')
    .select('c.grazier_id', 'grazierId')
    .addSelect('COUNT(*)', 'n')
    .where("c.status IN ('agreed', 'invoiced', 'paid')")
    .andWhere('c.grazier_id IN (:...ids)')
    .groupBy('c.grazier_id'),
);
const bidBlocks = new PreparedSelect((em) => em.createQueryBuilder(Block, 'b').where('b.id IN (:...ids)'));
const bidGraziers = new PreparedSelect((em) => em.createQueryBuilder(Account, 'a').select(['a.id', 'a.name', 'a.businessName']).where('a.id IN (:...ids)'));

/** Completed contracts per grazier: their record on Fieldfold. */
export async function completedContracts(em: EntityManager, grazierIds: string[]): Promise<Map<string, number>> {
  if (grazierIds.length === 0) return new Map();
  const rows = await completedPerGrazier.raw<{ grazierId: string; n: number }>(em, { ids: grazierIds });
  return new Map(rows.map((r) => [r.grazierId, Number(r.n)]));
}

export function bidInputOf(b: Bid): BidInput {
  return { ...pickTerms(b), note: b.note };
}

/**
 * Bids as the API returns them, each normalised against its block as it stands now (lib/grazing/bid-compare),
 * with the grazier's record and, for a live bid, the block rules it no longer fits.
 */
export async function bidViews(em: EntityManager, bids: Bid[], knownBlocks: Block[] = []): Promise<BidView[]> {
  if (bids.length === 0) return [];
  const known = new Set(knownBlocks.map((b) => b.id));
  const blockIds = [...new Set(bids.map((b) => b.blockId))].filter((id) => !known.has(id));
  const grazierIds = [...new Set(bids.map((b) => b.grazierId))];
  const [blocks, graziers, records] = await readTogether(em, [
    () => (blockIds.length ? bidBlocks.many(em, { ids: blockIds }) : Promise.resolve([])),
    () => bidGraziers.many(em, { ids: grazierIds }),
    () => completedContracts(em, grazierIds),
  ]);
  const blockById = new Map([...knownBlocks, ...blocks].map((b) => [b.id, b]));
  const grazierById = new Map(graziers.map((g) => [g.id, g]));
  // A block's bids share its cautions species by species: work them out once per block and species.
  const cautions = new Map<string, CautionFlagView[]>();
  const cautionsFor = (block: Block, species: Bid['species']) => {
    const key = `${block.id}/${species}`;
    if (!cautions.has(key)) cautions.set(key, cautionFlags(cautionsForBlock(block, { species })));
    return cautions.get(key)!;
  };
  return bids.map((bid) => {
    const block = blockById.get(bid.blockId)!;
    const grazier = grazierById.get(bid.grazierId);
    return {
      id: bid.id,
      blockId: bid.blockId,
      status: bid.status,
      grazier: {
        id: bid.grazierId,
        name: grazier?.name ?? 'Unknown grazier',
        businessName: grazier?.businessName ?? null,
        completedContracts: records.get(bid.grazierId) ?? 0,
      },
      ...bidInputOf(bid),
      services: bid.services,
      note: bid.note,
      normalised: normaliseBid(bid, block),
      conflicts: bid.status === 'live' ? stayConflicts(bid, block) : [],
      cautions: cautionsFor(block, bid.species),
      block: blockSummary(block),
      createdAt: bid.createdAt.toISOString(),
      updatedAt: bid.updatedAt.toISOString(),
      decidedAt: bid.decidedAt?.toISOString() ?? null,
    };
  });
}
