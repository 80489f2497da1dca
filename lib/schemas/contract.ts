import * as yup from 'yup';
import type { NormalisedBid } from '../grazing/bid-compare';
import type { Caution } from '../grazing/safety';
import type { HeadDaysByDay } from '../grazing/head-days';
import type { BidTermsView } from './bid';
import type { BlockSummary, PartyView } from './block';
import { bool, day, int, line, num, paragraphs, rejectUnknown } from './fields';
import { CHARGE_BASES, RATE_PATTERN } from '../money';

// A contract is born when a grower awards a bid: the agreed terms are copied from the bid and the block at
// that moment, so later edits to either never change what was agreed. Both parties sign; the grazier keeps
// the grazing log; at the end both agree the head-days (sign-off), which the invoice bills.
//
// Statuses, in order:
//   to-sign    awaiting both signatures (also after an amendment cleared them)
//   signed     both signed; animals not yet in
//   grazing    the first move-in was logged
//   sign-off   the grazier proposed the head-days; waiting for the grower (approve or dispute)
//   agreed     head-days agreed and locked
//   invoiced · paid   (invoices)
//   cancelled  before animals arrived, by either party, with a reason

export const CONTRACT_STATUSES = ['to-sign', 'signed', 'grazing', 'sign-off', 'agreed', 'invoiced', 'paid', 'cancelled'] as const;
export type ContractStatus = (typeof CONTRACT_STATUSES)[number];

/** Fieldfold's words for each status (screens, mail, PDFs). */
export const CONTRACT_STATUS_LABELS: Record<ContractStatus, string> = {
  'to-sign': 'Awaiting signatures',
  signed: 'Signed — animals not in yet',
  grazing: 'Grazing',
  'sign-off': 'Awaiting sign-off',
  agreed: 'Head-days agreed',
  invoiced: 'Invoiced',
  paid: 'Paid',
  cancelled: 'Cancelled',
};

// ——— requests ———

export const signContractSchema = rejectUnknown(
  yup.object({
    typedName: line('Your full name', 120).min(2, 'Type your full name to sign').required('Type your full name to sign'),
    /** The signer ticked that they read the cautions shown with the terms. */
    cautionsAcknowledged: bool('Acknowledgement of the cautions').oneOf([true], 'Tick that you have read the cautions').required('Tick that you have read the cautions'),
    /** SHA-256 of the terms text the signer saw: refused (409) when the terms changed meanwhile. */
    termsHash: yup.string().strict().matches(/^[0-9a-f]{64}$/, 'Terms hash must be 64 hex characters').required('Terms hash is required'),
  }),
);
export type SignContractInput = yup.InferType<typeof signContractSchema>;

export const LOG_ENTRY_KINDS = ['move', 'tally', 'observation'] as const;
export type LogEntryKind = (typeof LOG_ENTRY_KINDS)[number];

/** Whole minutes of clock skew allowed between a phone and the server before `at` counts as the future. */
export const LOG_CLOCK_SKEW_MINUTES = 5;

export const logEntrySchema = rejectUnknown(
  yup.object({
    /** Made on the phone (a UUID) so a retry of the same entry is stored once. */
    clientId: yup.string().strict().matches(/^[A-Za-z0-9_-]{8,64}$/, 'Client id must be 8–64 letters, digits, - or _').required('Client id is required'),
    kind: yup.string().strict().oneOf([...LOG_ENTRY_KINDS], 'Kind must be move, tally or observation').required('Kind is required'),
    /** ISO 8601 instant with offset. */
    at: yup.string().strict().typeError('Time must be a date and time like 2027-01-15T07:30:00-08:00').required('Time is required'),
    /** move: animals in (+n) or out (−n). */
    change: int('Change').min(-20_000, 'Change must be at least −20 000').max(20_000, 'Change must be at most 20 000').test('not-zero', 'Change must not be 0', (v) => v !== 0).optional(),
    /** tally: head counted on the block. */
    count: int('Head counted').min(0, 'Head counted must not be negative').max(20_000, 'Head counted must be at most 20 000').optional(),
    paddock: line('Paddock or cell', 60).optional().nullable(),
    residualHeightIn: num('Residual height').min(0, 'Residual height must not be negative').max(60, 'Residual height must be at most 60 in').optional().nullable(),
    takenPct: num('Estimated % taken').min(0, 'Estimated % taken must be 0–100').max(100, 'Estimated % taken must be 0–100').optional().nullable(),
    trampledPct: num('Trampled residue %').min(0, 'Trampled residue % must be 0–100').max(100, 'Trampled residue % must be 0–100').optional().nullable(),
    bareGroundPct: num('Bare ground %').min(0, 'Bare ground % must be 0–100').max(100, 'Bare ground % must be 0–100').optional().nullable(),
    waterChecked: bool('Water checked').optional().nullable(),
    fenceChecked: bool('Fence checked').optional().nullable(),
    losses: int('Losses').min(0, 'Losses must not be negative').max(20_000, 'Losses must be at most 20 000').optional().nullable(),
    note: paragraphs('Note', 2000).optional().nullable(),
  }),
);
export type LogEntryInput = yup.InferType<typeof logEntrySchema>;

