import { ValidationError, type AnyObjectSchema } from 'yup';
import { forageFromSamples, type ForageFromSamplesInput } from '../../lib/grazing/forage';
import { capacity, type CapacityInput } from '../../lib/grazing/capacity';
import { headDaysFromMoves, type HeadDaysInput } from '../../lib/grazing/head-days';
import { chargeLines, type ChargeInput } from '../../lib/money';
import {
  capacityRequestSchema,
  chargeRequestSchema,
  forageRequestSchema,
  headDaysRequestSchema,
  MAX_SPAN_DAYS,
  type CapacityRequest,
  type ChargeRequest,
  type ForageRequest,
  type HeadDaysRequest,
} from '../../lib/schemas/calc';

/** Validates the way the server does, and returns { path: message } for every error (empty when valid). */
async function errorsOf(schema: AnyObjectSchema, body: unknown, stripUnknown = false): Promise<Record<string, string>> {
  try {
    // A fresh options object each call: yup 1.7 writes into the one it is given.
    await schema.validate(body, { abortEarly: false, stripUnknown });
    return {};
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err;
    const fields: Record<string, string> = {};
    for (const e of err.inner.length ? err.inner : [err]) fields[e.path ?? ''] ??= e.message;
    return fields;
  }
}

describe('forageRequestSchema', () => {
  const valid = { frameAreaM2: 0.25, samples: [{ freshGrams: 120, dryMatterPct: 22 }, { dryGrams: 31 }] };

  it('accepts both kinds of sample, and its type feeds forageFromSamples', async () => {
    const body: ForageRequest = await forageRequestSchema.validate(valid, { abortEarly: false });
    const input: ForageFromSamplesInput = body;
    expect(forageFromSamples(input).sampleCount).toBe(2);
    expect(body).toEqual(valid);
  });

  it('names every bad field', async () => {
    const errors = await errorsOf(forageRequestSchema, {
      frameAreaM2: 0,
      samples: [{ freshGrams: 120, dryMatterPct: 0 }, { dryGrams: -1 }, { freshGrams: 10 }, { dryGrams: 3, freshGrams: 9 }, 'x'],
    });
    expect(errors).toEqual({
      frameAreaM2: 'Frame area must be more than 0 m²',
      'samples[0].dryMatterPct': 'Dry matter must be more than 0 %',
      'samples[1].dryGrams': 'Dry weight must be at least 0 g',
      'samples[2].dryMatterPct': 'Dry matter % is required with a fresh weight',
      'samples[3].freshGrams': 'Give a dry weight, or a fresh weight with its dry matter % — not both',
      'samples[4]': 'Each sample must have a fresh weight with its dry matter %, or a dry weight',
    });
  });

  it('refuses an empty list, a frame over 10 m² and DM over 100 %', async () => {
    expect(await errorsOf(forageRequestSchema, { frameAreaM2: 11, samples: [] })).toEqual({
      frameAreaM2: 'Frame area must be at most 10 m²',
      samples: 'Add at least one clipped sample',
    });
    expect(await errorsOf(forageRequestSchema, { frameAreaM2: 1, samples: [{ freshGrams: 1, dryMatterPct: 100.5 }] })).toEqual({
      'samples[0].dryMatterPct': 'Dry matter must be at most 100 %',
    });
  });

  it('refuses numbers sent as strings instead of coercing them', async () => {
    expect(await errorsOf(forageRequestSchema, { frameAreaM2: '0.25', samples: [{ dryGrams: '31' }] })).toEqual({
      frameAreaM2: 'Frame area must be a number',
      'samples[0].dryGrams': 'Dry weight must be a number',
    });
  });

  it('refuses both kinds in one sample even when unknown fields are being stripped', async () => {
    expect(await errorsOf(forageRequestSchema, { frameAreaM2: 1, samples: [{ dryGrams: 3, dryMatterPct: 20 }] }, true)).toEqual({
      'samples[0].dryMatterPct': 'Give a dry weight, or a fresh weight with its dry matter % — not both',
    });
  });
});

