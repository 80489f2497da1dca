import { ValidationError } from 'yup';
import { blockInputSchema, DEFAULT_TIME_ZONE, type BlockCrop, type BlockInput, type BlockView, type PerimeterFence } from '@/lib/schemas/block';
import type { CalculatorSample, CalculatorValues } from '@/lib/grazing/calculator';
import type { SprayRecord } from '@/lib/grazing/safety';
import type { GrazingSpecies } from '@/lib/grazing/flock-intake';
import { nestErrors } from '@/components/form/nest-errors';

// The block form keeps the forage measurement in the calculator's field names, so the same forage inputs
// serve both screens; these functions turn it into the API's BlockInput and map the shared schema's
// messages back onto the form's fields.

type ForageFields = Pick<CalculatorValues, 'method' | 'frameAreaM2' | 'weighing' | 'samples' | 'heightIn' | 'residualIn' | 'lbDmPerAcrePerInch' | 'lbDmPerAcre'>;

export interface BlockFormValues extends ForageFields {
  name: string;
  crop: BlockCrop | '';
  acres: number | null;
  placeName: string;
  latitude: number | null;
  longitude: number | null;
  targetUtilizationPct: number | null;
  residualHeightIn: number | null;
  windowStart: string;
  windowEnd: string;
  outBy: string;
  harvestDate: string;
  sprayRecords: Array<{ product: string; appliedOn: string; grazingRestrictionDays: number | null; containsCopper: boolean }>;
  waterOnSite: boolean;
  perimeterFence: PerimeterFence;
  truckAccess: boolean;
  speciesAllowed: GrazingSpecies[];
  youngPlantings: boolean;
  notes: string;
}

const blankSample = (): CalculatorSample => ({ freshGrams: null, dryMatterPct: 20, dryGrams: null });

export function emptyBlockForm(home?: { latitude: number | null; longitude: number | null; place: string | null }): BlockFormValues {
  return {
    name: '',
    crop: '',
    acres: null,
    placeName: home?.place ?? '',
    latitude: home?.latitude ?? null,
    longitude: home?.longitude ?? null,
    method: 'direct',
    frameAreaM2: 0.25,
    weighing: 'fresh',
    samples: [blankSample(), blankSample(), blankSample()],
    heightIn: null,
    residualIn: 3,
    lbDmPerAcrePerInch: 275,
    lbDmPerAcre: null,
    targetUtilizationPct: 45,
    residualHeightIn: 3,
    windowStart: '',
    windowEnd: '',
    outBy: '',
    harvestDate: '',
    sprayRecords: [],
    waterOnSite: false,
    perimeterFence: 'none',
    truckAccess: true,
    speciesAllowed: ['sheep'],
    youngPlantings: false,
    notes: '',
  };
}

export function blockFormFromView(b: BlockView): BlockFormValues {
  const samples = b.forageSamples?.samples.map((s) =>
    'dryGrams' in s ? { freshGrams: null, dryMatterPct: null, dryGrams: s.dryGrams } : { freshGrams: s.freshGrams, dryMatterPct: s.dryMatterPct, dryGrams: null },
  );
  return {
    ...emptyBlockForm(),
    name: b.name,
    crop: b.crop,
    acres: b.acres,
    placeName: b.placeName ?? '',
    latitude: b.latitude,
    longitude: b.longitude,
    method: b.forageMethod,
    frameAreaM2: b.forageSamples?.frameAreaM2 ?? 0.25,
    weighing: samples && samples[0]?.dryGrams != null ? 'dry' : 'fresh',
    samples: samples?.length ? samples : [blankSample()],
    heightIn: b.forageHeight?.heightIn ?? null,
    residualIn: b.forageHeight?.residualIn ?? 3,
    lbDmPerAcrePerInch: b.forageHeight?.lbDmPerAcrePerInch ?? 275,
    lbDmPerAcre: b.forageMethod === 'direct' ? b.lbDmPerAcre : null,
    targetUtilizationPct: b.targetUtilizationPct,
    residualHeightIn: b.residualHeightIn,
    windowStart: b.windowStart,
    windowEnd: b.windowEnd,
    outBy: b.outBy,
    harvestDate: b.harvestDate ?? '',
    sprayRecords: b.sprayRecords.map((r) => ({ ...r })),
    waterOnSite: b.waterOnSite,
    perimeterFence: b.perimeterFence,
    truckAccess: b.truckAccess,
    speciesAllowed: [...b.speciesAllowed],
    youngPlantings: b.youngPlantings,
    notes: b.notes ?? '',
  };
}

