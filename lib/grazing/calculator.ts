import { ValidationError } from 'yup';
import { capacityRequestSchema, forageRequestSchema } from '../schemas/calc';
import { capacity, daysForHead, type CapacityResult } from './capacity';
import { GrazingInputError } from './errors';
import { forageFromHeight, forageFromSamples } from './forage';
import { lbPerAcreToKgPerHa } from '../units';

// The public calculator's whole computation, pure so the screen, its tests and the browser suite agree with
// POST /api/calc/forage and /capacity: the same schemas validate, the same functions compute.

export type ForageMethod = 'samples' | 'height' | 'direct';

export interface CalculatorSample {
  freshGrams: number | null;
  dryMatterPct: number | null;
  dryGrams: number | null;
}

export interface CalculatorValues {
  method: ForageMethod;
  frameAreaM2: number | null;
  weighing: 'fresh' | 'dry';
  samples: CalculatorSample[];
  heightIn: number | null;
  residualIn: number | null;
  lbDmPerAcrePerInch: number | null;
  lbDmPerAcre: number | null;
  acres: number | null;
  utilizationPct: number | null;
  headCount: number | null;
  bodyWeightLb: number | null;
  intakePctBodyWeight: number | null;
}

export interface CalculatorResult {
  forage: { lbDmPerAcre: number; kgDmPerHa: number; note: string } | null;
  capacity: CapacityResult | null;
  /** Days the block feeds the given head count (fractional; screens floor it). */
  daysForHerd: number | null;
  /** Messages keyed by the calculator's own field names (samples[0].dryGrams, acres, bodyWeightLb…). */
  errors: Record<string, string>;
}

function collect(err: unknown, errors: Record<string, string>, rename: (path: string) => string = (p) => p) {
  if (err instanceof ValidationError) {
    for (const e of err.inner.length ? err.inner : [err]) {
      const path = rename(e.path ?? '');
      if (!(path in errors)) errors[path] = e.message;
    }
  } else if (err instanceof GrazingInputError) {
    errors[rename(err.field)] ??= err.message;
  } else throw err;
}

function forageOf(v: CalculatorValues, errors: Record<string, string>): CalculatorResult['forage'] {
  try {
    if (v.method === 'samples') {
      const body = forageRequestSchema.validateSync(
        {
          frameAreaM2: v.frameAreaM2 ?? undefined,
          samples: v.samples.map((s) =>
            v.weighing === 'dry' ? { dryGrams: s.dryGrams ?? undefined } : { freshGrams: s.freshGrams ?? undefined, dryMatterPct: s.dryMatterPct ?? undefined },
          ),
        },
        { abortEarly: false },
      );
      const r = forageFromSamples(body);
      return { lbDmPerAcre: r.lbDmPerAcre, kgDmPerHa: r.kgDmPerHa, note: `${r.sampleCount} sample${r.sampleCount === 1 ? '' : 's'}, mean ${r.meanDryGrams.toFixed(1)} g dry per frame` };
    }
    if (v.method === 'height') {
      const missing = (['heightIn', 'residualIn', 'lbDmPerAcrePerInch'] as const).filter((k) => v[k] == null);
      for (const k of missing) errors[k] = 'Required';
      if (missing.length) return null;
      const r = forageFromHeight({ heightIn: v.heightIn!, residualIn: v.residualIn!, lbDmPerAcrePerInch: v.lbDmPerAcrePerInch! });
      return { lbDmPerAcre: r.lbDmPerAcre, kgDmPerHa: lbPerAcreToKgPerHa(r.lbDmPerAcre), note: `${r.usableInches.toFixed(1)} in above the residual` };
    }
    if (v.lbDmPerAcre == null) {
      errors.lbDmPerAcre = 'Enter the forage in lb DM per acre';
      return null;
    }
    if (typeof v.lbDmPerAcre !== 'number' || !(v.lbDmPerAcre >= 0)) {
      errors.lbDmPerAcre = 'Forage must be a number of at least 0';
      return null;
    }
    return { lbDmPerAcre: v.lbDmPerAcre, kgDmPerHa: lbPerAcreToKgPerHa(v.lbDmPerAcre), note: 'entered directly' };
  } catch (err) {
    collect(err, errors);
    return null;
  }
}

export function computeCalculator(v: CalculatorValues): CalculatorResult {
  const errors: Record<string, string> = {};
  const forage = forageOf(v, errors);
  let cap: CapacityResult | null = null;
  try {
    const body = capacityRequestSchema.validateSync(
      {
        acres: v.acres ?? undefined,
        lbDmPerAcre: forage?.lbDmPerAcre ?? 0,
        utilizationPct: v.utilizationPct ?? undefined,
        animal: { bodyWeightLb: v.bodyWeightLb ?? undefined, intakePctBodyWeight: v.intakePctBodyWeight ?? undefined },
      },
      { abortEarly: false },
    );
    if (forage) cap = capacity(body);
  } catch (err) {
    collect(err, errors, (p) => p.replace(/^animal\./, ''));
  }
  let daysForHerd: number | null = null;
  if (cap && v.headCount != null) {
    if (typeof v.headCount === 'number' && Number.isInteger(v.headCount) && v.headCount > 0) daysForHerd = daysForHead(cap.headDays, v.headCount);
    else errors.headCount = 'Head count must be a whole number of at least 1';
  }
  return { forage, capacity: cap, daysForHerd, errors };
}

/** Frame sizes graziers actually clip with; the factor beside each is the published rounded one (shared/TRADE.md). */
export const FRAME_PRESETS = [
  { label: '1 ft² frame', frameAreaM2: 0.09290304, note: 'grams × 96 ≈ lb DM/ac' },
  { label: '0.25 m² quadrat', frameAreaM2: 0.25, note: 'grams × 40 = kg DM/ha' },
  { label: '9.6 ft² hoop', frameAreaM2: 9.6 * 0.09290304, note: 'grams × 10 ≈ lb DM/ac' },
] as const;