describe('capacityRequestSchema', () => {
  const valid = { acres: 20, lbDmPerAcre: 1500, utilizationPct: 50, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } };

  it('accepts a valid body whose type feeds capacity()', async () => {
    const body: CapacityRequest = await capacityRequestSchema.validate(valid, { abortEarly: false });
    const input: CapacityInput = body;
    expect(capacity(input).standingLb).toBe(30_000);
  });

  it('names every out-of-range field in words', async () => {
    const errors = await errorsOf(capacityRequestSchema, {
      acres: 0,
      lbDmPerAcre: 30_001,
      utilizationPct: 0,
      animal: { bodyWeightLb: 5, intakePctBodyWeight: 7 },
    });
    expect(errors).toEqual({
      acres: 'Acres must be more than 0',
      lbDmPerAcre: 'Forage per acre must be at most 30 000 lb DM',
      utilizationPct: 'Utilisation must be more than 0 %',
      'animal.bodyWeightLb': 'Body weight must be at least 10 lb',
      'animal.intakePctBodyWeight': 'Intake must be at most 6 % of body weight',
    });
  });

  it('reports missing fields, strings for numbers, and unknown fields', async () => {
    expect(await errorsOf(capacityRequestSchema, { acres: '12', utilizationPct: 101, utilisationPct: 50 })).toEqual({
      acres: 'Acres must be a number',
      lbDmPerAcre: 'Forage per acre (lb DM) is required',
      utilizationPct: 'Utilisation must be at most 100 %',
      // A missing object is validated as {} (yup's object default), so the form learns which inputs to fill.
      'animal.bodyWeightLb': 'Body weight is required',
      'animal.intakePctBodyWeight': 'Intake (% of body weight) is required',
      utilisationPct: 'Unknown field: utilisationPct',
    });
    expect(await errorsOf(capacityRequestSchema, { ...valid, animal: null })).toEqual({ animal: 'Animal body weight and intake are required' });
    expect(await errorsOf(capacityRequestSchema, { ...valid, animal: { ...valid.animal, breed: 'Dorper' } })).toEqual({
      'animal.breed': 'Unknown field: breed',
    });
  });

  it('with stripUnknown the server gets the body without the stray field', async () => {
    const body = await capacityRequestSchema.validate({ ...valid, note: 'hi' }, { abortEarly: false, stripUnknown: true });
    expect(body).toEqual(valid);
  });
});

describe('headDaysRequestSchema', () => {
  const valid = {
    moves: [
      { at: '2027-03-08T00:00:00-08:00', change: 600 },
      { at: '2027-03-10T12:00:00-08:00', change: -100 },
    ],
    until: '2027-03-15T00:00:00-07:00',
    timeZone: 'America/Los_Angeles',
  };

  it('accepts a valid body whose type feeds headDaysFromMoves', async () => {
    const body: HeadDaysRequest = await headDaysRequestSchema.validate(valid, { abortEarly: false });
    const input: HeadDaysInput = body;
    expect(headDaysFromMoves(input).byDay).toHaveLength(7);
    expect(await errorsOf(headDaysRequestSchema, { moves: valid.moves, until: valid.until })).toEqual({});
  });

  it('points at the move that breaks time order', async () => {
    const errors = await errorsOf(headDaysRequestSchema, {
      moves: [
        { at: '2027-03-08T00:00:00Z', change: 10 },
        { at: '2027-03-09T00:00:00Z', change: 5 },
        { at: '2027-03-08T12:00:00Z', change: 5 },
      ],
      until: '2027-03-10T00:00:00Z',
    });
    expect(errors).toEqual({ 'moves[2].at': 'Moves must be in time order: this move is earlier than the one before it' });
  });

  it('points at the change that would take the count below zero', async () => {
    const errors = await errorsOf(headDaysRequestSchema, {
      moves: [
        { at: '2027-03-08T00:00:00Z', change: 10 },
        { at: '2027-03-09T00:00:00Z', change: -4 },
        { at: '2027-03-09T06:00:00Z', change: -7 },
      ],
      until: '2027-03-10T00:00:00Z',
    });
    expect(errors).toEqual({ 'moves[2].change': 'This move takes out more animals than are on the block (6)' });
  });

  it('refuses bad instants, zero or fractional changes, an early end and an unknown zone', async () => {
    const errors = await errorsOf(headDaysRequestSchema, {
      moves: [
        { at: '2027-03-08T00:00:00', change: 10 },
        { at: '2027-03-09T00:00:00Z', change: 0 },
        { at: '2027-03-09T06:00:00Z', change: 2.5 },
      ],
      until: '2027-03-09T00:00:00Z',
      timeZone: 'Pacific/Nowhere',
    });
    expect(errors).toEqual({
      'moves[0].at': 'Move time must be a date and time with a UTC offset, like 2027-03-08T07:30:00-08:00',
      'moves[1].change': 'Change must not be 0: give +n animals in or −n out',
      'moves[2].change': 'Change must be a whole number of animals',
      until: 'End time must not be before the last move',
      timeZone: 'Time zone must be an IANA name such as America/Los_Angeles',
    });
    expect(await errorsOf(headDaysRequestSchema, { moves: [], until: '2027-03-09T00:00:00Z' })).toEqual({ moves: 'Add at least one move' });
  });

  it('counts up to MAX_SPAN_DAYS from the first move and refuses a longer span, whose work would grow without bound', async () => {
    const first = '2027-01-01T00:00:00Z';
    const moves = [{ at: first, change: 5 }];
    const dayAfterSpan = new Date(Date.parse(first) + (MAX_SPAN_DAYS * 86_400_000 + 1)).toISOString();
    expect(await errorsOf(headDaysRequestSchema, { moves, until: new Date(Date.parse(first) + MAX_SPAN_DAYS * 86_400_000).toISOString() })).toEqual({});
    expect(await errorsOf(headDaysRequestSchema, { moves, until: dayAfterSpan })).toEqual({ until: `End time must be at most ${MAX_SPAN_DAYS} days after the first move` });
    // Year 1 to year 9999 was 3.65 million days of work for one unauthenticated request.
    expect(await errorsOf(headDaysRequestSchema, { moves: [{ at: '0001-01-01T00:00:00Z', change: 5 }], until: '9999-12-31T00:00:00Z' })).toEqual({
      until: `End time must be at most ${MAX_SPAN_DAYS} days after the first move`,
    });
  });

  it('refuses a misspelt optional field rather than silently using UTC', async () => {
    expect(await errorsOf(headDaysRequestSchema, { moves: valid.moves, until: valid.until, timezone: 'America/Los_Angeles' })).toEqual({
      timezone: 'Unknown field: timezone',
    });
  });
});

