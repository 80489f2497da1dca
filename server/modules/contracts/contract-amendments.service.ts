import crypto from 'node:crypto';
import { AppError, type FieldErrors } from '../../lib/errors/app-error';
import { check } from '../../lib/http/validate';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { queueMail } from '../../lib/mail/outbox';
import type { ServiceContext } from '../../lib/service-context';
import type { Account } from '../accounts/account.entity';
import { ContractAmendment, LogEntry } from './contract-records.entity';
import { lockContract, sha256Hex, termsInForce, waitingAmendment } from './contract-state';
import { getContract } from './contracts.service';
import { amendmentClosedMails, amendmentProposedMails, peopleOf } from './contracts.mails';
import { assertAmendable, assertParty, partyOf } from './contracts.policy';
import { AMENDABLE_TERMS, amendTerms, canonicalTermsText, changedTerms, type ContractTerms, type TermChanges } from '../../../lib/contract-terms';
import { startOfLocalDay } from '../../../lib/dates';
import { formatDay, formatNumber } from '../../../lib/format';
import { parseRate, rateToString } from '../../../lib/money';
import { amendmentSchema, type AmendmentInput, type AmendmentView, type ContractView } from '../../../lib/schemas/contract';
import { IsNull, LessThan } from 'typeorm';

// Amendments: either party proposes changed terms (head, dates, out-by, basis and rate — or, once agreed, a
// corrected head-days figure) with a reason. The proposal is a new version of the terms with its own
// canonical text and hash; both parties sign it through POST /api/contracts/:id/sign, and only then does
// it replace the terms in force (contracts.service.ts putAmendmentInForce). One amendment waits at a time.

/** The changed terms must still make a safe, consistent stay; each problem names its field. */
function amendedTermsProblems(next: ContractTerms): FieldErrors {
  const fields: FieldErrors = {};
  if (next.endDate <= next.startDate) fields.endDate = 'Animals out must be after animals in';
  else if (next.endDate > next.outBy) fields.endDate = `Animals out must be on or before the animals-out-by date, ${formatDay(next.outBy)}`;
  const safe = next.restrictions.earliestSafeDate;
  if (safe && next.startDate < safe) fields.startDate = `Animals in must not be before ${formatDay(safe)}, the earliest safe day by the spray labels`;
  if (next.block.harvestDate && next.outBy >= next.block.harvestDate) fields.outBy = `Animals out by must be before the harvest on ${formatDay(next.block.harvestDate)}`;
  if (next.outBy <= next.startDate && !fields.outBy) fields.outBy = 'Animals out by must be after animals in';
  return fields;
}

