import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { check } from '../../lib/http/validate';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { queueMail } from '../../lib/mail/outbox';
import type { ServiceContext } from '../../lib/service-context';
import type { Account } from '../accounts/account.entity';
import type { Block } from '../blocks/block.entity';
import type { Bid } from '../bids/bid.entity';
import { Contract } from './contract.entity';
import { ContractAmendment, ContractSignature } from './contract-records.entity';
import { awardTerms, lockContract, sha256Hex, termsInForce, waitingAmendment } from './contract-state';
import { contractViews } from './contract-views';
import { cancelledMails, peopleOf, signedMails } from './contracts.mails';
import { assertCancellable, assertCanRead, assertParty, partyOf } from './contracts.policy';
import { refreshLogDocument } from './contract-documents';
import { decodeCursor, encodeCursor } from './cursor';
import { canonicalTermsText, type ContractTerms } from '../../../lib/contract-terms';
import {
  cancelContractSchema,
  contractListQuerySchema,
  DEFAULT_CONTRACT_PAGE,
  signContractSchema,
  type CancelContractInput,
  type ContractListQuery,
  type ContractListResponse,
  type ContractParty,
  type ContractView,
  type SignContractInput,
} from '../../../lib/schemas/contract';
import { pickTerms } from '../../../lib/terms';

// Contracts: born at the award with a snapshot of the terms, signed once by each party on each version of
// the terms, cancelled before the animals arrive. The log and sign-off are in contract-log.service.ts and
// sign-off.service.ts, amendments in contract-amendments.service.ts.

/** The contract an award creates: the bid's terms and the block's figures, copied as they are now, with the text both will sign. */
export async function createContract(tx: EntityManager, block: Block, bid: Bid): Promise<Contract> {
  const id = crypto.randomUUID();
  const terms = await awardTerms(tx, id, block, block.ownerId, bid.grazierId, bid);
  await tx.insert(Contract, tx.create(Contract, contractRecord(id, block, bid, terms)));
  return tx.findOneByOrFail(Contract, { id });
}

/** The row createContract stores for version 1 of `terms` (to sign; nothing signed, grazed or agreed yet). */
export function contractRecord(id: string, block: Block, bid: Bid, terms: ContractTerms): Omit<Contract, 'createdAt' | 'updatedAt'> {
  const termsText = canonicalTermsText(terms);
  return {
    id,
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
    termsVersion: 1,
    terms,
    termsText,
    termsHash: sha256Hex(termsText),
    agreedHeadDays: null,
    agreedAt: null,
    grazingStartedAt: null,
    cancelledAt: null,
    cancelledBy: null,
    cancelReason: null,
    revision: 0,
    logDocumentId: null,
    logDocumentKey: null,
  };
}

/** One party's signature on one version of the terms, as signContract stores it (origin cut to the columns). */
export function signatureRecord(s: {
  contractId: string;
  termsVersion: number;
  party: ContractParty;
  accountId: string;
  input: SignContractInput;
  termsHash: string;
  origin: SigningOrigin;
  at: Date;
}): ContractSignature {
  return Object.assign(new ContractSignature(), {
    id: crypto.randomUUID(),
    contractId: s.contractId,
    termsVersion: s.termsVersion,
    party: s.party,
    accountId: s.accountId,
    typedName: s.input.typedName,
    cautionsAcknowledged: s.input.cautionsAcknowledged,
    termsHash: s.termsHash,
    ip: s.origin.ip?.slice(0, 64) ?? null,
    userAgent: s.origin.userAgent?.slice(0, 400) ?? null,
    signedAt: s.at,
  });
}

export { contractViews };


