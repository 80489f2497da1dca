import * as yup from 'yup';
import { isValidTimeZone, parseIsoInstant } from '../dates';
import { CHARGE_BASES, isValidQuantity, QUANTITY_DECIMALS, RATE_PATTERN } from '../money';
import { rejectUnknown } from './reject-unknown';

// Request bodies of the public calculator (POST /api/calc/*), shared by the app's forms and the server.
// Every leaf is `.strict()`: a string "12" where a number belongs is refused, never coerced, so the server
// computes on exactly what was sent. Messages name the field in a user's words. Unknown fields are refused
// (see reject-unknown.ts).
//
// These routes answer without sign-in, so every input whose size grows the work has a ceiling here, checked
// before the work: the number of samples, moves and fees (by length alone, see bounded.ts), the days between
// the first move and the end time (head-days are split by local day), and the length of every string.

function num(label: string) {
  return yup.number().strict().typeError(`${label} must be a number`);
}

function str(label: string) {
  return yup.string().strict().typeError(`${label} must be text`);
}

/** An ISO 8601 instant with an offset ("2027-03-08T07:30:00-08:00" or "…Z"). */
function instant(label: string) {
  return str(label).test(
    'iso-instant',
    `${label} must be a date and time with a UTC offset, like 2027-03-08T07:30:00-08:00`,
    (v) => v === undefined || parseIsoInstant(v) !== null,
  );
}

// ——— POST /api/calc/forage ———

const freshSampleSchema = rejectUnknown(
  yup
    .object({
      freshGrams: num('Fresh weight')
        .min(0, 'Fresh weight must be at least 0 g')
        .max(1_000_000, 'Fresh weight must be at most 1 000 000 g')
        .required('Fresh weight is required (or give a dry weight)'),
      dryMatterPct: num('Dry matter')
        .moreThan(0, 'Dry matter must be more than 0 %')
        .max(100, 'Dry matter must be at most 100 %')
        .required('Dry matter % is required with a fresh weight'),
    })
    .typeError('Each sample must have a fresh weight with its dry matter %, or a dry weight'),
);

const BOTH_KINDS = 'Give a dry weight, or a fresh weight with its dry matter % — not both';

/** A field that belongs to the other kind of sample: declared (so stripUnknown keeps it) and refused. */
function otherKind() {
  // Not `.strip()`: a stripped field is dropped by the cast before its test could see it.
  return yup.mixed<never>().test('one-kind', BOTH_KINDS, (v) => v === undefined);
}

const drySampleSchema = rejectUnknown(
  yup.object({
    dryGrams: num('Dry weight')
      .min(0, 'Dry weight must be at least 0 g')
      .max(1_000_000, 'Dry weight must be at most 1 000 000 g')
      .required('Dry weight is required'),
    freshGrams: otherKind(),
    dryMatterPct: otherKind(),
  }),
);

// yup has no union type; `lazy` picks the branch per sample, and InferType gives the union
// `{ freshGrams, dryMatterPct } | { dryGrams }` that forageFromSamples takes.
const sampleSchema = yup.lazy((value: unknown) =>
  value !== null && typeof value === 'object' && 'dryGrams' in value ? drySampleSchema : freshSampleSchema,
);

/** Clipped quadrats in one estimate: a block is sampled with 10–30; 200 is generous. */
export const MAX_SAMPLES = 200;

export const forageRequestSchema = rejectUnknown(
  yup.object({
    frameAreaM2: num('Frame area')
      .moreThan(0, 'Frame area must be more than 0 m²')
      .max(10, 'Frame area must be at most 10 m²')
      .required('Frame area is required'),
    // Lists are capped by their own max; the server refuses an over-long one by its length before yup looks at an
    // item (server/lib/http/list-caps.ts), so the cap bounds the work a request can cause.
    samples: yup
      .array(sampleSchema)
      .typeError('Samples must be a list')
      .min(1, 'Add at least one clipped sample')
      .max(MAX_SAMPLES, `At most ${MAX_SAMPLES} samples`)
      .required('Add at least one clipped sample'),
  }),
);

export type ForageRequest = yup.InferType<typeof forageRequestSchema>;

// ——— POST /api/calc/capacity ———

export const animalIntakeSchema = rejectUnknown(
  yup
    .object({
      bodyWeightLb: num('Body weight')
        .min(10, 'Body weight must be at least 10 lb')
        .max(2500, 'Body weight must be at most 2 500 lb')
        .required('Body weight is required'),
      intakePctBodyWeight: num('Intake')
        .min(0.5, 'Intake must be at least 0.5 % of body weight')
        .max(6, 'Intake must be at most 6 % of body weight')
        .required('Intake (% of body weight) is required'),
    })
    .typeError('Animal must give a body weight and an intake'),
);

export const capacityRequestSchema = rejectUnknown(
  yup.object({
    acres: num('Acres').moreThan(0, 'Acres must be more than 0').max(100_000, 'Acres must be at most 100 000').required('Acres is required'),
    lbDmPerAcre: num('Forage per acre')
      .min(0, 'Forage per acre must be at least 0 lb DM')
      .max(30_000, 'Forage per acre must be at most 30 000 lb DM')
      .required('Forage per acre (lb DM) is required'),
    utilizationPct: num('Utilisation')
      .moreThan(0, 'Utilisation must be more than 0 %')
      .max(100, 'Utilisation must be at most 100 %')
      .required('Utilisation is required'),
    animal: animalIntakeSchema.required('Animal body weight and intake are required'),
  }),
);

export type CapacityRequest = yup.InferType<typeof capacityRequestSchema>;

// ——— POST /api/calc/head-days ———

