import { chargeLines, quantityToUnits, type ChargeBasis } from '../money';
import { daysBetween } from '../day-keys';
import { utilizationForPlan } from './capacity';
import { GrazingInputError } from './errors';
import { intakeForFlock, type FlockSpecies } from './flock-intake';

// Puts bids priced in different ways (per head-day, per acre, flat) on one footing so a grower can compare
// them: the estimated total through the same chargeLines() the calculator and invoices use, then cost per
// acre and per head-day from that total, and how much of the standing forage the proposal would eat.
// Money stays in integer cents / BigInt; only utilisation (a ratio) is floating point.

export interface BidTerms {
  basis: ChargeBasis;
  /** Dollars per unit as a decimal string ("0.18"). */
  rate: string;
  headCount: number;
  bodyWeightLb: number;
  species: FlockSpecies;
  animalClass: string;
  /** Day the animals come in, 'YYYY-MM-DD'. */
  startDate: string;
  /** Day they leave, 'YYYY-MM-DD'; the stay is endDate − startDate whole days. */
  endDate: string;
}

export interface BlockTerms {
  acres: number;
  lbDmPerAcre: number;
  targetUtilizationPct: number;
}

export interface NormalisedBid {
  days: number;
  /** headCount × days: the head-days the proposal would put on the block. */
  headDays: number;
  /** The quantity charged: head-days, acres, or 1 for a flat fee. */
  quantity: number;
  estimatedTotalCents: number;
  /** Total ÷ acres, rounded half-up to the cent. */
  costPerAcreCents: number;
  /** Total ÷ head-days in dollars, 4 decimals, rounded half-up ("0.1800"). */
  costPerHeadDayRate: string;
  intakePctBodyWeight: number;
  predictedUtilizationPct: number;
  targetUtilizationPct: number;
  /** The stay would eat more than the grower's target share of standing forage. */
  overgrazes: boolean;
}

/** Whole days of a stay from the day in to the day out. */
export function stayDays(startDate: string, endDate: string): number {
  const days = daysBetween(startDate, endDate);
  if (days < 1) throw new GrazingInputError('endDate', 'End date must be after the start date');
  return days;
}

/** a ÷ b for non-negative BigInts, rounded half-up. */
function divHalfUp(a: bigint, b: bigint): bigint {
  return (2n * a + b) / (2n * b);
}

const RATE4_SCALE = 10_000n;

export function normaliseBid(bid: BidTerms, block: BlockTerms): NormalisedBid {
  if (!Number.isSafeInteger(bid.headCount) || bid.headCount < 1) throw new GrazingInputError('headCount', 'Head count must be a whole number of at least 1');
  const days = stayDays(bid.startDate, bid.endDate);
  const headDays = bid.headCount * days;
  const quantity = bid.basis === 'head-day' ? headDays : bid.basis === 'acre' ? block.acres : 1;
  const charge = chargeLines({ basis: bid.basis, quantity, rate: bid.rate });
  const total = BigInt(charge.totalCents);

  // Acres carry at most 4 decimals (the money library's quantity precision): exact ten-thousandths.
  const acreUnits = quantityToUnits(block.acres, 'acres');
  if (acreUnits === 0n) throw new GrazingInputError('acres', 'Acres must be more than 0');
  const costPerAcreCents = Number(divHalfUp(total * RATE4_SCALE, acreUnits));
  // 1 cent = 100 ten-thousandths of a dollar.
  const perHeadDay = divHalfUp(total * 100n, BigInt(headDays));
  const costPerHeadDayRate = `${perHeadDay / RATE4_SCALE}.${(perHeadDay % RATE4_SCALE).toString().padStart(4, '0')}`;

  const intake = intakeForFlock(bid.species, bid.animalClass);
  const predictedUtilizationPct = utilizationForPlan({
    acres: block.acres,
    lbDmPerAcre: block.lbDmPerAcre,
    headCount: bid.headCount,
    days,
    animal: { bodyWeightLb: bid.bodyWeightLb, intakePctBodyWeight: intake.pct },
  });
  return {
    days,
    headDays,
    quantity,
    estimatedTotalCents: charge.totalCents,
    costPerAcreCents,
    costPerHeadDayRate,
    intakePctBodyWeight: intake.pct,
    predictedUtilizationPct,
    targetUtilizationPct: block.targetUtilizationPct,
    overgrazes: predictedUtilizationPct > block.targetUtilizationPct,
  };
}