/** Contracts the viewer is a party to, newest first, a page at a time (filtered, ordered and cut in SQL). */
export async function listContracts(ctx: ServiceContext, viewer: Account, query: Record<string, unknown> = {}): Promise<ContractListResponse> {
  const q = (await check(contractListQuerySchema, query)) as ContractListQuery;
  const limit = q.limit ?? DEFAULT_CONTRACT_PAGE;
  const qb = ctx.ds.manager
    .createQueryBuilder(Contract, 'c')
    .where('(c.grower_id = :me OR c.grazier_id = :me)', { me: viewer.id })
    .orderBy('c.created_at', 'DESC')
    .addOrderBy('c.id', 'DESC')
    .limit(limit + 1);
  if (q.status) qb.andWhere('c.status = :status', { status: q.status });
  if (q.cursor) {
    const [at, id] = decodeCursor(q.cursor, (p): p is [string, string] => p.length === 2 && typeof p[0] === 'string' && typeof p[1] === 'string');
    qb.andWhere('(c.created_at < :at OR (c.created_at = :at AND c.id < :id))', { at, id });
  }
  const { raw, entities } = await qb.addSelect('c.created_at', 'cursor_at').getRawAndEntities();
  const page = entities.slice(0, limit);
  const last = page.at(-1);
  const lastRaw = last ? (raw as Array<{ c_id: string; cursor_at: string | Date }>).find((r) => r.c_id === last.id) : undefined;
  return {
    items: await contractViews(ctx.ds.manager, page, { viewer }),
    nextCursor: entities.length > limit && last && lastRaw ? encodeCursor([cursorTime(lastRaw.cursor_at), last.id]) : null,
  };
}

/** created_at as the cursor carries it: SQLite's stored text as is; PostgreSQL's timestamptz (a Date) as ISO 8601. */
function cursorTime(raw: string | Date): string {
  return raw instanceof Date ? raw.toISOString() : String(raw);
}

export async function getContract(ctx: ServiceContext, viewer: Account, id: string): Promise<ContractView> {
  const contract = await ctx.ds.manager.findOneBy(Contract, { id });
  assertCanRead(viewer, contract);
  const [view] = await contractViews(ctx.ds.manager, [contract], { viewer, detail: true });
  return view;
}

/** Where a signature came from, as the route saw the request (kept with the signature). */
export interface SigningOrigin {
  ip: string | null;
  userAgent: string | null;
}

/**
 * A party signs the version of the terms waiting for signatures: a proposed amendment if there is one,
 * else the terms in force while the contract is to sign. The typed name, the ticked acknowledgement of the
 * cautions and the hash of the text they read are required; a hash that is not the waiting version's
 * means the terms changed under them (409). One signature per party and version: checked here, and held
 * by the unique index when two arrive at once. When the second signature lands, the contract is signed,
 * or the amendment takes effect (the terms, their version and hash move on; later signatures are on it).
 */
