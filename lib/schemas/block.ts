import * as yup from 'yup';
import { isValidTimeZone } from '../dates';
import { isValidQuantity } from '../money';
import { forageRequestSchema } from './calc';
import { bool, bothDays, day, int, line, num, paragraphs, rejectUnknown } from './fields';
import { pageFields, queryNumber } from './paging';
import { FORAGE_METHODS, forageFigureProblem, MAX_LB_DM_PER_ACRE, measuredLbDmPerAcre, type BlockForageInput, type ForageMethod } from '../grazing/block-forage';
import { GRAZING_SPECIES, type GrazingSpecies } from '../grazing/flock-intake';
import type { Caution, SprayRecord } from '../grazing/safety';

// A block: land a grower offers for grazing. One schema for the app's form (Formik validationSchema) and
// the server (POST /api/blocks; PATCH merges into the stored block and checks the result with it too).

export const BLOCK_CROPS = ['orchard', 'vineyard', 'row-crop cover', 'fallow', 'pasture', 'other'] as const;
export type BlockCrop = (typeof BLOCK_CROPS)[number];
export const PERIMETER_FENCES = ['none', 'partial', 'full'] as const;
export type PerimeterFence = (typeof PERIMETER_FENCES)[number];
export const BLOCK_STATUSES = ['draft', 'open', 'awarded', 'closed', 'withdrawn'] as const;
export type BlockStatus = (typeof BLOCK_STATUSES)[number];
export { FORAGE_METHODS, GRAZING_SPECIES };
export type { ForageMethod, GrazingSpecies };

export const DEFAULT_TIME_ZONE = 'America/Los_Angeles';
/** What the form suggests: "take half, leave half", or about 40 % in orchard covers (TRADE.md). */
export const SUGGESTED_UTILIZATION_PCT = { min: 40, max: 50 } as const;
/** Labels restrict grazing for up to 18 months (US EPA Label Review Manual, ch. 11). */
export const MAX_RESTRICTION_DAYS = 548;
export const MAX_SPRAY_RECORDS = 50;
export const MAX_PHOTOS_PER_BLOCK = 10;
export const MAX_PHOTO_BYTES = 8 * 1024 * 1024;
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;
export const MAX_PAGE_SIZE = 50;

export const sprayRecordSchema = rejectUnknown(
  yup
    .object({
      product: line('Product', 120)
        .min(1, 'Product is required')
        .required('Product is required'),
      appliedOn: day('Date applied').required('Date applied is required'),
      grazingRestrictionDays: int('Grazing restriction')
        .min(0, 'Grazing restriction must be 0 days or more')
        .max(MAX_RESTRICTION_DAYS, `Grazing restriction must be at most ${MAX_RESTRICTION_DAYS} days (18 months, the longest labels run)`)
        .required("Grazing restriction (days, from the label) is required"),
      containsCopper: bool('Contains copper').required('Say whether the product contains copper'),
    })
    .typeError('Each spray record needs a product, date applied, grazing restriction and copper yes/no'),
);

export const forageHeightSchema = rejectUnknown(
  yup
    .object({
      heightIn: num('Stand height').moreThan(0, 'Stand height must be more than 0 in').max(120, 'Stand height must be at most 120 in').required('Stand height is required'),
      residualIn: num('Residual height').min(0, 'Residual height must be 0 in or more').max(60, 'Residual height must be at most 60 in').required('Residual height is required'),
      lbDmPerAcrePerInch: num('Pounds per inch')
        .moreThan(0, 'Pounds per inch must be more than 0')
        .max(2000, 'Pounds per inch must be at most 2 000')
        .required('Pounds of dry matter per acre per inch is required'),
    })
    .typeError('Stand height must give height, residual and pounds per inch'),
);

const LEAVE_OUT = 'Leave this out: it belongs to another forage method';

/** A forage field that must be present for its own method and absent for the others. */
function forMethod<S extends yup.AnySchema>(schema: S, method: ForageMethod, requiredMessage: string): S {
  return schema.when('forageMethod', ([current]: unknown[], s: S) =>
    current === method ? s.required(requiredMessage) : s.test('leave-out', LEAVE_OUT, (v: unknown) => v === undefined),
  ) as S;
}