/** Moves in one head-day count: a mob moved in and out every day for a year fits (730). */
export const MAX_MOVES = 1_000;
/** Days from the first move to the end time: the count is split by local day, so the span is the work. */
export const MAX_SPAN_DAYS = 400;
const DAY_MS = 86_400_000;

const moveSchema = rejectUnknown(
  yup
    .object({
      at: instant('Move time').required('Move time is required'),
      change: num('Change')
        .integer('Change must be a whole number of animals')
        .test('non-zero', 'Change must not be 0: give +n animals in or −n out', (v) => v !== 0)
        .min(-1_000_000, 'Change must be at least −1 000 000')
        .max(1_000_000, 'Change must be at most 1 000 000')
        .required('Change is required'),
    })
    .typeError('Each move must have a time and a change'),
);

/** Order and running count over the whole list; points at the first move that breaks them. */
function checkMoveSequence(this: yup.TestContext, moves: unknown): true | yup.ValidationError {
  if (!Array.isArray(moves)) return true;
  let count = 0;
  let lastAt: number | null = null;
  for (let i = 0; i < moves.length; i++) {
    // Moves whose own fields are invalid are reported by their own tests; here they are skipped.
    const move = moves[i] as { at?: unknown; change?: unknown } | null;
    const at = parseIsoInstant(move?.at);
    if (at !== null) {
      if (lastAt !== null && at < lastAt) {
        return this.createError({ path: `${this.path}[${i}].at`, message: 'Moves must be in time order: this move is earlier than the one before it' });
      }
      lastAt = at;
    }
    const change = move?.change;
    if (typeof change === 'number' && Number.isInteger(change)) {
      if (count + change < 0) {
        return this.createError({ path: `${this.path}[${i}].change`, message: `This move takes out more animals than are on the block (${count})` });
      }
      count += change;
    }
  }
  return true;
}

export const headDaysRequestSchema = rejectUnknown(
  yup.object({
    moves: yup
      .array(moveSchema)
      .typeError('Moves must be a list')
      .min(1, 'Add at least one move')
      .max(MAX_MOVES, `At most ${MAX_MOVES} moves`)
      .required('Add at least one move')
      .test('time-order-and-count', 'Moves must be in time order and never take out more animals than are on', checkMoveSequence),
    until: instant('End time')
      .required('End time is required')
      .test('after-last-move', 'End time must not be before the last move', function (until) {
        const end = parseIsoInstant(until);
        const moves: unknown = this.parent?.moves;
        if (end === null || !Array.isArray(moves) || moves.length > MAX_MOVES) return true;
        const times = moves.map((m: { at?: unknown } | null) => parseIsoInstant(m?.at)).filter((t): t is number => t !== null);
        return times.length === 0 || end >= Math.max(...times);
      })
      .test('span', `End time must be at most ${MAX_SPAN_DAYS} days after the first move`, function (until) {
        const end = parseIsoInstant(until);
        const moves: unknown = this.parent?.moves;
        if (end === null || !Array.isArray(moves) || moves.length > MAX_MOVES) return true;
        const first = Math.min(...moves.map((m: { at?: unknown } | null) => parseIsoInstant(m?.at) ?? Number.POSITIVE_INFINITY));
        return !Number.isFinite(first) || end - first <= MAX_SPAN_DAYS * DAY_MS;
      }),
    timeZone: str('Time zone')
      .max(64, 'Time zone must be an IANA name such as America/Los_Angeles')
      .optional()
      .test('iana-zone', 'Time zone must be an IANA name such as America/Los_Angeles', (v) => v === undefined || isValidTimeZone(v)),
  }),
);

export type HeadDaysRequest = yup.InferType<typeof headDaysRequestSchema>;

// ——— POST /api/calc/charge ———

export const MAX_FEES = 20;

const feeSchema = rejectUnknown(
  yup
    .object({
      label: str('Fee label')
        .test('not-blank', 'Fee label is required', (v) => v === undefined || v.trim() !== '')
        .max(80, 'Fee label must be at most 80 characters')
        .required('Fee label is required'),
      amountCents: num('Fee amount')
        .integer('Fee amount must be a whole number of cents')
        .min(0, 'Fee amount must be at least 0')
        .max(10_000_000_000, 'Fee amount must be at most $100,000,000.00')
        .required('Fee amount is required'),
    })
    .typeError('Each fee must have a label and an amount in cents'),
);

export const chargeRequestSchema = rejectUnknown(
  yup.object({
    basis: str('Basis')
      .oneOf([...CHARGE_BASES], 'Basis must be head-day, acre or flat')
      .required('Basis is required'),
    quantity: num('Quantity')
      .min(0, 'Quantity must be at least 0')
      .max(1_000_000_000, 'Quantity must be at most 1 000 000 000')
      .test('decimals', `Quantity must have at most ${QUANTITY_DECIMALS} decimals`, (v) => v === undefined || isValidQuantity(v))
      .when('basis', {
        is: 'flat',
        then: (s) => s.test('flat-one', 'A flat charge has a quantity of 1 (or leave it out)', (v) => v === undefined || v === 1),
        otherwise: (s) => s.required('Quantity is required'),
      }),
    rate: str('Rate')
      .matches(RATE_PATTERN, 'Rate must be a dollar amount like 0.18, with at most 6 decimals')
      .test('positive', 'Rate must be more than 0', (v) => v === undefined || !RATE_PATTERN.test(v) || /[1-9]/.test(v))
      .required('Rate is required'),
    feesCents: yup.array(feeSchema).typeError('Fees must be a list').max(MAX_FEES, `At most ${MAX_FEES} fees`).optional(),
  }),
);

export type ChargeRequest = yup.InferType<typeof chargeRequestSchema>;
