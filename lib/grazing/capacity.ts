import { GrazingInputError } from './errors';

// Carrying capacity of a block for a stay, all in pounds of oven-dry matter (DM):
//   standing  = acres × lb DM/ac
//   allowable = standing × utilisation
//   intake    = body weight × intake % of body weight, per head per day
//   head-days = allowable ÷ intake
//   AUD       = head-days × intake ÷ 26 (= allowable ÷ 26), AUM = AUD ÷ 30.
// Values are returned at full floating-point precision; screens and routes round for display.

export const AU_CONVENTION = Object.freeze({
  name: 'SRM 1998 / NRCS: 26 lb DM per AU-day, 30-day AUM',
  lbDmPerAuDay: 26,
  daysPerAum: 30,
  source:
    'Society for Range Management, Glossary of Terms Used in Range Management, 4th ed., 1998 (1 000 lb cow, ~26 lb oven-dry forage/day); ' +
    'AUM = 26 × 30 = 780 lb DM as tabled by eXtension "Animal units" (2015), citing the NRCS National Range and Pasture Handbook. ' +
    'Other conventions (750–915 lb per AUM) exist.',
});

export interface AnimalIntake {
  bodyWeightLb: number;
  /** Daily dry-matter intake as % of body weight. */
  intakePctBodyWeight: number;
}

export interface CapacityInput {
  acres: number;
  lbDmPerAcre: number;
  /** Share of standing forage the animals may take, in % (e.g. 50 for "take half, leave half"). */
  utilizationPct: number;
  animal: AnimalIntake;
}

export interface CapacityResult {
  standingLb: number;
  allowableLb: number;
  dailyIntakeLbPerHead: number;
  headDays: number;
  animalUnitDays: number;
  aum: number;
}

function requireFinite(value: number, field: string, label: string, opts: { min: number; inclusive: boolean; max?: number }): void {
  const ok =
    typeof value === 'number' &&
    Number.isFinite(value) &&
    (opts.inclusive ? value >= opts.min : value > opts.min) &&
    (opts.max === undefined || value <= opts.max);
  if (!ok) {
    const lower = opts.inclusive ? `at least ${opts.min}` : `more than ${opts.min}`;
    const upper = opts.max === undefined ? '' : ` and at most ${opts.max}`;
    throw new GrazingInputError(field, `${label} must be ${lower}${upper}`);
  }
}

/** lb DM one head eats per day. */
export function dailyIntakeLb(animal: AnimalIntake, fieldPrefix = 'animal'): number {
  requireFinite(animal?.bodyWeightLb, `${fieldPrefix}.bodyWeightLb`, 'Body weight', { min: 0, inclusive: false });
  requireFinite(animal?.intakePctBodyWeight, `${fieldPrefix}.intakePctBodyWeight`, 'Intake', { min: 0, inclusive: false });
  return (animal.bodyWeightLb * animal.intakePctBodyWeight) / 100;
}

export interface AllowableInput {
  acres: number;
  lbDmPerAcre: number;
  utilizationPct: number;
}

/**
 * lb DM the animals may take from a block: acres × lb DM/ac × utilisation. It depends on the block alone, so
 * the server stores it with the block and the market filters and sorts "days for my flock" on it in SQL.
 */
export function allowableForage(input: AllowableInput): { standingLb: number; allowableLb: number } {
  requireFinite(input.acres, 'acres', 'Acres', { min: 0, inclusive: false });
  requireFinite(input.lbDmPerAcre, 'lbDmPerAcre', 'Forage (lb DM per acre)', { min: 0, inclusive: true });
  requireFinite(input.utilizationPct, 'utilizationPct', 'Utilisation', { min: 0, inclusive: false, max: 100 });
  const standingLb = input.acres * input.lbDmPerAcre;
  return { standingLb, allowableLb: (standingLb * input.utilizationPct) / 100 };
}

export function capacity(input: CapacityInput): CapacityResult {
  const { standingLb, allowableLb } = allowableForage(input);
  const dailyIntakeLbPerHead = dailyIntakeLb(input.animal);
  const headDays = allowableLb / dailyIntakeLbPerHead;
  const animalUnitDays = (headDays * dailyIntakeLbPerHead) / AU_CONVENTION.lbDmPerAuDay;
  return {
    standingLb,
    allowableLb,
    dailyIntakeLbPerHead,
    headDays,
    animalUnitDays,
    aum: animalUnitDays / AU_CONVENTION.daysPerAum,
  };
}

// Float noise (e.g. 2 999.999 999 999 999 5 for an exact 3 000) must not cost a whole head or day, so a
// quotient within this relative distance of a whole number counts as that whole number.
const WHOLE_TOLERANCE = 1e-9;

function floorTolerant(q: number): number {
  const r = Math.round(q);
  if (Math.abs(q - r) <= WHOLE_TOLERANCE * Math.max(1, Math.abs(q))) return r;
  return Math.floor(q);
}

/**
 * How long a flock of `headCount` can stay on `headDays` of feed, in days (fractional: a stay may end
 * mid-day). Screens that plan in whole days should use `Math.floor` of this — never round up.
 */
export function daysForHead(headDays: number, headCount: number): number {
  requireFinite(headDays, 'headDays', 'Head-days', { min: 0, inclusive: true });
  requireFinite(headCount, 'headCount', 'Head count', { min: 0, inclusive: false });
  return headDays / headCount;
}

/** Whole head the feed carries for `days` days, rounded down: never promise more head than the feed. */
export function headForDays(headDays: number, days: number): number {
  requireFinite(headDays, 'headDays', 'Head-days', { min: 0, inclusive: true });
  requireFinite(days, 'days', 'Days', { min: 0, inclusive: false });
  return floorTolerant(headDays / days);
}

