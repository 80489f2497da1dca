import { gramsPerM2ToLbPerAcre } from '../units';
import { GrazingInputError } from './errors';

// Standing forage is expressed as oven-dry matter (DM) per unit area. Clip-and-weigh: grams clipped from a
// frame of known area → g/m² → lb/ac (× 4 046.856 422 4 / 453.592 37) and kg/ha (× 10). The published
// per-frame factors (×96 for a 1 ft² frame, ×10 for a 9.6 ft² hoop, ×40 → kg/ha for a 0.25 m² quadrat)
// are rounded versions of this exact arithmetic; we keep the exact form and test against the factors.

export type ForageSample = { freshGrams: number; dryMatterPct: number } | { dryGrams: number };

export interface ForageFromSamplesInput {
  /** Area of the clipping frame in m² (a 1 ft² frame is 0.092 903 04 m²). */
  frameAreaM2: number;
  samples: ForageSample[];
}

export interface ForageEstimate {
  lbDmPerAcre: number;
  kgDmPerHa: number;
  sampleCount: number;
  /** Mean oven-dry grams per frame. */
  meanDryGrams: number;
  /** Sample standard deviation (n − 1) of dry grams per frame; 0 for a single sample. */
  sdDryGrams: number;
  minDryGrams: number;
  maxDryGrams: number;
}

function finiteAtLeast(value: number, min: number, field: string, label: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min) {
    throw new GrazingInputError(field, `${label} must be a number of at least ${min}`);
  }
}

/** Dry grams of one sample: either weighed after drying, or fresh weight × measured dry-matter fraction. */
export function sampleDryGrams(sample: ForageSample, index = 0): number {
  if ('dryGrams' in sample) {
    finiteAtLeast(sample.dryGrams, 0, `samples[${index}].dryGrams`, 'Dry weight');
    return sample.dryGrams;
  }
  finiteAtLeast(sample.freshGrams, 0, `samples[${index}].freshGrams`, 'Fresh weight');
  const pct = sample.dryMatterPct;
  if (typeof pct !== 'number' || !Number.isFinite(pct) || pct <= 0 || pct > 100) {
    throw new GrazingInputError(`samples[${index}].dryMatterPct`, 'Dry matter must be more than 0 % and at most 100 %');
  }
  return (sample.freshGrams * pct) / 100;
}

export function forageFromSamples(input: ForageFromSamplesInput): ForageEstimate {
  const { frameAreaM2, samples } = input;
  if (typeof frameAreaM2 !== 'number' || !Number.isFinite(frameAreaM2) || frameAreaM2 <= 0) {
    throw new GrazingInputError('frameAreaM2', 'Frame area must be more than 0 m²');
  }
  if (!Array.isArray(samples) || samples.length === 0) {
    throw new GrazingInputError('samples', 'Add at least one clipped sample');
  }
  const dry = samples.map((s, i) => sampleDryGrams(s, i));
  const n = dry.length;
  const mean = dry.reduce((a, b) => a + b, 0) / n;
  const sd = n > 1 ? Math.sqrt(dry.reduce((a, g) => a + (g - mean) ** 2, 0) / (n - 1)) : 0;
  const gramsPerM2 = mean / frameAreaM2;
  return {
    lbDmPerAcre: gramsPerM2ToLbPerAcre(gramsPerM2),
    // 1 g/m² = 10 000 g/ha = 10 kg/ha.
    kgDmPerHa: gramsPerM2 * 10,
    sampleCount: n,
    meanDryGrams: mean,
    sdDryGrams: sd,
    minDryGrams: Math.min(...dry),
    maxDryGrams: Math.max(...dry),
  };
}

export interface ForageFromHeightInput {
  /** Average stand height in inches. */
  heightIn: number;
  /** Stubble to leave, in inches ("take half, leave half": stop at 2–3 in; common practice, no single source). */
  residualIn: number;
  /** Stand density factor: lb DM per acre per inch of height (see STAND_HEIGHT_FACTORS). */
  lbDmPerAcrePerInch: number;
}

export function forageFromHeight(input: ForageFromHeightInput): { usableInches: number; lbDmPerAcre: number } {
  finiteAtLeast(input.heightIn, 0, 'heightIn', 'Height');
  finiteAtLeast(input.residualIn, 0, 'residualIn', 'Residual height');
  finiteAtLeast(input.lbDmPerAcrePerInch, 0, 'lbDmPerAcrePerInch', 'Pounds of dry matter per acre per inch');
  // Only the forage above the residual is grazeable; a stand already at or below it offers nothing.
  const usableInches = Math.max(0, input.heightIn - input.residualIn);
  return { usableInches, lbDmPerAcre: usableInches * input.lbDmPerAcrePerInch };
}

export interface StandHeightFactor {
  id: string;
  stand: string;
  condition: 'fair' | 'good' | 'excellent';
  lbDmPerAcrePerInchMin: number;
  lbDmPerAcrePerInchMax: number;
  /** Midpoint of the published range, offered as the editable default. */
  lbDmPerAcrePerInch: number;
  source: string;
}

const MAINE_APPENDIX_D =
  'University of Maine Cooperative Extension, Pasture Course, Lesson 1, Appendix D ("Visual Method"): lb DM/ac per inch of height by stand and condition';

function factor(id: string, stand: string, condition: StandHeightFactor['condition'], min: number, max: number): StandHeightFactor {
  return { id, stand, condition, lbDmPerAcrePerInchMin: min, lbDmPerAcrePerInchMax: max, lbDmPerAcrePerInch: (min + max) / 2, source: MAINE_APPENDIX_D };
}

/**
 * Presets for the stand-height method. Only the rows quoted in TRADE.md are listed; local stands and
 * winter covers differ, so the UI shows them as editable starting points, never as the answer.
 */
export const STAND_HEIGHT_FACTORS: readonly StandHeightFactor[] = Object.freeze([
  factor('orchardgrass-legume-fair', 'Orchardgrass/legume', 'fair', 150, 200),
  factor('orchardgrass-legume-good', 'Orchardgrass/legume', 'good', 250, 300),
  factor('orchardgrass-legume-excellent', 'Orchardgrass/legume', 'excellent', 300, 350),
]);
