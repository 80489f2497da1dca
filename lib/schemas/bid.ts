import * as yup from 'yup';
import { CHARGE_BASES, parseRate, RATE_PATTERN, type ChargeBasis } from '../money';
import { FLOCK_CLASSES } from './account';
import { bothDays, day, int, num, paragraphs, rejectUnknown } from './fields';
import { pageFields } from './paging';
import { FLOCK_SPECIES, type FlockSpecies } from '../grazing/flock-intake';
import type { NormalisedBid } from '../grazing/bid-compare';
import type { StayConflict } from '../grazing/graze-window';
import type { BlockSummary, CautionFlagView, PartyView } from './block';

// A grazier's bid on an open block. The schema checks the bid on its own (types, ranges, end after start);
// the server then checks it against the block — inside the window, not before the earliest safe date,
// out by the out-by date, a species the grower allows — and answers 400 naming startDate/endDate/species.

export const BID_STATUSES = ['live', 'accepted', 'declined', 'withdrawn'] as const;
export type BidStatus = (typeof BID_STATUSES)[number];
export const BID_SERVICES = ['fencing', 'water hauling', 'herding', 'guardian dogs'] as const;
export type BidService = (typeof BID_SERVICES)[number];
export { CHARGE_BASES, FLOCK_CLASSES, FLOCK_SPECIES };
export type FlockClass = (typeof FLOCK_CLASSES)[number];

/** Far above any grazing price, low enough that no total can leave the range of exact integer cents. */
export const MAX_RATE_DOLLARS = 1_000_000;

export const bidInputSchema = rejectUnknown(
  yup.object({
    basis: yup.string().strict().oneOf([...CHARGE_BASES], 'Pricing basis must be head-day, acre or flat').required('Pricing basis is required'),
    rate: yup
      .string()
      .strict()
      .typeError('Rate must be text like "0.18" (dollars)')
      .matches(RATE_PATTERN, 'Rate must be a dollar amount like 0.18, with at most 6 decimals')
      .test('positive', 'Rate must be more than 0', (v) => v === undefined || !RATE_PATTERN.test(v) || /[1-9]/.test(v))
      .test('at-most', 'Rate must be at most $1,000,000', (v) => v === undefined || !RATE_PATTERN.test(v) || parseRate(v) <= BigInt(MAX_RATE_DOLLARS) * 1_000_000n)
      .required('Rate is required'),
    headCount: int('Head count').min(1, 'Head count must be at least 1').max(20_000, 'Head count must be at most 20 000').required('Head count is required'),
    species: yup.string().strict().oneOf([...FLOCK_SPECIES], 'Species must be sheep, goats or mixed').required('Species is required'),
    animalClass: yup.string().strict().oneOf([...FLOCK_CLASSES], `Class must be one of: ${FLOCK_CLASSES.join(', ')}`).required('Class is required'),
    bodyWeightLb: num('Body weight')
      .min(10, 'Typical body weight must be at least 10 lb')
      .max(400, 'Typical body weight must be at most 400 lb')
      .required('Typical body weight is required'),
    startDate: day('Start date').required('Start date is required'),
    endDate: day('End date')
      .required('End date is required')
      .test('after-start', 'End date must be after the start date', function (v) {
        return !bothDays(v, this.parent.startDate) || v > this.parent.startDate;
      }),
    services: yup
      .array(yup.string().strict().oneOf([...BID_SERVICES], `Service must be one of: ${BID_SERVICES.join(', ')}`).required())
      .strict()
      .typeError('Services must be a list')
      .max(BID_SERVICES.length, 'List each service once')
      .test('unique', 'List each service once', (v) => v === undefined || new Set(v).size === v.length)
      .optional(),
    note: paragraphs('Note', 1000).nullable().optional(),
  }),
);

export interface BidInput {
  basis: ChargeBasis;
  /** Dollars per head-day, per acre, or the flat fee, as a decimal string ("0.18", "22.50", "4200"). */
  rate: string;
  headCount: number;
  species: FlockSpecies;
  animalClass: FlockClass;
  bodyWeightLb: number;
  startDate: string;
  endDate: string;
  services?: BidService[];
  note?: string | null;
}

/** A rule of the block that a bid breaks, at the bid field to fix ("startDate"). */
export type BidConflict = StayConflict;

/** The terms of a bid as the API returns them; a contract carries the same terms, copied at award. */
export interface BidTermsView {
  basis: ChargeBasis;
  /** Canonical decimal text ("0.18", "22.50"). */
  rate: string;
  headCount: number;
  species: FlockSpecies;
  animalClass: FlockClass;
  bodyWeightLb: number;
  startDate: string;
  endDate: string;
  services: BidService[];
}

export interface BidView extends BidTermsView {
  id: string;
  blockId: string;
  status: BidStatus;
  grazier: PartyView & {
    /** Contracts this grazier has completed on Fieldfold (their record). */
    completedContracts: number;
  };
  note: string | null;
  /** The bid on a common footing (lib/grazing/bid-compare normaliseBid with the block's current figures). */
  normalised: NormalisedBid;
  /**
   * For a live bid: rules of the block as it stands now that this bid breaks (after the grower edited the
   * block, e.g. a new spray record). Such a bid cannot be awarded until the grazier changes it.
   */
  conflicts: BidConflict[];
  /**
   * The cautions for this bid's species on this block, as flags (key, tone, title): the same for every bid of that
   * species, so their full text comes once, with the block (`GET /api/blocks/:id`), not with each of forty bids.
   */
  cautions: CautionFlagView[];
  block: BlockSummary;
  createdAt: string;
  updatedAt: string;
  decidedAt: string | null;
}

// ——— GET /api/blocks/:id/bids and GET /api/bids query ———

/** A block rarely draws more than a few dozen bids; a page holds them all, and the cap bounds the work. */
export const DEFAULT_BID_PAGE_SIZE = 50;
export const MAX_BID_PAGE_SIZE = 100;

export const bidListQuerySchema = rejectUnknown(
  yup.object({
    status: yup.string().strict().typeError('Give status once').oneOf([...BID_STATUSES], `Status must be one of: ${BID_STATUSES.join(', ')}`).optional(),
    ...pageFields(MAX_BID_PAGE_SIZE),
  }),
);

export type BidListQuery = yup.InferType<typeof bidListQuerySchema>;
