import { ANIMAL_CLASSES, INTAKE_RULES_OF_THUMB, type IntakeRange } from './capacity';

// Which intake rule of thumb a flock eats by, for capacity ("days of feed for my flock") and for a bid's
// predicted utilisation. All figures come from the presets in ./capacity (NCAT ATTRA, "Grazier's Math"):
// dry ewes 2.5 %, lactating ewes 4.5 %, goats 4–5 % (default 4.5 %) of body weight per day.
// A mixed flock is budgeted at the higher (goat) figure so the overgrazing warning errs on the safe side.

export const GRAZING_SPECIES = ['sheep', 'goats'] as const;
export type GrazingSpecies = (typeof GRAZING_SPECIES)[number];
export const FLOCK_SPECIES = ['sheep', 'goats', 'mixed'] as const;
export type FlockSpecies = (typeof FLOCK_SPECIES)[number];

/** The species a flock of this kind puts on the land. */
export function speciesIn(species: FlockSpecies): GrazingSpecies[] {
  return species === 'mixed' ? ['sheep', 'goats'] : [species];
}

export interface FlockIntake extends IntakeRange {
  /** What the figure stands for, to show beside it ("dry ewe", "goat"). */
  basis: string;
}

const yearlingLamb = ANIMAL_CLASSES.find((c) => c.id === 'yearling-lamb');

/** Daily dry-matter intake, % of body weight, for a flock of `species` and class. */
export function intakeForFlock(species: FlockSpecies, animalClass: string): FlockIntake {
  if (species === 'goats' || species === 'mixed') return { ...INTAKE_RULES_OF_THUMB.goat, basis: 'goat' };
  if (animalClass === 'ewes with lambs') return { ...INTAKE_RULES_OF_THUMB.lactatingEwe, basis: 'lactating ewe' };
  if (animalClass === 'weaned lambs' && yearlingLamb) return { ...yearlingLamb.intake, basis: 'growing lamb' };
  return { ...INTAKE_RULES_OF_THUMB.dryEwe, basis: 'dry ewe' };
}