/** The figure the measurement gives must be usable, checked here too so the form shows the server's answer. */
function givesForage(method: ForageMethod) {
  return function (this: yup.TestContext) {
    const parent = this.parent as BlockForageInput;
    if (parent?.forageMethod !== method) return true;
    let lb: number;
    try {
      lb = measuredLbDmPerAcre(parent);
    } catch {
      return true; // an invalid measurement is reported by its own fields' rules
    }
    const problem = forageFigureProblem(lb);
    return problem ? this.createError({ message: problem }) : true;
  };
}

export const blockInputSchema = rejectUnknown(
  yup.object({
    name: line('Name', 120).min(2, 'Name must be at least 2 characters').required('Name is required'),
    crop: yup.string().strict().oneOf([...BLOCK_CROPS], `Crop must be one of: ${BLOCK_CROPS.join(', ')}`).required('Crop is required'),
    acres: num('Acres')
      .moreThan(0, 'Acres must be more than 0')
      .max(100_000, 'Acres must be at most 100 000')
      .test('decimals', 'Acres may have at most 4 decimals', (v) => v === undefined || !(v > 0) || isValidQuantity(v))
      .required('Acres is required'),
    placeName: line('Place', 120).nullable().optional(),
    latitude: num('Latitude').min(-90, 'Latitude must be between -90 and 90').max(90, 'Latitude must be between -90 and 90').required('Latitude is required'),
    longitude: num('Longitude').min(-180, 'Longitude must be between -180 and 180').max(180, 'Longitude must be between -180 and 180').required('Longitude is required'),
    timeZone: yup
      .string()
      .strict()
      .typeError('Time zone must be text')
      .test('iana', 'Time zone must be an IANA name such as America/Los_Angeles', (v) => v === undefined || isValidTimeZone(v))
      .optional(),
    forageMethod: yup.string().strict().oneOf([...FORAGE_METHODS], 'Forage method must be direct, samples or height').required('Forage method is required'),
    lbDmPerAcre: forMethod(
      num('Forage per acre')
        .moreThan(0, 'Forage per acre must be more than 0 lb DM')
        .max(MAX_LB_DM_PER_ACRE, `Forage per acre must be at most ${MAX_LB_DM_PER_ACRE} lb DM`),
      'direct',
      'Forage per acre (lb DM) is required',
    ),
    forageSamples: forMethod(forageRequestSchema.default(undefined), 'samples', 'Add the clipped samples and frame area').test('gives-forage', 'Check the samples', givesForage('samples')),
    forageHeight: forMethod(forageHeightSchema.default(undefined), 'height', 'Give the stand height, residual and pounds per inch').test('gives-forage', 'Check the heights', givesForage('height')),
    targetUtilizationPct: num('Target utilisation')
      .min(1, 'Target utilisation must be at least 1 %')
      .max(100, 'Target utilisation must be at most 100 %')
      .required('Target utilisation is required'),
    residualHeightIn: num('Residual height').min(0, 'Residual height must be 0 in or more').max(48, 'Residual height must be at most 48 in').nullable().optional(),
    windowStart: day('Earliest in').required('Earliest in (window start) is required'),
    windowEnd: day('Latest out')
      .required('Latest out (window end) is required')
      .test('after-start', 'Latest out must be after the earliest-in date', function (v) {
        return !bothDays(v, this.parent.windowStart) || v > this.parent.windowStart;
      }),
    outBy: day('Animals out by')
      .required('Animals-out-by date is required')
      .test('after-start', 'Animals out by must be after the earliest-in date', function (v) {
        return !bothDays(v, this.parent.windowStart) || v > this.parent.windowStart;
      })
      .test('before-harvest', 'Animals out by must be before the harvest date', function (v) {
        return !bothDays(v, this.parent.harvestDate) || v < this.parent.harvestDate;
      }),
    harvestDate: day('Harvest date').nullable().optional(),
    sprayRecords: yup
      .array(sprayRecordSchema.required())
      .strict()
      .typeError('Spray records must be a list')
      .max(MAX_SPRAY_RECORDS, `At most ${MAX_SPRAY_RECORDS} spray records`)
      .optional(),
    waterOnSite: bool('Water on site').required('Say whether there is water on site'),
    perimeterFence: yup.string().strict().oneOf([...PERIMETER_FENCES], 'Perimeter fence must be none, partial or full').required('Perimeter fence is required'),
    truckAccess: bool('Truck access').required('Say whether a truck and trailer can reach the block'),
    speciesAllowed: yup
      .array(yup.string().strict().oneOf([...GRAZING_SPECIES], 'Species must be sheep or goats').required())
      .strict()
      .typeError('Species allowed must be a list')
      .min(1, 'Allow at least one species: sheep or goats')
      .max(GRAZING_SPECIES.length, 'List each species once')
      .test('unique', 'List each species once', (v) => v === undefined || new Set(v).size === v.length)
      .required('Allow at least one species: sheep or goats'),
    youngPlantings: bool('Young plantings').required('Say whether the block has young trees or vines'),
    notes: paragraphs('Notes', 2000).nullable().optional(),
  }),
);