export async function signContract(ctx: ServiceContext, caller: Account, id: string, body: unknown, origin: SigningOrigin): Promise<ContractView> {
  const input = (await check(signContractSchema, body)) as SignContractInput;
  let result: { amendmentInForce: boolean };
  try {
    result = await inTransaction(ctx.ds, async (tx) => {
      const contract = await lockContract(tx, id);
      assertParty(caller, contract);
      const party = partyOf(caller, contract)!;
      const current = await termsInForce(tx, contract, true);
      const amendment = await waitingAmendment(tx, contract.id);
      if (!amendment) {
        if (contract.status === 'cancelled') throw AppError.conflict('This contract was cancelled', 'contract_cancelled');
        if (contract.status !== 'to-sign') throw AppError.conflict('Both parties have already signed these terms', 'already_signed');
      }
      const version = amendment ? amendment.version : contract.termsVersion;
      const hash = amendment ? amendment.termsHash : current.hash;
      if (await tx.existsBy(ContractSignature, { contractId: contract.id, termsVersion: version, party })) {
        throw AppError.conflict(amendment ? 'You have already signed this amendment' : 'You have already signed this contract', 'already_signed');
      }
      if (input.termsHash !== hash) {
        throw AppError.conflict('The terms changed after you opened them: read them again, then sign', 'terms_changed');
      }
      const at = new Date(ctx.now());
      await tx.insert(ContractSignature, signatureRecord({ contractId: contract.id, termsVersion: version, party, accountId: caller.id, input, termsHash: hash, origin, at }));
      const complete = (await tx.countBy(ContractSignature, { contractId: contract.id, termsVersion: version })) === 2;
      if (complete && amendment) await putAmendmentInForce(tx, contract, amendment, at);
      if (complete && !amendment) await markSigned(tx, contract);
      const terms = amendment ? amendment.terms : current.terms;
      await queueMail(tx, signedMails(ctx.links, await peopleOf(tx, contract), { id: contract.id, terms, hash }, party, { amendment, complete }), ctx.now());
      return { amendmentInForce: complete && amendment !== null };
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw AppError.conflict('You have already signed these terms', 'already_signed');
    throw err;
  }
  ctx.outbox.kick();
  // An amendment changes the record of an agreed log: store its new version (after the commit).
  if (result.amendmentInForce) await refreshLogDocument(ctx, id);
  return getContract(ctx, caller, id);
}

async function markSigned(tx: EntityManager, contract: Contract): Promise<void> {
  const res = await tx.update(Contract, { id: contract.id, status: 'to-sign' }, { status: 'signed' });
  if (res.affected !== 1) throw AppError.conflict('This contract changed meanwhile; reload it', 'contract_changed');
}

/** Both signed the amendment: its terms become the contract's, under its version number. */
async function putAmendmentInForce(tx: EntityManager, contract: Contract, a: ContractAmendment, at: Date): Promise<void> {
  const decided = await tx.update(ContractAmendment, { id: a.id, status: 'proposed' }, { status: 'agreed', decidedAt: at });
  if (decided.affected !== 1) throw AppError.conflict('This amendment changed meanwhile; reload the contract', 'amendment_changed');
  const t = a.terms;
  const res = await tx.update(
    Contract,
    { id: contract.id, termsVersion: contract.termsVersion },
    {
      termsVersion: a.version,
      terms: t,
      termsText: a.termsText,
      termsHash: a.termsHash,
      headCount: t.headCount,
      startDate: t.startDate,
      endDate: t.endDate,
      outBy: t.outBy,
      basis: t.basis,
      rate: t.rate,
      ...(a.agreedHeadDays !== null ? { agreedHeadDays: a.agreedHeadDays } : {}),
      // Signing an amendment is signing the contract: a contract still to sign is now signed.
      ...(contract.status === 'to-sign' ? { status: 'signed' as const } : {}),
    },
  );
  if (res.affected !== 1) throw AppError.conflict('The terms changed meanwhile; reload the contract', 'contract_changed');
}

/**
 * Either party cancels before the animals arrive (to sign, or signed with no move in yet), with a reason.
 * A conditional UPDATE on the status, so a move-in logged at the same moment wins or loses cleanly.
 */
export async function cancelContract(ctx: ServiceContext, caller: Account, id: string, body: unknown): Promise<ContractView> {
  const input = (await check(cancelContractSchema, body)) as CancelContractInput;
  await inTransaction(ctx.ds, async (tx) => {
    const contract = await lockContract(tx, id);
    assertParty(caller, contract);
    assertCancellable(contract);
    const party = partyOf(caller, contract)!;
    const at = new Date(ctx.now());
    const res = await tx
      .createQueryBuilder()
      .update(Contract)
      .set({ status: 'cancelled', cancelledAt: at, cancelledBy: party, cancelReason: input.reason })
      .where('id = :id AND status IN (:...open)', { id, open: ['to-sign', 'signed'] })
      .execute();
    if (res.affected !== 1) throw AppError.conflict('This contract changed meanwhile; reload it', 'contract_changed');
    await tx.update(ContractAmendment, { contractId: id, status: 'proposed' }, { status: 'void', decidedAt: at });
    const { terms } = await termsInForce(tx, contract);
    await queueMail(tx, cancelledMails(ctx.links, await peopleOf(tx, contract), contract, terms, party, input.reason), ctx.now());
  });
  ctx.outbox.kick();
  return getContract(ctx, caller, id);
}
