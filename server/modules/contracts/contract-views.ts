import { In, type EntityManager } from 'typeorm';
import { readTogether } from '../../lib/db/reads';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { blockSummary, partyOf as partyView } from '../blocks/block-views';
import type { Contract } from './contract.entity';
import { ContractAmendment, ContractSignature, SignOff } from './contract-records.entity';
import { termsInForce } from './contract-state';
import { canAmend, CANCELLABLE, partyOf } from './contracts.policy';
import { normaliseBid } from '../../../lib/grazing/bid-compare';
import type { AmendmentView, ContractParty, ContractView, ContractViewerFacts, SignatureView, SignOffAction, SignOffView } from '../../../lib/schemas/contract';
import { pickTerms } from '../../../lib/terms';

// Contracts as the API returns them. Everything a page of contracts needs is read in a fixed number of
// queries (IN lists over the page's ids), never one query per contract.

export function signatureView(s: ContractSignature): SignatureView {
  return {
    party: s.party,
    accountId: s.accountId,
    typedName: s.typedName,
    signedAt: s.signedAt.toISOString(),
    termsHash: s.termsHash,
    termsVersion: s.termsVersion,
    cautionsAcknowledged: s.cautionsAcknowledged,
  };
}

export function signOffView(s: SignOff): SignOffView {
  return {
    id: s.id,
    round: s.round,
    status: s.status,
    proposedHeadDays: s.proposedHeadDays,
    proposedAt: s.proposedAt.toISOString(),
    byDay: s.byDay,
    comment: s.comment,
    counterHeadDays: s.counterHeadDays,
    disputeComment: s.disputeComment,
    disputedAt: s.disputedAt?.toISOString() ?? null,
    agreedHeadDays: s.agreedHeadDays,
    agreedAt: s.agreedAt?.toISOString() ?? null,
    agreedBy: s.agreedBy,
    grazierName: s.grazierName,
    growerName: s.growerName,
  };
}

export function amendmentView(a: ContractAmendment, signatures: ContractSignature[], proposerName: string): AmendmentView {
  return {
    id: a.id,
    version: a.version,
    status: a.status,
    proposedBy: a.proposedBy,
    proposedByName: proposerName,
    reason: a.reason,
    changes: a.changeLines,
    termsText: a.termsText,
    termsHash: a.termsHash,
    agreedHeadDays: a.agreedHeadDays,
    signatures: signatures.filter((s) => s.termsVersion === a.version).map(signatureView),
    createdAt: a.createdAt.toISOString(),
    decidedAt: a.decidedAt?.toISOString() ?? null,
  };
}

function signOffActions(party: ContractParty | null, c: Contract, latest: SignOff | null): SignOffAction[] {
  if (party === 'grazier') {
    if (c.status === 'grazing' || (c.status === 'sign-off' && latest?.status === 'disputed')) return latest?.status === 'disputed' ? ['propose', 'accept-counter'] : ['propose'];
    return [];
  }
  if (party === 'grower' && c.status === 'sign-off' && latest?.status === 'proposed') return ['approve', 'dispute'];
  return [];
}

function viewerFacts(viewer: Account | undefined, c: Contract, pending: ContractAmendment | null, sigs: ContractSignature[], latest: SignOff | null): ContractViewerFacts {
  const party = viewer ? partyOf(viewer, c) : null;
  const signingVersion = pending ? pending.version : c.status === 'to-sign' ? c.termsVersion : null;
  const mustSign = party !== null && signingVersion !== null && !sigs.some((s) => s.termsVersion === signingVersion && s.party === party);
  return {
    party,
    mustSign,
    canCancel: party !== null && CANCELLABLE.includes(c.status),
    canAmend: party !== null && canAmend(c) && !pending,
    signOffActions: signOffActions(party, c, latest),
  };
}

export interface ContractViewOptions {
  /** The signed-in viewer (for `viewer`); omitted by callers that answer for no one in particular. */
  viewer?: Account;
  /** The detail view: the terms text, every amendment and every sign-off round. */
  detail?: boolean;
}

export async function contractViews(em: EntityManager, contracts: Contract[], opts: ContractViewOptions = {}): Promise<ContractView[]> {
  if (contracts.length === 0) return [];
  const ids = contracts.map((c) => c.id);
  const [blocks, signatures, amendments, signOffs] = await readTogether(em, [
    () => em.findBy(Block, { id: In([...new Set(contracts.map((c) => c.blockId))]) }),
    () => em.find(ContractSignature, { where: { contractId: In(ids) }, order: { signedAt: 'ASC' } }),
    () => em.find(ContractAmendment, { where: opts.detail ? { contractId: In(ids) } : { contractId: In(ids), status: 'proposed' }, order: { version: 'ASC' } }),
    () => em.find(SignOff, { where: { contractId: In(ids) }, order: { round: 'ASC' } }),
  ]);
  const people = await em.findBy(Account, {
    id: In([...new Set([...contracts.flatMap((c) => [c.growerId, c.grazierId]), ...amendments.map((a) => a.proposedById)])]),
  });
  const blockById = new Map(blocks.map((b) => [b.id, b]));
  const personById = new Map(people.map((p) => [p.id, p]));
  const party = (id: string) => {
    const p = personById.get(id);
    return p ? partyView(p) : { id, name: 'Unknown', businessName: null };
  };
  const byContract = <T extends { contractId: string }>(rows: T[]) => {
    const m = new Map<string, T[]>();
    for (const r of rows) m.set(r.contractId, [...(m.get(r.contractId) ?? []), r]);
    return m;
  };
  const sigsBy = byContract(signatures);
  const amendmentsBy = byContract(amendments);
  const signOffsBy = byContract(signOffs);

  const out: ContractView[] = [];
  for (const c of contracts) {
    const { terms, text, hash } = await termsInForce(em, c);
    const sigs = sigsBy.get(c.id) ?? [];
    const mine = amendmentsBy.get(c.id) ?? [];
    const pending = mine.find((a) => a.status === 'proposed') ?? null;
    const rounds = signOffsBy.get(c.id) ?? [];
    const latest = rounds.at(-1) ?? null;
    const amendment = (a: ContractAmendment) => amendmentView(a, sigs, personById.get(a.proposedById)?.name ?? 'Unknown');
    const block = blockById.get(c.blockId)!;
    out.push({
      id: c.id,
      status: c.status,
      blockId: c.blockId,
      bidId: c.bidId,
      block: blockSummary(block),
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
      termsVersion: c.termsVersion,
      termsHash: hash,
      ...(opts.detail ? { termsText: text } : {}),
      signatures: sigs.filter((s) => s.termsVersion === c.termsVersion).map(signatureView),
      cautions: terms.cautions,
      agreedHeadDays: c.agreedHeadDays,
      agreedAt: c.agreedAt?.toISOString() ?? null,
      residualHeightIn: terms.block.residualHeightIn,
      restrictions: terms.restrictions,
      pendingAmendment: pending ? amendment(pending) : null,
      ...(opts.detail ? { amendments: mine.map(amendment), signOffHistory: rounds.map(signOffView) } : {}),
      signOff: latest ? signOffView(latest) : null,
      grazingStartedAt: c.grazingStartedAt?.toISOString() ?? null,
      cancellation:
        c.status === 'cancelled' && c.cancelledBy && c.cancelledAt
          ? { by: c.cancelledBy, byName: party(c.cancelledBy === 'grower' ? c.growerId : c.grazierId).name, reason: c.cancelReason ?? '', at: c.cancelledAt.toISOString() }
          : null,
      viewer: viewerFacts(opts.viewer, c, pending, sigs, latest),
    });
  }
  return out;
}