describe('chargeRequestSchema', () => {
  it('accepts head-day, acre and flat bodies whose type feeds chargeLines', async () => {
    for (const valid of [
      { basis: 'head-day', quantity: 1234.5, rate: '0.1875', feesCents: [{ label: 'Hauling', amountCents: 25_000 }] },
      { basis: 'acre', quantity: 80.25, rate: '35' },
      { basis: 'flat', rate: '1500.00' },
    ]) {
      const body: ChargeRequest = await chargeRequestSchema.validate(valid, { abortEarly: false });
      const input: ChargeInput = body;
      expect(chargeLines(input).totalCents).toBeGreaterThan(0);
    }
  });

  it('names every bad field', async () => {
    const errors = await errorsOf(chargeRequestSchema, {
      basis: 'per-sheep',
      quantity: 1.23456,
      rate: '0.1234567',
      feesCents: [{ label: ' ', amountCents: 10.5 }, { label: 'Water', amountCents: -1 }],
    });
    expect(errors).toEqual({
      basis: 'Basis must be head-day, acre or flat',
      quantity: 'Quantity must have at most 4 decimals',
      rate: 'Rate must be a dollar amount like 0.18, with at most 6 decimals',
      'feesCents[0].label': 'Fee label is required',
      'feesCents[0].amountCents': 'Fee amount must be a whole number of cents',
      'feesCents[1].amountCents': 'Fee amount must be at least 0',
    });
  });

  it('requires a quantity except for a flat charge, where it can only be 1', async () => {
    expect(await errorsOf(chargeRequestSchema, { basis: 'acre', rate: '35' })).toEqual({ quantity: 'Quantity is required' });
    expect(await errorsOf(chargeRequestSchema, { basis: 'flat', quantity: 3, rate: '35' })).toEqual({
      quantity: 'A flat charge has a quantity of 1 (or leave it out)',
    });
  });

  it('refuses a zero rate, a number for the rate, and a string for the quantity', async () => {
    expect(await errorsOf(chargeRequestSchema, { basis: 'head-day', quantity: '10', rate: 0.18 })).toEqual({
      quantity: 'Quantity must be a number',
      rate: 'Rate must be text',
    });
    expect(await errorsOf(chargeRequestSchema, { basis: 'head-day', quantity: 10, rate: '0.000' })).toEqual({ rate: 'Rate must be more than 0' });
  });
});