const orUndefined = <T,>(v: T | null | '') => (v === null || v === '' ? undefined : v);

/** What is sent: only the measurement of the chosen forage method, blanks left out so the schema names them. */
export function toBlockInput(v: BlockFormValues): BlockInput {
  const input: Record<string, unknown> = {
    name: v.name.trim(),
    crop: orUndefined(v.crop),
    acres: orUndefined(v.acres),
    placeName: v.placeName.trim() || null,
    latitude: orUndefined(v.latitude),
    longitude: orUndefined(v.longitude),
    timeZone: DEFAULT_TIME_ZONE,
    forageMethod: v.method,
    targetUtilizationPct: orUndefined(v.targetUtilizationPct),
    residualHeightIn: v.residualHeightIn,
    windowStart: orUndefined(v.windowStart),
    windowEnd: orUndefined(v.windowEnd),
    outBy: orUndefined(v.outBy),
    harvestDate: v.harvestDate || null,
    sprayRecords: v.sprayRecords.map((r) => ({ ...r, product: r.product.trim(), grazingRestrictionDays: orUndefined(r.grazingRestrictionDays) }) as SprayRecord),
    waterOnSite: v.waterOnSite,
    perimeterFence: v.perimeterFence,
    truckAccess: v.truckAccess,
    speciesAllowed: v.speciesAllowed,
    youngPlantings: v.youngPlantings,
    notes: v.notes.trim() || null,
  };
  if (v.method === 'direct') input.lbDmPerAcre = orUndefined(v.lbDmPerAcre);
  if (v.method === 'samples') {
    input.forageSamples = {
      frameAreaM2: orUndefined(v.frameAreaM2),
      samples: v.samples.map((s) =>
        v.weighing === 'dry' ? { dryGrams: orUndefined(s.dryGrams) } : { freshGrams: orUndefined(s.freshGrams), dryMatterPct: orUndefined(s.dryMatterPct) },
      ),
    };
  }
  if (v.method === 'height') input.forageHeight = { heightIn: orUndefined(v.heightIn), residualIn: orUndefined(v.residualIn), lbDmPerAcrePerInch: orUndefined(v.lbDmPerAcrePerInch) };
  return input as unknown as BlockInput;
}

/** API and schema paths → the form's field names (forageSamples.samples[0].dryGrams → samples[0].dryGrams). */
export function formPath(path: string): string {
  return path
    .replace(/^forageSamples\.samples/, 'samples')
    .replace(/^forageSamples\.frameAreaM2/, 'frameAreaM2')
    .replace(/^forageSamples$/, 'samples')
    .replace(/^forageHeight\./, '')
    .replace(/^forageHeight$/, 'heightIn');
}

export function mapFieldErrors(fields: Record<string, string>): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, msg] of Object.entries(fields)) out[formPath(k)] ??= msg;
  return out;
}

/** Formik `validate`: the shared block schema, with its messages placed on the form's fields (nested for Formik). */
export async function validateBlockForm(v: BlockFormValues): Promise<Record<string, unknown>> {
  try {
    await blockInputSchema.validate(toBlockInput(v), { abortEarly: false });
    return {};
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err;
    const flat: Record<string, string> = {};
    for (const e of err.inner.length ? err.inner : [err]) if (e.path) flat[formPath(e.path)] ??= e.message;
    return nestErrors(flat);
  }
}