export async function proposeAmendment(ctx: ServiceContext, caller: Account, id: string, body: unknown): Promise<{ contract: ContractView; amendment: AmendmentView }> {
  const input = (await check(amendmentSchema, body)) as AmendmentInput;
  let amendmentId: string;
  try {
    amendmentId = await inTransaction(ctx.ds, async (tx) => {
      const contract = await lockContract(tx, id);
      assertParty(caller, contract);
      assertAmendable(contract);
      const party = partyOf(caller, contract)!;
      if (await waitingAmendment(tx, contract.id)) {
        throw AppError.conflict('An amendment is already waiting for signatures: sign, withdraw or decline it first', 'amendment_waiting');
      }
      const { terms } = await termsInForce(tx, contract, true);

      const changes: TermChanges = {};
      for (const f of AMENDABLE_TERMS) if (input[f] !== undefined) Object.assign(changes, { [f]: f === 'rate' ? rateToString(parseRate(input.rate!)) : input[f] });
      if (changes.basis !== undefined && changes.basis !== terms.basis && changes.rate === undefined) {
        throw AppError.badRequest('Some fields need attention', { rate: 'Give the rate for the new pricing basis' });
      }
      const lines = changedTerms(terms, changes);
      const headDaysChange = input.agreedHeadDays !== undefined && input.agreedHeadDays !== contract.agreedHeadDays;
      if (input.agreedHeadDays !== undefined && contract.agreedHeadDays === null) {
        throw AppError.badRequest('Some fields need attention', { agreedHeadDays: 'The agreed head-days can be amended only once both sides agreed them at sign-off' });
      }
      if (lines.length === 0 && !headDaysChange) {
        throw AppError.badRequest('Change at least one term: the head, the dates, the out-by date, the basis or the rate', { headCount: 'Nothing differs from the terms in force' });
      }
      const kept = Object.fromEntries(lines.map((l) => [l.field, changes[l.field]])) as TermChanges;

      // A version number is never reused, so signatures on a withdrawn proposal stay with it.
      const last = await tx.findOne(ContractAmendment, { where: { contractId: contract.id }, order: { version: 'DESC' } });
      const version = Math.max(contract.termsVersion, last?.version ?? 0) + 1;
      const next = { ...amendTerms(terms, kept), version };
      const problems = amendedTermsProblems(next);
      if (kept.startDate !== undefined && !problems.startDate) {
        const early = await tx.findOne(LogEntry, { where: { contractId: contract.id, voidedAt: IsNull(), atMs: LessThan(startOfLocalDay(next.startDate, next.block.timeZone)) }, order: { atMs: 'ASC' } });
        if (early) problems.startDate = `The log has entries before ${formatDay(next.startDate)} (the first on ${early.at.slice(0, 10)}): animals in cannot move after them`;
      }
      if (Object.keys(problems).length > 0) throw AppError.badRequest('Some fields need attention', problems);

      const termsText = canonicalTermsText(next);
      const changeLines: AmendmentView['changes'] = [...lines];
      if (headDaysChange) {
        changeLines.push({ field: 'agreedHeadDays', label: 'Agreed head-days', from: formatNumber(contract.agreedHeadDays ?? 0, 4), to: formatNumber(input.agreedHeadDays!, 4) });
      }
      const amendment = tx.create(ContractAmendment, {
        id: crypto.randomUUID(),
        contractId: contract.id,
        version,
        status: 'proposed',
        proposedBy: party,
        proposedById: caller.id,
        reason: input.reason,
        changes: kept,
        changeLines,
        agreedHeadDays: headDaysChange ? input.agreedHeadDays! : null,
        terms: next,
        termsText,
        termsHash: sha256Hex(termsText),
        createdAt: new Date(ctx.now()),
        decidedAt: null,
      });
      await tx.insert(ContractAmendment, amendment);
      await queueMail(tx, amendmentProposedMails(ctx.links, await peopleOf(tx, contract), contract.id, terms, amendment), ctx.now());
      return amendment.id;
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw AppError.conflict('An amendment is already waiting for signatures', 'amendment_waiting');
    throw err;
  }
  ctx.outbox.kick();
  const contract = await getContract(ctx, caller, id);
  return { contract, amendment: contract.amendments!.find((a) => a.id === amendmentId)! };
}

/** The proposer withdraws a waiting amendment, or the other party declines it; the signed terms stand. */
export async function closeAmendment(ctx: ServiceContext, caller: Account, id: string, amendmentId: string, how: 'withdraw' | 'decline'): Promise<ContractView> {
  await inTransaction(ctx.ds, async (tx) => {
    const contract = await lockContract(tx, id);
    assertParty(caller, contract);
    const party = partyOf(caller, contract)!;
    const a = await tx.findOneBy(ContractAmendment, { id: amendmentId, contractId: id });
    if (!a) throw AppError.notFound('Amendment');
    if (how === 'withdraw' && a.proposedBy !== party) throw AppError.forbidden('Only the party who proposed an amendment may withdraw it; you may decline it');
    if (how === 'decline' && a.proposedBy === party) throw AppError.forbidden('You proposed this amendment: withdraw it instead');
    const status = how === 'withdraw' ? 'withdrawn' : 'declined';
    const res = await tx.update(ContractAmendment, { id: a.id, status: 'proposed' }, { status, decidedAt: new Date(ctx.now()) });
    if (res.affected !== 1) throw AppError.conflict(`This amendment is ${a.status} already`, 'amendment_decided');
    const { terms } = await termsInForce(tx, contract);
    await queueMail(tx, amendmentClosedMails(ctx.links, await peopleOf(tx, contract), id, terms, { ...a, status }, party), ctx.now());
  });
  ctx.outbox.kick();
  return getContract(ctx, caller, id);
}
