import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { AppError } from '../../lib/errors/app-error';
import { check } from '../../lib/http/validate';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { queueMail } from '../../lib/mail/outbox';
import type { ServiceContext } from '../../lib/service-context';
import type { Account } from '../accounts/account.entity';
import { Contract } from './contract.entity';
import { SignOff } from './contract-records.entity';
import { figuresOf, latestSignOff, lockContract, termsInForce } from './contract-state';
import { getContract } from './contracts.service';
import { peopleOf, signOffAnsweredMails, signOffRequestedMails } from './contracts.mails';
import { assertIsParty, assertParty } from './contracts.policy';
import { refreshLogDocument } from './contract-documents';
import { formatNumber } from '../../../lib/format';
import type { LogFiguresResult } from '../../../lib/grazing/log-figures';
import { signOffSchema, type ContractView, type SignOffInput } from '../../../lib/schemas/contract';

// Sign-off: the grazier ends the grazing and proposes the head-days the log gives (the server counts them,
// with the day-by-day breakdown); the grower approves, or disputes with a comment and a counter figure; the
// grazier accepts the counter, or corrects the log and proposes again (a new round). The agreed figure is
// locked on the contract with both names and times; after that the log is closed, and only an amendment
// both sign changes anything. Each answer is a conditional UPDATE on the round's status, so answering twice
// (or two answers racing) gives one change and a 409.

const GRAZIER_ONLY = 'Only the grazier proposes the head-days or accepts a counter';
const GROWER_ONLY = 'Only the grower approves or disputes the head-days';