/** What a grower sends to create a block (and, merged with the stored block, to change one). */
export interface BlockInput {
  name: string;
  crop: BlockCrop;
  acres: number;
  placeName?: string | null;
  latitude: number;
  longitude: number;
  /** IANA zone the block's days are counted in; the server uses DEFAULT_TIME_ZONE when it is left out. */
  timeZone?: string;
  forageMethod: ForageMethod;
  /** Required for 'direct'; for 'samples' and 'height' the server computes it (leave it out). */
  lbDmPerAcre?: number;
  forageSamples?: yup.InferType<typeof forageRequestSchema>;
  forageHeight?: yup.InferType<typeof forageHeightSchema>;
  targetUtilizationPct: number;
  residualHeightIn?: number | null;
  windowStart: string;
  windowEnd: string;
  outBy: string;
  harvestDate?: string | null;
  sprayRecords?: SprayRecord[];
  waterOnSite: boolean;
  perimeterFence: PerimeterFence;
  truckAccess: boolean;
  speciesAllowed: GrazingSpecies[];
  youngPlantings: boolean;
  notes?: string | null;
}

// ——— GET /api/blocks query ———

export const BLOCK_SORTS = ['distance', 'window', 'acres', 'days', 'newest'] as const;
export type BlockSort = (typeof BLOCK_SORTS)[number];
export const BLOCK_LIST_VIEWS = ['mine', 'market'] as const;

export const blockListQuerySchema = rejectUnknown(
  yup.object({
    view: yup.string().strict().typeError('Give view once').oneOf([...BLOCK_LIST_VIEWS], 'View must be mine (my blocks) or market (open blocks)').optional(),
    status: yup.string().strict().typeError('Give status once').oneOf([...BLOCK_STATUSES], `Status must be one of: ${BLOCK_STATUSES.join(', ')}`).optional(),
    from: day('From').optional(),
    to: day('To')
      .optional()
      .test('after-from', 'To must be on or after From', function (v) {
        return !bothDays(v, this.parent.from) || v >= this.parent.from;
      }),
    maxMiles: queryNumber('Maximum distance').moreThan(0, 'Maximum distance must be more than 0 miles').max(5000, 'Maximum distance must be at most 5 000 miles').optional(),
    minAcres: queryNumber('Minimum acres').min(0, 'Minimum acres must be 0 or more').optional(),
    maxAcres: queryNumber('Maximum acres')
      .min(0, 'Maximum acres must be 0 or more')
      .optional()
      .test('above-min', 'Maximum acres must be at least the minimum', function (v) {
        const min = this.parent.minAcres;
        return v === undefined || typeof min !== 'number' || Number.isNaN(min) || v >= min;
      }),
    minDays: queryNumber('Minimum days').min(0, 'Minimum days must be 0 or more').max(3650, 'Minimum days must be at most 3 650').optional(),
    species: yup.string().strict().typeError('Give one species: sheep or goats').oneOf([...GRAZING_SPECIES], 'Species must be sheep or goats').optional(),
    sort: yup.string().strict().typeError('Give sort once').oneOf([...BLOCK_SORTS], `Sort must be one of: ${BLOCK_SORTS.join(', ')}`).optional(),
    ...pageFields(MAX_PAGE_SIZE),
  }),
);

