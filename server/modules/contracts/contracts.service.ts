import crypto from 'node:crypto';
import { In, type EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { blockSummary, partyOf } from '../blocks/block-views';
import type { Bid } from '../bids/bid.entity';
import { Contract } from './contract.entity';
import { assertParty } from './contracts.policy';
import { normaliseBid } from '../../../lib/grazing/bid-compare';
import type { ContractView } from '../../../lib/schemas/contract';
import { pickTerms } from '../../../lib/terms';

/** The contract an award creates: the bid's terms and the block's figures, copied as they are now. */
export async function createContract(tx: EntityManager, block: Block, bid: Bid): Promise<Contract> {
  const contract = tx.create(Contract, {
    id: crypto.randomUUID(),
    blockId: block.id,
    bidId: bid.id,
    growerId: block.ownerId,
    grazierId: bid.grazierId,
    status: 'to-sign',
    ...pickTerms(bid),
    outBy: block.outBy,
    acres: block.acres,
    lbDmPerAcre: block.lbDmPerAcre,
    targetUtilizationPct: block.targetUtilizationPct,
    timeZone: block.timeZone,
  });
  await tx.insert(Contract, contract);
  return tx.findOneByOrFail(Contract, { id: contract.id });
}

export async function contractViews(em: EntityManager, contracts: Contract[]): Promise<ContractView[]> {
  if (contracts.length === 0) return [];
  const [blocks, people] = await Promise.all([
    em.findBy(Block, { id: In([...new Set(contracts.map((c) => c.blockId))]) }),
    em.findBy(Account, { id: In([...new Set(contracts.flatMap((c) => [c.growerId, c.grazierId]))]) }),
  ]);
  const blockById = new Map(blocks.map((b) => [b.id, b]));
  const personById = new Map(people.map((p) => [p.id, p]));
  const party = (id: string) => {
    const p = personById.get(id);
    return p ? partyOf(p) : { id, name: 'Unknown', businessName: null };
  };
  return contracts.map((c) => ({
    id: c.id,
    status: c.status,
    blockId: c.blockId,
    bidId: c.bidId,
    block: blockSummary(blockById.get(c.blockId)!),
    grower: party(c.growerId),
    grazier: party(c.grazierId),
    ...pickTerms(c),
    outBy: c.outBy,
    acres: c.acres,
    lbDmPerAcre: c.lbDmPerAcre,
    targetUtilizationPct: c.targetUtilizationPct,
    timeZone: c.timeZone,
    normalised: normaliseBid(c, c),
    createdAt: c.createdAt.toISOString(),
    // For invoicing: what a head-day invoice will bill (null until sign-off agrees it).
    agreedHeadDays: c.agreedHeadDays,
  }));
}

/** Contracts the viewer is a party to, newest first. */
export async function listContracts(ctx: ServiceContext, viewer: Account): Promise<{ items: ContractView[] }> {
  const rows = await ctx.ds.manager.find(Contract, {
    where: [{ growerId: viewer.id }, { grazierId: viewer.id }],
    order: { createdAt: 'DESC', id: 'ASC' },
  });
  return { items: await contractViews(ctx.ds.manager, rows) };
}

export async function getContract(ctx: ServiceContext, viewer: Account, id: string): Promise<ContractView> {
  const contract = await ctx.ds.manager.findOneBy(Contract, { id });
  assertParty(viewer, contract);
  const [view] = await contractViews(ctx.ds.manager, [contract]);
  if (!view) throw AppError.notFound('Contract');
  return view;
}
