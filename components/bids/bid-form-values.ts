import type { AccountView } from '@/lib/schemas/account';
import type { BidInput, BidService, BidView, FlockClass } from '@/lib/schemas/bid';
import type { BlockView } from '@/lib/schemas/block';
import type { ChargeBasis } from '@/lib/money';
import type { FlockSpecies } from '@/lib/grazing/flock-intake';
import { normaliseBid, type NormalisedBid } from '@/lib/grazing/bid-compare';
import { capacity, daysForHead } from '@/lib/grazing/capacity';
import { GrazingInputError } from '@/lib/grazing/errors';
import { stayConflicts } from '@/lib/grazing/graze-window';
import { addDays, earlierDay, isDayKey, laterDay, todayIn } from '@/lib/day-keys';

// The bid form's values, what it sends, and what it can tell the grazier before sending: the stay checked
// against the block's rules (lib/grazing/graze-window, the same check the server makes) and the bid on a
// common footing (lib/grazing/bid-compare normaliseBid, the same figures the grower will compare).

export interface BidFormValues {
  basis: ChargeBasis;
  /** Dollars as typed ("0.18"); sent as text so fractions of a cent survive. */
  rate: string;
  headCount: number | null;
  species: FlockSpecies;
  animalClass: FlockClass;
  bodyWeightLb: number | null;
  startDate: string;
  endDate: string;
  services: BidService[];
  note: string;
}

/** Today's date where the block is (a start before it is refused). */
export function blockToday(block: Pick<BlockView, 'timeZone'>, nowMs = Date.now()): string {
  return todayIn(block.timeZone, nowMs);
}

/**
 * A new bid starts from the grazier's flock profile and a stay that fits: in on the first grazeable day
 * (or today), out after the whole days the block feeds the flock at the grower's target, and never past the
 * last grazeable day. Every field is the grazier's to change.
 */
export function newBidValues(block: BlockView, user: Pick<AccountView, 'flock'> | null, today: string): BidFormValues {
  const flock = user?.flock ?? null;
  const species: FlockSpecies = (flock?.species as FlockSpecies | undefined) ?? block.speciesAllowed[0] ?? 'sheep';
  const start = laterDay(block.grazeFrom, today);
  let end = '';
  if (start < block.grazeUntil) {
    const wholeDays = block.daysForMyFlock != null ? Math.max(1, Math.floor(block.daysForMyFlock + 1e-9)) : null;
    end = wholeDays != null ? earlierDay(addDays(start, wholeDays), block.grazeUntil) : block.grazeUntil;
  }
  return {
    basis: 'head-day',
    rate: '',
    headCount: flock?.headCount ?? null,
    species,
    animalClass: (flock?.animalClass as FlockClass | undefined) ?? (species === 'sheep' ? 'dry ewes' : 'wethers'),
    bodyWeightLb: flock?.bodyWeightLb ?? null,
    startDate: start < block.grazeUntil ? start : '',
    endDate: end,
    services: [],
    note: '',
  };
}

export function editBidValues(bid: BidView): BidFormValues {
  return {
    basis: bid.basis,
    rate: bid.rate,
    headCount: bid.headCount,
    species: bid.species,
    animalClass: bid.animalClass,
    bodyWeightLb: bid.bodyWeightLb,
    startDate: bid.startDate,
    endDate: bid.endDate,
    services: [...bid.services],
    note: bid.note ?? '',
  };
}

/** The request body; the form has already checked it with bidInputSchema. */
export function toBidInput(v: BidFormValues): BidInput {
  const note = v.note.trim();
  return {
    basis: v.basis,
    rate: v.rate.trim(),
    headCount: v.headCount as number,
    species: v.species,
    animalClass: v.animalClass,
    bodyWeightLb: v.bodyWeightLb as number,
    startDate: v.startDate,
    endDate: v.endDate,
    services: v.services,
    note: note === '' ? null : note,
  };
}

/** The block's rules the stay breaks, one message per field, as the server would name them (empty until both dates are real days). */
export function stayErrors(v: BidFormValues, block: BlockView, today: string): Partial<Record<'startDate' | 'endDate' | 'species', string>> {
  if (!isDayKey(v.startDate) || !isDayKey(v.endDate)) return {};
  const out: Partial<Record<'startDate' | 'endDate' | 'species', string>> = {};
  for (const c of stayConflicts({ startDate: v.startDate, endDate: v.endDate, species: v.species }, block, today)) out[c.field] ??= c.message;
  return out;
}

export interface BidPreview {
  normalised: NormalisedBid;
  /** Whole days the bid's head can stay within the grower's target take, and the day they would leave. */
  withinTarget: { days: number; endDate: string } | null;
}

/** The bid on the common footing, or null while the terms are incomplete or invalid. */
export function previewBid(v: BidFormValues, block: BlockView): BidPreview | null {
  if (v.headCount == null || v.bodyWeightLb == null || !isDayKey(v.startDate) || !isDayKey(v.endDate)) return null;
  let normalised: NormalisedBid;
  try {
    normalised = normaliseBid(
      {
        basis: v.basis,
        rate: v.rate.trim(),
        headCount: v.headCount,
        bodyWeightLb: v.bodyWeightLb,
        species: v.species,
        animalClass: v.animalClass,
        startDate: v.startDate,
        endDate: v.endDate,
      },
      block,
    );
  } catch (err) {
    if (err instanceof GrazingInputError || err instanceof RangeError) return null;
    throw err;
  }
  let withinTarget: BidPreview['withinTarget'] = null;
  try {
    const headDays = capacity({
      acres: block.acres,
      lbDmPerAcre: block.lbDmPerAcre,
      utilizationPct: block.targetUtilizationPct,
      animal: { bodyWeightLb: v.bodyWeightLb, intakePctBodyWeight: normalised.intakePctBodyWeight },
    }).headDays;
    const days = Math.floor(daysForHead(headDays, v.headCount) + 1e-9);
    withinTarget = { days, endDate: addDays(v.startDate, days) };
  } catch (err) {
    if (!(err instanceof GrazingInputError)) throw err;
  }
  return { normalised, withinTarget };
}