export interface UtilizationPlanInput {
  acres: number;
  lbDmPerAcre: number;
  headCount: number;
  days: number;
  animal: AnimalIntake;
}

/**
 * Predicted utilisation (% of standing forage eaten) of a proposed stay, to compare with the block's
 * target and warn of overgrazing. Over 100 means the stay needs more feed than is standing. With no
 * standing forage any demand gives `Infinity` (and no demand gives 0) — callers compare, they don't serialise it.
 */
export function utilizationForPlan(input: UtilizationPlanInput): number {
  requireFinite(input.acres, 'acres', 'Acres', { min: 0, inclusive: false });
  requireFinite(input.lbDmPerAcre, 'lbDmPerAcre', 'Forage (lb DM per acre)', { min: 0, inclusive: true });
  requireFinite(input.headCount, 'headCount', 'Head count', { min: 0, inclusive: true });
  requireFinite(input.days, 'days', 'Days', { min: 0, inclusive: true });
  const demandLb = input.headCount * input.days * dailyIntakeLb(input.animal);
  const standingLb = input.acres * input.lbDmPerAcre;
  if (standingLb === 0) return demandLb === 0 ? 0 : Number.POSITIVE_INFINITY;
  return (demandLb / standingLb) * 100;
}

export interface IntakeRange {
  /** Editable default, % of body weight per day. */
  pct: number;
  min: number;
  max: number;
  source: string;
}

export interface AnimalClass {
  id: string;
  label: string;
  species: 'sheep' | 'goat' | 'cattle';
  /** Typical body weight to pre-fill; always editable, since flocks differ widely. */
  bodyWeightLb: number;
  bodyWeightSource: string;
  intake: IntakeRange;
  /** Animal-unit equivalent (1.0 = a 1 000 lb cow); null where no tabled value is on record. */
  auEquivalent: number | null;
  auSource: string;
}

const ATTRA = 'NCAT ATTRA, "Grazier\'s Math: Matching Forage to Animal Demand"';
const NRPH_AU = 'NRCS National Range and Pasture Handbook, animal-unit equivalents as tabled by eXtension "Animal units" (2015)';
const TYPICAL_WEIGHT = '[memory] typical weight for a pre-filled form; not from a published table — enter your own';

/** Intake rules of thumb, % of body weight per day (ATTRA Grazier's Math). */
export const INTAKE_RULES_OF_THUMB = Object.freeze({
  dryEwe: { pct: 2.5, min: 2.5, max: 2.5, source: ATTRA } as IntakeRange,
  lactatingEwe: { pct: 4.5, min: 4.5, max: 4.5, source: ATTRA } as IntakeRange,
  goat: { pct: 4.5, min: 4, max: 5, source: ATTRA } as IntakeRange,
});

/**
 * Presets for the capacity calculator and bids. AU equivalents are the NRCS figures; intake comes from
 * ATTRA where it gives one; other numbers are marked [memory] and must be replaced by the user's own.
 */
export const ANIMAL_CLASSES: readonly AnimalClass[] = Object.freeze([
  {
    id: 'ewe-dry',
    label: 'Mature ewe, dry',
    species: 'sheep',
    bodyWeightLb: 150,
    bodyWeightSource: TYPICAL_WEIGHT,
    intake: INTAKE_RULES_OF_THUMB.dryEwe,
    auEquivalent: 0.2,
    auSource: `${NRPH_AU}: mature sheep 0.20`,
  },
  {
    id: 'ewe-lactating',
    label: 'Mature ewe, lactating',
    species: 'sheep',
    bodyWeightLb: 150,
    bodyWeightSource: TYPICAL_WEIGHT,
    intake: INTAKE_RULES_OF_THUMB.lactatingEwe,
    auEquivalent: 0.2,
    auSource: `${NRPH_AU}: mature sheep 0.20 (the table quoted gives no separate figure for a lactating ewe)`,
  },
  {
    id: 'yearling-lamb',
    label: 'Yearling lamb',
    species: 'sheep',
    bodyWeightLb: 100,
    bodyWeightSource: TYPICAL_WEIGHT,
    intake: { pct: 3, min: 2.5, max: 3.5, source: '[memory] rule of thumb for growing lambs; common practice, no single source' },
    auEquivalent: 0.15,
    auSource: `${NRPH_AU}: yearling lamb 0.15`,
  },
  {
    id: 'goat-mature',
    label: 'Mature goat',
    species: 'goat',
    bodyWeightLb: 130,
    bodyWeightSource: TYPICAL_WEIGHT,
    intake: INTAKE_RULES_OF_THUMB.goat,
    auEquivalent: 0.15,
    auSource: `${NRPH_AU}: mature goat 0.15`,
  },
  {
    id: 'goat-kid',
    label: 'Kid goat',
    species: 'goat',
    bodyWeightLb: 50,
    bodyWeightSource: TYPICAL_WEIGHT,
    intake: INTAKE_RULES_OF_THUMB.goat,
    auEquivalent: 0.1,
    auSource: `${NRPH_AU}: kid 0.10`,
  },
  {
    // The reference animal of the AU convention, listed so the UI can explain what "1 AU" means.
    id: 'animal-unit',
    label: 'Animal unit (1 000 lb cow)',
    species: 'cattle',
    bodyWeightLb: 1000,
    bodyWeightSource: 'Society for Range Management, Glossary of Terms Used in Range Management, 4th ed., 1998',
    intake: { pct: 2.6, min: 2.6, max: 2.6, source: 'Society for Range Management, Glossary of Terms Used in Range Management, 4th ed., 1998 (26 lb/day)' },
    auEquivalent: 1,
    auSource: 'Society for Range Management, Glossary of Terms Used in Range Management, 4th ed., 1998',
  },
] satisfies AnimalClass[]);
