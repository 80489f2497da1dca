import { forageFromHeight, forageFromSamples, type ForageFromHeightInput, type ForageFromSamplesInput } from './forage';
import { GrazingInputError } from './errors';

// A block's standing forage (lb DM per acre) from however the grower measured it. The server stores the
// figure this returns, and the form shows the same function's answer, so the two can never disagree.

export const FORAGE_METHODS = ['direct', 'samples', 'height'] as const;
export type ForageMethod = (typeof FORAGE_METHODS)[number];

/** Upper bound on any stored figure (the calculator's limit): more is a unit slip, not a stand. */
export const MAX_LB_DM_PER_ACRE = 30_000;

export interface BlockForageInput {
  forageMethod: ForageMethod;
  lbDmPerAcre?: number;
  forageSamples?: ForageFromSamplesInput;
  forageHeight?: ForageFromHeightInput;
}

/** The figure the measurement gives, before range checks; throws GrazingInputError for a missing or invalid measurement. */
export function measuredLbDmPerAcre(input: BlockForageInput): number {
  if (input.forageMethod === 'samples') {
    if (!input.forageSamples) throw new GrazingInputError('forageSamples', 'Add the clipped samples');
    return forageFromSamples(input.forageSamples).lbDmPerAcre;
  }
  if (input.forageMethod === 'height') {
    if (!input.forageHeight) throw new GrazingInputError('forageHeight', 'Give the stand height, residual and pounds per inch');
    return forageFromHeight(input.forageHeight).lbDmPerAcre;
  }
  if (input.lbDmPerAcre === undefined) throw new GrazingInputError('lbDmPerAcre', 'Forage per acre is required');
  return input.lbDmPerAcre;
}

/** Why a figure cannot be a block's standing forage, or null when it can. */
export function forageFigureProblem(lbDmPerAcre: number): string | null {
  if (!(lbDmPerAcre > 0)) return 'This gives no grazeable forage (0 lb DM per acre): check the figures';
  if (lbDmPerAcre > MAX_LB_DM_PER_ACRE) return `This gives more than ${MAX_LB_DM_PER_ACRE} lb DM per acre: check the units`;
  return null;
}

/** The request field that holds the measurement of each method. */
export const FORAGE_FIELD: Record<ForageMethod, 'lbDmPerAcre' | 'forageSamples' | 'forageHeight'> = {
  direct: 'lbDmPerAcre',
  samples: 'forageSamples',
  height: 'forageHeight',
};

/** lb DM/ac to store for the block, throwing GrazingInputError naming the field when the measurement gives no usable figure. */
export function blockLbDmPerAcre(input: BlockForageInput): number {
  const lb = measuredLbDmPerAcre(input);
  const problem = forageFigureProblem(lb);
  if (problem) throw new GrazingInputError(FORAGE_FIELD[input.forageMethod], problem);
  return lb;
}