export const SIGN_OFF_ACTIONS = ['propose', 'approve', 'dispute', 'accept-counter'] as const;
export type SignOffAction = (typeof SIGN_OFF_ACTIONS)[number];

export const signOffSchema = rejectUnknown(
  yup.object({
    action: yup.string().strict().oneOf([...SIGN_OFF_ACTIONS], 'Action must be propose, approve, dispute or accept-counter').required('Action is required'),
    /** dispute: the grower's counter figure. */
    headDays: num('Head-days').min(0, 'Head-days must not be negative').max(100_000_000, 'Head-days is too large').optional(),
    comment: paragraphs('Comment', 2000).optional().nullable(),
  }),
);
export type SignOffInput = yup.InferType<typeof signOffSchema>;

/** Terms an amendment may change; the rest of the contract stands. */
export const amendmentSchema = rejectUnknown(
  yup.object({
    headCount: int('Head count').min(1, 'Head count must be at least 1').max(20_000, 'Head count must be at most 20 000').optional(),
    startDate: day('Start date').optional(),
    endDate: day('End date').optional(),
    outBy: day('Animals-out-by date').optional(),
    basis: yup.string().strict().oneOf([...CHARGE_BASES], 'Pricing basis must be head-day, acre or flat').optional(),
    rate: yup.string().strict().matches(RATE_PATTERN, 'Rate must be a dollar amount like 0.18, with at most 6 decimals').optional(),
    reason: paragraphs('Reason', 1000).min(3, 'Say why the terms change').required('Say why the terms change'),
  }),
);
export type AmendmentInput = yup.InferType<typeof amendmentSchema>;

export const cancelContractSchema = rejectUnknown(
  yup.object({
    reason: paragraphs('Reason', 1000).min(3, 'Say why the contract is cancelled').required('Say why the contract is cancelled'),
  }),
);
export type CancelContractInput = yup.InferType<typeof cancelContractSchema>;

// ——— views ———

export interface SignatureView {
  party: 'grower' | 'grazier';
  accountId: string;
  typedName: string;
  signedAt: string;
  termsHash: string;
}

export interface LogEntryView {
  id: string;
  clientId: string;
  kind: LogEntryKind;
  at: string;
  change: number | null;
  count: number | null;
  paddock: string | null;
  residualHeightIn: number | null;
  takenPct: number | null;
  trampledPct: number | null;
  bareGroundPct: number | null;
  waterChecked: boolean | null;
  fenceChecked: boolean | null;
  losses: number | null;
  note: string | null;
  /** Who wrote it (the grazier's moves and tallies; either party's observations). */
  author: 'grower' | 'grazier';
  /** Reasons the record flags this entry, e.g. "after the animals-out-by date". Never refused: the record shows what happened. */
  flags: string[];
  recordedAt: string;
}

/** Running figures of a log (lib/grazing/log-figures.ts computes them; the screen and the PDF show them). */
export interface LogFigures {
  headNow: number;
  headDaysSoFar: number;
  byDay: HeadDaysByDay[];
  /** Forage eaten so far (head-days × intake per head) against the grower's target take. */
  eatenLb: number;
  targetTakeLb: number;
  projectedUtilizationPct: number;
  daysLeftInWindow: number;
  daysToOutBy: number;
  warnings: string[];
}

export interface SignOffView {
  status: 'proposed' | 'disputed' | 'agreed';
  proposedHeadDays: number;
  proposedAt: string;
  counterHeadDays: number | null;
  disputeComment: string | null;
  disputedAt: string | null;
  agreedHeadDays: number | null;
  agreedAt: string | null;
  grazierName: string;
  growerName: string | null;
}

export interface ContractView extends BidTermsView {
  id: string;
  status: ContractStatus;
  blockId: string;
  bidId: string;
  block: BlockSummary;
  grower: PartyView;
  grazier: PartyView;
  outBy: string;
  /** Block figures at award time, the basis of the estimate below. */
  acres: number;
  lbDmPerAcre: number;
  targetUtilizationPct: number;
  timeZone: string;
  /** The agreed terms on a common footing (estimate; the invoice uses the signed-off head-days). */
  normalised: NormalisedBid;
  createdAt: string;
  /** Version of the terms (1, then +1 per amendment both signed). */
  termsVersion?: number;
  /** SHA-256 of the canonical terms text each party signs. */
  termsHash?: string;
  signatures?: SignatureView[];
  cautions?: Caution[];
  agreedHeadDays?: number | null;
}