export async function signOff(ctx: ServiceContext, caller: Account, id: string, body: unknown): Promise<ContractView> {
  const input = (await check(signOffSchema, body)) as SignOffInput;
  let agreed = false;
  try {
    agreed = await inTransaction(ctx.ds, async (tx) => {
      const contract = await lockContract(tx, id);
      assertParty(caller, contract);
      const latest = await latestSignOff(tx, contract.id);
      const at = new Date(ctx.now());
      switch (input.action) {
        case 'propose':
          assertIsParty(caller, contract, 'grazier', GRAZIER_ONLY);
          await propose(ctx, tx, contract, latest, caller, input, at);
          return false;
        case 'approve':
          assertIsParty(caller, contract, 'grower', GROWER_ONLY);
          await answer(ctx, tx, contract, latest, 'approve', caller, input, at);
          return true;
        case 'dispute':
          assertIsParty(caller, contract, 'grower', GROWER_ONLY);
          await answer(ctx, tx, contract, latest, 'dispute', caller, input, at);
          return false;
        case 'accept-counter':
          assertIsParty(caller, contract, 'grazier', GRAZIER_ONLY);
          await acceptCounter(ctx, tx, contract, latest, at);
          return true;
      }
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw AppError.conflict('The head-days were proposed meanwhile; reload the log', 'sign_off_changed');
    throw err;
  }
  ctx.outbox.kick();
  // The agreed log is a record for both sides' files: render and store it now (after the commit).
  if (agreed) await refreshLogDocument(ctx, id);
  return getContract(ctx, caller, id);
}

function statusConflict(contract: Contract): AppError {
  switch (contract.status) {
    case 'to-sign':
    case 'signed':
      return AppError.conflict('No animals have been logged in yet: there are no head-days to sign off', 'not_grazing');
    case 'sign-off':
      return AppError.conflict('The head-days are already proposed: the grower answers next', 'already_proposed');
    case 'cancelled':
      return AppError.conflict('This contract was cancelled', 'contract_cancelled');
    default:
      return AppError.conflict('The head-days are already agreed', 'already_agreed');
  }
}

/** A round of sign-off as the grazier proposes it: the head-days and the day-by-day breakdown the log gives. */
export function proposalRecord(p: { contractId: string; round: number; figures: LogFiguresResult; grazierName: string; comment: string | null; at: Date }): SignOff {
  return Object.assign(new SignOff(), {
    id: crypto.randomUUID(),
    contractId: p.contractId,
    round: p.round,
    status: 'proposed' as const,
    proposedHeadDays: p.figures.headDaysSoFar,
    byDay: p.figures.byDay,
    countedUntil: p.figures.until!,
    comment: p.comment,
    grazierName: p.grazierName,
    proposedAt: p.at,
    counterHeadDays: null,
    disputeComment: null,
    disputedAt: null,
    growerName: null,
    agreedHeadDays: null,
    agreedAt: null,
    agreedBy: null,
  });
}

/** The grower's approval of a proposed round: the figure proposed becomes the agreed one. */
export function approvalOf(round: Pick<SignOff, 'proposedHeadDays'>, growerName: string, at: Date) {
  return { status: 'agreed' as const, agreedHeadDays: round.proposedHeadDays, agreedAt: at, agreedBy: 'grower' as const, growerName };
}

async function propose(ctx: ServiceContext, tx: EntityManager, contract: Contract, latest: SignOff | null, caller: Account, input: SignOffInput, at: Date): Promise<void> {
  const again = contract.status === 'sign-off' && latest?.status === 'disputed';
  if (contract.status !== 'grazing' && !again) throw statusConflict(contract);
  if (input.headDays !== undefined) {
    throw AppError.badRequest('Some fields need attention', { headDays: 'The head-days are counted from the log: leave this out (correct the log instead)' });
  }
  const { terms } = await termsInForce(tx, contract, true);
  const figures = await figuresOf(tx, contract, terms, ctx.now());
  if (figures.headNow > 0) {
    throw AppError.conflict(`The log still has ${formatNumber(figures.headNow)} head on the block: log the move out first, then propose`, 'animals_on_block');
  }
  if (again) {
    const res = await tx.update(SignOff, { id: latest!.id, status: 'disputed' }, { status: 'superseded' });
    if (res.affected !== 1) throw AppError.conflict('The sign-off changed meanwhile; reload the log', 'sign_off_changed');
  }
  const round = tx.create(SignOff, proposalRecord({ contractId: contract.id, round: (latest?.round ?? 0) + 1, figures, grazierName: caller.name, comment: input.comment ?? null, at }));
  await tx.insert(SignOff, round);
  if (!again) {
    const res = await tx.update(Contract, { id: contract.id, status: 'grazing' }, { status: 'sign-off' });
    if (res.affected !== 1) throw AppError.conflict('This contract changed meanwhile; reload it', 'contract_changed');
  }
  await queueMail(tx, signOffRequestedMails(ctx.links, await peopleOf(tx, contract), contract.id, terms, round), ctx.now());
}

async function answer(ctx: ServiceContext, tx: EntityManager, contract: Contract, latest: SignOff | null, how: 'approve' | 'dispute', caller: Account, input: SignOffInput, at: Date): Promise<void> {
  if (how === 'dispute') {
    const fields: Record<string, string> = {};
    if (input.headDays === undefined) fields.headDays = 'Give the head-days you count';
    if (!input.comment) fields.comment = 'Say why you dispute the figure';
    if (Object.keys(fields).length > 0) throw AppError.badRequest('Some fields need attention', fields);
  }
  if (!latest || latest.status !== 'proposed') {
    if (latest?.status === 'agreed') throw AppError.conflict('The head-days are already agreed', 'already_agreed');
    if (latest?.status === 'disputed') throw AppError.conflict('You have disputed the figure: the grazier answers next', 'already_disputed');
    throw AppError.conflict('The grazier has not proposed the head-days yet', 'nothing_proposed');
  }
  const update =
    how === 'approve'
      ? approvalOf(latest, caller.name, at)
      : { status: 'disputed' as const, counterHeadDays: input.headDays!, disputeComment: input.comment!, disputedAt: at, growerName: caller.name };
  const res = await tx.update(SignOff, { id: latest.id, status: 'proposed' }, update);
  if (res.affected !== 1) throw AppError.conflict('The head-days were answered meanwhile; reload the log', 'already_answered');
  if (how === 'approve') await lockAgreed(tx, contract, latest.proposedHeadDays, at);
  const { terms } = await termsInForce(tx, contract);
  await queueMail(tx, signOffAnsweredMails(ctx.links, await peopleOf(tx, contract), contract.id, terms, { ...latest, ...update }, how === 'approve' ? 'approved' : 'disputed'), ctx.now());
}

async function acceptCounter(ctx: ServiceContext, tx: EntityManager, contract: Contract, latest: SignOff | null, at: Date): Promise<void> {
  if (!latest || latest.status !== 'disputed') {
    if (latest?.status === 'agreed') throw AppError.conflict('The head-days are already agreed', 'already_agreed');
    throw AppError.conflict('There is no counter figure to accept', 'nothing_disputed');
  }
  const update = { status: 'agreed' as const, agreedHeadDays: latest.counterHeadDays!, agreedAt: at, agreedBy: 'grazier' as const };
  const res = await tx.update(SignOff, { id: latest.id, status: 'disputed' }, update);
  if (res.affected !== 1) throw AppError.conflict('The sign-off changed meanwhile; reload the log', 'sign_off_changed');
  await lockAgreed(tx, contract, latest.counterHeadDays!, at);
  const { terms } = await termsInForce(tx, contract);
  await queueMail(tx, signOffAnsweredMails(ctx.links, await peopleOf(tx, contract), contract.id, terms, { ...latest, ...update }, 'counter-accepted'), ctx.now());
}

async function lockAgreed(tx: EntityManager, contract: Contract, headDays: number, at: Date): Promise<void> {
  const res = await tx.update(Contract, { id: contract.id, status: 'sign-off' }, { status: 'agreed', agreedHeadDays: headDays, agreedAt: at });
  if (res.affected !== 1) throw AppError.conflict('This contract changed meanwhile; reload it', 'contract_changed');
}
