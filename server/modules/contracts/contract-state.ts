import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { readTogether } from '../../lib/db/reads';
import { AppError } from '../../lib/errors/app-error';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { Contract } from './contract.entity';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { ContractAmendment, LogEntry, SignOff } from './contract-records.entity';
import { canonicalTermsText, termsFromAward, type ContractTerms, type TermsParty } from '../../../lib/contract-terms';
import { logFigures, type LogFiguresResult } from '../../../lib/grazing/log-figures';
import type { BidTermsView } from '../../../lib/schemas/bid';
import { pickTerms } from '../../../lib/terms';

// Reading and holding a contract's state inside a use case: the row lock, the terms in force with their
// hash, the waiting amendment, the open sign-off round, and the log's running figures.

/** SHA-256 (hex) of the UTF-8 text: what a signature's termsHash is of. */
export function sha256Hex(text: string): string {
  return crypto.createHash('sha256').update(text, 'utf8').digest('hex');
}

/**
 * The contract, with its row held for the rest of the transaction: the first statement is a write
 * (revision + 1), so on PostgreSQL two use cases on one contract queue here before either reads anything
 * it decides on (on SQLite every transaction already runs alone, server/lib/db/transaction.ts).
 */
export async function lockContract(tx: EntityManager, id: string): Promise<Contract | null> {
  await tx.createQueryBuilder().update(Contract).set({ revision: () => 'revision + 1' }).where('id = :id', { id }).execute();
  return findContract(tx, id);
}

const contractById = new PreparedSelect((em) => em.createQueryBuilder(Contract, 'c').where('c.id = :id'));

/** The contract with this id, or null (em.findOneBy, with its SQL built once: every log request reads it). */
export function findContract(em: EntityManager, id: string): Promise<Contract | null> {
  return contractById.one(em, { id });
}

function termsParty(a: Account | null | undefined): TermsParty {
  return { name: a?.name ?? 'Unknown', businessName: a?.businessName ?? null };
}

/** Version 1 of the terms from the block and the winning bid, with the parties as their accounts name them now. */
export async function awardTerms(em: EntityManager, contractId: string, block: Block, growerId: string, grazierId: string, bid: BidTermsView): Promise<ContractTerms> {
  const [grower, grazier] = await readTogether(em, [() => em.findOneBy(Account, { id: growerId }), () => em.findOneBy(Account, { id: grazierId })]);
  return termsOfAward(contractId, block, grower, grazier, bid);
}

/** awardTerms with the two accounts at hand (the bench's season seed builds a thousand contracts this way). */
export function termsOfAward(contractId: string, block: Block, grower: Account | null, grazier: Account | null, bid: BidTermsView): ContractTerms {
  return termsFromAward({
    contractId,
    grower: termsParty(grower),
    grazier: termsParty(grazier),
    block: {
      name: block.name,
      crop: block.crop,
      placeName: block.placeName,
      acres: block.acres,
      lbDmPerAcre: block.lbDmPerAcre,
      targetUtilizationPct: block.targetUtilizationPct,
      residualHeightIn: block.residualHeightIn,
      timeZone: block.timeZone,
      harvestDate: block.harvestDate,
      waterOnSite: block.waterOnSite,
      perimeterFence: block.perimeterFence,
      truckAccess: block.truckAccess,
      youngPlantings: block.youngPlantings,
      speciesAllowed: block.speciesAllowed,
      outBy: block.outBy,
      sprayRecords: block.sprayRecords,
    },
    bid: pickTerms(bid),
  });
}

export interface TermsInForce {
  terms: ContractTerms;
  text: string;
  hash: string;
}

/**
 * The terms in force. Contracts awarded before the snapshot was kept get one built from their block as it
 * is (blocks are no longer edited once awarded) and the contract's own copied terms; `persist` stores it,
 * so from the first signature on the terms are fixed.
 */
