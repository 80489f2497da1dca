import * as yup from 'yup';
import type { NormalisedBid } from '../grazing/bid-compare';
import type { Caution } from '../grazing/safety';
import type { HeadDaysByDay } from '../grazing/head-days';
import type { LogAlert, LogFiguresResult } from '../grazing/log-figures';
import type { SprayRecord } from '../grazing/safety';
import type { AmendableTerm } from '../contract-terms';
import type { BidTermsView } from './bid';
import type { BlockSummary, PartyView } from './block';
import { bool, day, int, line, num, paragraphs, rejectUnknown } from './fields';
import { pageCursor, pageLimit as limitOf } from './paging';
import { CHARGE_BASES, isValidQuantity, RATE_PATTERN } from '../money';
import { parseIsoInstant } from '../dates';

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
    at: yup
      .string()
      .strict()
      .typeError('Time must be a date and time like 2027-01-15T07:30:00-08:00')
      .test('instant', 'Time must be a date and time with a UTC offset, like 2027-01-15T07:30:00-08:00', (v) => v == null || parseIsoInstant(v) !== null)
      .required('Time is required'),
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

/** Voiding a log entry (its author, while the log is open): the entry stays in the record, struck out. */
export const voidLogEntrySchema = rejectUnknown(
  yup.object({
    reason: paragraphs('Reason', 1000).min(3, 'Say why the entry is wrong').required('Say why the entry is wrong'),
  }),
);
export type VoidLogEntryInput = yup.InferType<typeof voidLogEntrySchema>;

export const SIGN_OFF_ACTIONS = ['propose', 'approve', 'dispute', 'accept-counter'] as const;
export type SignOffAction = (typeof SIGN_OFF_ACTIONS)[number];

