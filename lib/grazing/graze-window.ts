import { earlierDay, laterDay } from '../day-keys';
import { speciesIn, type FlockSpecies, type GrazingSpecies } from './flock-intake';
import { bindingSprayRecord, earliestSafeDate, type SprayRecord } from './safety';

// When animals may be on a block, and whether a proposed stay fits. Pure, so the bid form can tell the
// grazier before they send what the server will answer. A stay runs from the day the animals come in
// (startDate) to the day they leave (endDate): endDate − startDate days.

export interface WindowBlock {
  windowStart: string;
  windowEnd: string;
  /** Animals out by this day (before harvest); may be before windowEnd, and then it ends the window. */
  outBy: string;
  sprayRecords: readonly SprayRecord[];
  speciesAllowed: readonly GrazingSpecies[];
}

export interface GrazeSpan {
  /** First day animals may come in: the later of the window opening and the earliest safe date. */
  from: string;
  /** Last day animals may be on: the earlier of the window closing and the out-by date. */
  until: string;
  earliestSafeDate: string | null;
}

export function grazeSpan(block: WindowBlock): GrazeSpan {
  const safe = earliestSafeDate(block.sprayRecords);
  return {
    from: safe ? laterDay(block.windowStart, safe) : block.windowStart,
    until: earlierDay(block.windowEnd, block.outBy),
    earliestSafeDate: safe,
  };
}

export type PublishProblemCode = 'out_by_passed' | 'window_passed' | 'spray_restriction_covers_window';

export interface PublishProblem {
  code: PublishProblemCode;
  message: string;
}

/**
 * Why a block cannot be open for bids on `today` (its local date), or null: there must be at least one
 * whole day that is in the window, on or after the earliest safe date, not in the past, and before out-by.
 */
export function publishProblem(block: WindowBlock, today: string): PublishProblem | null {
  const span = grazeSpan(block);
  if (block.outBy <= today) {
    return { code: 'out_by_passed', message: `The animals-out-by date (${block.outBy}) is not after today (${today}): set a later date to publish` };
  }
  if (block.windowEnd <= today) {
    return { code: 'window_passed', message: `The grazing window ended on ${block.windowEnd}: set a new window to publish` };
  }
  if (span.earliestSafeDate && span.earliestSafeDate >= span.until) {
    const r = bindingSprayRecord(block.sprayRecords)!;
    return {
      code: 'spray_restriction_covers_window',
      message:
        `The earliest safe grazing date (${span.earliestSafeDate}: ${r.product} applied ${r.appliedOn}, no grazing for ` +
        `${r.grazingRestrictionDays} days by its label) is not before the last day animals may be on (${span.until}): there is no safe day to graze`,
    };
  }
  return null;
}

export interface StayProposal {
  startDate: string;
  endDate: string;
  species: FlockSpecies;
}

/** A block rule a stay breaks, at the field to change. */
export interface StayConflict {
  field: 'startDate' | 'endDate' | 'species';
  message: string;
}

/**
 * Every block rule the stay breaks (empty when it fits). With `today`, a start in the past is refused too
 * (for new and changed bids; an award judges the agreed dates, not the calendar).
 */
export function stayConflicts(stay: StayProposal, block: WindowBlock, today?: string): StayConflict[] {
  const out: StayConflict[] = [];
  const span = grazeSpan(block);
  const binding = bindingSprayRecord(block.sprayRecords);
  if (span.earliestSafeDate && binding && stay.startDate < span.earliestSafeDate) {
    out.push({
      field: 'startDate',
      message:
        `Start date is inside a pesticide grazing restriction: ${binding.product} was applied on ${binding.appliedOn} and its label ` +
        `allows no grazing for ${binding.grazingRestrictionDays} days. The earliest safe date is ${span.earliestSafeDate}.`,
    });
  }
  if (stay.startDate < block.windowStart) {
    out.push({ field: 'startDate', message: `Start date must be on or after the block's earliest-in date, ${block.windowStart}` });
  }
  if (today !== undefined && stay.startDate < today) {
    out.push({ field: 'startDate', message: `Start date has passed (today is ${today} at the block)` });
  }
  if (stay.endDate > block.outBy) {
    out.push({ field: 'endDate', message: `End date must be on or before the animals-out-by date, ${block.outBy}, which the grower set before harvest` });
  }
  if (stay.endDate > block.windowEnd) {
    out.push({ field: 'endDate', message: `End date must be on or before the block's latest-out date, ${block.windowEnd}` });
  }
  const refused = speciesIn(stay.species).filter((s) => !block.speciesAllowed.includes(s));
  if (refused.length > 0) {
    out.push({ field: 'species', message: `The grower allows only ${block.speciesAllowed.join(' and ')} on this block` });
  }
  return out;
}