export async function termsInForce(em: EntityManager, contract: Contract, persist = false): Promise<TermsInForce> {
  if (contract.terms && contract.termsText && contract.termsHash) return { terms: contract.terms, text: contract.termsText, hash: contract.termsHash };
  const block = await em.findOneByOrFail(Block, { id: contract.blockId });
  const built = await awardTerms(em, contract.id, { ...block, outBy: contract.outBy, acres: contract.acres, lbDmPerAcre: contract.lbDmPerAcre, targetUtilizationPct: contract.targetUtilizationPct, timeZone: contract.timeZone }, contract.growerId, contract.grazierId, contract);
  const terms = { ...built, version: contract.termsVersion };
  const text = canonicalTermsText(terms);
  const hash = sha256Hex(text);
  if (persist) {
    await em.update(Contract, { id: contract.id }, { terms, termsText: text, termsHash: hash });
    Object.assign(contract, { terms, termsText: text, termsHash: hash });
  }
  return { terms, text, hash };
}

export async function waitingAmendment(em: EntityManager, contractId: string): Promise<ContractAmendment | null> {
  return em.findOneBy(ContractAmendment, { contractId, status: 'proposed' });
}

const latestRound = new PreparedSelect((em) => em.createQueryBuilder(SignOff, 's').where('s.contract_id = :contractId').orderBy('s.round', 'DESC').limit(1));

export async function latestSignOff(em: EntityManager, contractId: string): Promise<SignOff | null> {
  return latestRound.one(em, { contractId });
}

export function requireTerms(contract: Contract): ContractTerms {
  if (!contract.terms) throw new AppError(500, 'internal', 'Contract terms missing');
  return contract.terms;
}

// The log's running figures read the moves and two aggregates on every log request and every entry posted.
const movesQuery = new PreparedSelect((em) =>
  em
    .createQueryBuilder(LogEntry, 'e')
    .select(['e.id AS "id"', 'e.at AS "at"', 'e.change AS "change"', 'e.at_ms AS "atMs"'])
    // The kind as a literal, so SQLite can use the partial index of the moves (idx_log_moves).
    .where("e.contract_id = :id AND e.kind = 'move' AND e.voided_at IS NULL")
    .orderBy('e.at_ms', 'ASC')
    .addOrderBy('e.recorded_at', 'ASC')
    .addOrderBy('e.id', 'ASC'),
);
const lossesQuery = new PreparedSelect((em) =>
  em.createQueryBuilder(LogEntry, 'e').select('COALESCE(SUM(e.losses), 0)', 'n').where("e.contract_id = :id AND e.author = 'grazier' AND e.voided_at IS NULL"),
);
const residualQuery = new PreparedSelect((em) =>
  em
    .createQueryBuilder(LogEntry, 'e')
    .select('e.residual_height_in', 'h')
    .where('e.contract_id = :id AND e.residual_height_in IS NOT NULL AND e.voided_at IS NULL')
    .orderBy('e.at_ms', 'DESC')
    .addOrderBy('e.id', 'DESC')
    .limit(1),
);

/** The moves of a log in time order (moves at one instant in the order they were stored); voided ones count for nothing. */
export async function movesOf(em: EntityManager, contractId: string): Promise<Array<{ id: string; at: string; change: number; atMs: number }>> {
  const rows = await movesQuery.raw<{ id: string; at: string; change: number; atMs: number | string }>(em, { id: contractId });
  return rows.map((r) => ({ id: r.id, at: r.at, change: Number(r.change), atMs: Number(r.atMs) }));
}

/**
 * The log's running figures (lib/grazing/log-figures) from the moves and two aggregates, so the work grows
 * with the number of moves (a few a day), not with the whole log.
 */
export async function figuresOf(em: EntityManager, contract: Contract, terms: ContractTerms, nowMs: number): Promise<LogFiguresResult> {
  const [moves, [losses], [residual]] = await readTogether(em, [
    () => movesOf(em, contract.id),
    () => lossesQuery.raw<{ n: number | string }>(em, { id: contract.id }),
    () => residualQuery.raw<{ h: number }>(em, { id: contract.id }),
  ]);
  return logFigures({
    moves: moves.map(({ at, change }) => ({ at, change })),
    latestResidualHeightIn: residual?.h ?? null,
    lossesSoFar: Number(losses?.n ?? 0),
    nowMs,
    timeZone: terms.block.timeZone,
    stay: terms,
    block: terms.block,
  });
}