export const signOffSchema = rejectUnknown(
  yup.object({
    action: yup.string().strict().oneOf([...SIGN_OFF_ACTIONS], 'Action must be propose, approve, dispute or accept-counter').required('Action is required'),
    /** dispute: the grower's counter figure (at most 4 decimals, the precision of lib/grazing/head-days and of an invoice line). */
    headDays: num('Head-days')
      .min(0, 'Head-days must not be negative')
      .max(100_000_000, 'Head-days is too large')
      .test('decimals', 'Head-days may have at most 4 decimals', (v) => v === undefined || !(v >= 0) || isValidQuantity(v))
      .optional(),
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
    rate: yup
      .string()
      .strict()
      .matches(RATE_PATTERN, 'Rate must be a dollar amount like 0.18, with at most 6 decimals')
      .test('positive', 'Rate must be more than 0', (v) => v === undefined || !RATE_PATTERN.test(v) || /[1-9]/.test(v))
      .optional(),
    /**
     * Only once the head-days are agreed: a corrected agreed figure (a mistake found after sign-off). The
     * agreed head-days change only through an amendment both parties sign.
     */
    agreedHeadDays: num('Agreed head-days')
      .min(0, 'Agreed head-days must not be negative')
      .max(100_000_000, 'Agreed head-days is too large')
      .test('decimals', 'Agreed head-days may have at most 4 decimals', (v) => v === undefined || !(v >= 0) || isValidQuantity(v))
      .optional(),
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

/** Largest page of GET /api/contracts and GET /api/contracts/:id/log. */
export const MAX_CONTRACT_PAGE = 100;
export const DEFAULT_LOG_PAGE = 50;
export const DEFAULT_CONTRACT_PAGE = 25;

const pageLimit = (label: string) => limitOf(label, MAX_CONTRACT_PAGE);
const cursor = pageCursor;

export const contractListQuerySchema = rejectUnknown(
  yup.object({
    status: yup.string().strict().typeError('Give status once').oneOf([...CONTRACT_STATUSES], `Status must be one of: ${CONTRACT_STATUSES.join(', ')}`).optional(),
    limit: pageLimit('Limit'),
    cursor,
  }),
);
export type ContractListQuery = yup.InferType<typeof contractListQuerySchema>;

export const logPageQuerySchema = rejectUnknown(yup.object({ limit: pageLimit('Limit'), cursor }));
export type LogPageQuery = yup.InferType<typeof logPageQuerySchema>;

// ——— views ———

export type ContractParty = 'grower' | 'grazier';

export interface SignatureView {
  party: ContractParty;
  accountId: string;
  typedName: string;
  signedAt: string;
  termsHash: string;
  // Added with the signing API; optional only so values typed against the first draft still compile — the
  // server always sends them.
  /** The version of the terms this signature is on. */
  termsVersion?: number;
  /** The signer ticked that they read the cautions shown with the terms (always true: signing requires it). */
  cautionsAcknowledged?: boolean;
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
  // Added with the log API; optional only so values typed against the first draft still compile — the
  // server always sends them.
  /** The author's name as the account has it. */
  authorName?: string;
  /** Set when the author voided the entry: it stays in the record and counts for nothing. */
  voided?: { at: string; reason: string } | null;
  /** Photos attached to the entry (POST /api/contracts/:id/log/:entryId/photos). */
  photos?: LogPhotoView[];
}

export interface LogPhotoView {
  id: string;
  /** Path under the API origin with a short-lived signed `access` token, usable as an <img> src (1 h). */
  url: string;
  mimeType: 'image/jpeg' | 'image/png' | 'image/webp';
  sizeBytes: number;
  createdAt: string;
}

type FirstDraftFigures = 'headNow' | 'headDaysSoFar' | 'byDay' | 'eatenLb' | 'targetTakeLb' | 'projectedUtilizationPct' | 'daysLeftInWindow' | 'daysToOutBy' | 'warnings';

/**
 * Running figures of a log (lib/grazing/log-figures.ts computes them; the screen and the PDF show them).
 * The fields listed here were the first draft; the rest of LogFiguresResult (intake and its source,
 * standing forage, utilisation so far, the alerts with their tone …) are optional only so values typed
 * against the first draft still compile — the server always sends them.
 */
export interface LogFigures extends Partial<Omit<LogFiguresResult, FirstDraftFigures>> {
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
  /** The warnings with their key and tone (danger, caution, info). */
  alerts?: LogAlert[];
}

/** GET /api/contracts/:id/log — newest entries first, a page at a time; figures are over the whole log. */
export interface LogPage {
  items: LogEntryView[];
  figures: LogFigures;
  /** Pass as `cursor` for the next (older) page; null on the last page. */
  nextCursor: string | null;
  /** Whether the viewer may add entries now, and of which kinds. */
  canWrite: LogEntryKind[];
}

export const SIGN_OFF_STATUSES = ['proposed', 'disputed', 'agreed', 'superseded'] as const;
export type SignOffStatus = (typeof SIGN_OFF_STATUSES)[number];

/**
 * One round of sign-off: the grazier's proposal from the log, and the grower's answer. A dispute is
 * answered by the grazier accepting the counter (agreed) or proposing again (this round 'superseded').
 */
export interface SignOffView {
  // id, round, byDay, comment and agreedBy came with the sign-off API; optional only so values typed
  // against the first draft still compile — the server always sends them.
  id?: string;
  /** 1, 2, … — a new round for each proposal. */
  round?: number;
  /** 'superseded' is new: a disputed round the grazier answered by proposing again. */
  status: SignOffStatus;
  proposedHeadDays: number;
  proposedAt: string;
  /** The day-by-day breakdown of the proposed head-days, in the block's zone. */
  byDay?: HeadDaysByDay[];
  /** The grazier's note with the proposal. */
  comment?: string | null;
  counterHeadDays: number | null;
  disputeComment: string | null;
  disputedAt: string | null;
  agreedHeadDays: number | null;
  agreedAt: string | null;
  /** Who agreed the figure last: the grower approving, or the grazier accepting the counter. */
  agreedBy?: ContractParty | null;
  /** The grazier's name (who proposed) and the grower's (who approved or countered), locked with the figure. */
  grazierName: string;
  growerName: string | null;
}

export const AMENDMENT_STATUSES = ['proposed', 'agreed', 'withdrawn', 'declined', 'void'] as const;
export type AmendmentStatus = (typeof AMENDMENT_STATUSES)[number];

export interface AmendmentView {
  id: string;
  /** The terms version this amendment becomes once both sign. */
  version: number;
  status: AmendmentStatus;
  proposedBy: ContractParty;
  proposedByName: string;
  reason: string;
  /** Each changed term with its old and new value in words. */
  changes: Array<{ field: AmendableTerm | 'agreedHeadDays'; label: string; from: string; to: string }>;
  /** The amended terms' canonical text and its SHA-256: what each party signs (send termsHash with the signature). */
  termsText: string;
  termsHash: string;
  /** The agreed head-days this amendment sets, when it corrects them. */
  agreedHeadDays: number | null;
  signatures: SignatureView[];
  createdAt: string;
  decidedAt: string | null;
}

/** What the signed-in viewer is to this contract and may do next (the server's rules, for the buttons). */
export interface ContractViewerFacts {
  party: ContractParty | null;
  /** The viewer has to sign the current terms or the pending amendment. */
  mustSign: boolean;
  canCancel: boolean;
  canAmend: boolean;
  /** Sign-off actions open to the viewer now. */
  signOffActions: SignOffAction[];
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
  /** SHA-256 (hex) of the canonical terms text each party signs (lib/contract-terms canonicalTermsText). */
  termsHash?: string;
  /** The canonical terms text itself (GET /api/contracts/:id only; lists leave it out). */
  termsText?: string;
  /** Signatures on the terms in force (termsVersion). */
  signatures?: SignatureView[];
  /** The cautions shown with the terms, as signed. */
  cautions?: Caution[];
  agreedHeadDays?: number | null;
  agreedAt?: string | null;
  residualHeightIn?: number | null;
  restrictions?: { sprayRecords: SprayRecord[]; earliestSafeDate: string | null };
  /** An amendment waiting for signatures; until both sign it the terms above stand. */
  pendingAmendment?: AmendmentView | null;
  /** Every amendment, oldest first (GET /api/contracts/:id only). */
  amendments?: AmendmentView[];
  /** The latest sign-off round, or null before the grazier proposed. */
  signOff?: SignOffView | null;
  /** Every sign-off round, oldest first (GET /api/contracts/:id only). */
  signOffHistory?: SignOffView[];
  grazingStartedAt?: string | null;
  cancellation?: { by: ContractParty; byName: string; reason: string; at: string } | null;
  viewer?: ContractViewerFacts;
}

export interface ContractListResponse {
  items: ContractView[];
  /** Pass as `cursor` for the next page; null on the last page. */
  nextCursor: string | null;
}