export type BlockListQuery = yup.InferType<typeof blockListQuerySchema>;

// ——— what the API returns ———

export interface PartyView {
  id: string;
  name: string;
  businessName: string | null;
}

export interface BlockPhotoView {
  id: string;
  /** Path under the API origin with a short-lived signed `access` token, usable as an <img> src (1 h). */
  url: string;
  mimeType: (typeof PHOTO_TYPES)[number];
  sizeBytes: number;
  createdAt: string;
}

/** What the viewer's own flock gets from this block (graziers with a flock in their profile). */
export interface FlockFit {
  headCount: number;
  bodyWeightLb: number;
  intakePctBodyWeight: number;
  /** What the intake figure stands for ("dry ewe", "goat") and its source. */
  intakeBasis: string;
  intakeSource: string;
}

export interface BlockView {
  id: string;
  status: BlockStatus;
  owner: PartyView;
  name: string;
  crop: BlockCrop;
  acres: number;
  placeName: string | null;
  latitude: number;
  longitude: number;
  timeZone: string;
  forageMethod: ForageMethod;
  /** Stored figure: the direct entry, or what lib/grazing computed from the samples or heights. */
  lbDmPerAcre: number;
  forageSamples: BlockInput['forageSamples'] | null;
  forageHeight: BlockInput['forageHeight'] | null;
  targetUtilizationPct: number;
  residualHeightIn: number | null;
  windowStart: string;
  windowEnd: string;
  outBy: string;
  harvestDate: string | null;
  sprayRecords: SprayRecord[];
  waterOnSite: boolean;
  perimeterFence: PerimeterFence;
  truckAccess: boolean;
  speciesAllowed: GrazingSpecies[];
  youngPlantings: boolean;
  notes: string | null;
  /** Latest end of the spray records' grazing restrictions, or null with no records. */
  earliestSafeDate: string | null;
  /** First day animals may come in: the later of earliest-in and the earliest safe date. */
  grazeFrom: string;
  /** Last day animals may be on: the earlier of latest-out and animals-out-by. */
  grazeUntil: string;
  /** Great-circle miles from the viewer's home base; null without one. */
  distanceMiles: number | null;
  /** Head-days of feed for the viewer's flock at the block's target utilisation; null without a flock. */
  capacity: number | null;
  /** capacity ÷ the flock's head count (fractional; plan on the whole days below it). */
  daysForMyFlock: number | null;
  flockFit: FlockFit | null;
  cautions: Caution[];
  photos: BlockPhotoView[];
  /** Live bids, for the owner only (null for others). */
  liveBidCount: number | null;
  viewer: { isOwner: boolean; canBid: boolean; myLiveBidId: string | null };
  publishedAt: string | null;
  awardedAt: string | null;
  createdAt: string;
  updatedAt: string;
}

/** A caution as a list's card flags it (its title and how serious); the block page carries the full text. */
export type CautionFlagView = Omit<Caution, 'text'>;

/**
 * One block in a list (Find grazing, the grower's own blocks): every figure a card shows or the list sorts by, the
 * cautions as flags; the grower's notes, the spray records, the forage measurements and the cautions' full text are
 * on the block page (`GET /api/blocks/:id`). The cautions' text alone was over half of a market page's JSON.
 */
export type BlockCardView = Omit<BlockView, 'cautions' | 'sprayRecords' | 'notes' | 'forageSamples' | 'forageHeight'> & { cautions: CautionFlagView[] };

export interface BlockListResponse {
  items: BlockCardView[];
  /** How many blocks the list holds; when `totalCapped`, more than this (the server counts exactly up to 1 000 or the page's end). */
  total: number;
  totalCapped: boolean;
  page: number;
  pageSize: number;
}

/** A few facts about a block, carried beside a bid or contract. */
export interface BlockSummary {
  id: string;
  name: string;
  status: BlockStatus;
  crop: BlockCrop;
  acres: number;
  placeName: string | null;
  timeZone: string;
}
