import { ValidationError } from 'yup';
import { blockInputSchema, blockListQuerySchema } from '../../lib/schemas/block';
import { bidInputSchema } from '../../lib/schemas/bid';
import { forageFromHeight, forageFromSamples } from '../../lib/grazing/forage';
import { blockLbDmPerAcre } from '../../lib/grazing/block-forage';
import { isDayKey, daysBetween } from '../../lib/day-keys';

/** Field → message for a value the schema refuses; {} when it passes. */
async function errorsOf(schema: { validate: (v: unknown, o: object) => Promise<unknown> }, value: unknown): Promise<Record<string, string>> {
  try {
    await schema.validate(value, { abortEarly: false, stripUnknown: false });
    return {};
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err;
    return Object.fromEntries(err.inner.map((e) => [e.path ?? '', e.message]));
  }
}

const block = {
  name: 'North bench',
  crop: 'orchard',
  acres: 80,
  latitude: 39.72,
  longitude: -121.93,
  forageMethod: 'direct',
  lbDmPerAcre: 2000,
  targetUtilizationPct: 45,
  windowStart: '2027-01-04',
  windowEnd: '2027-03-05',
  outBy: '2027-03-01',
  waterOnSite: true,
  perimeterFence: 'partial',
  truckAccess: true,
  speciesAllowed: ['sheep'],
  youngPlantings: false,
};

describe('calendar days', () => {
  it('accepts real days only, leap years included, and counts whole days between them', () => {
    expect(['2027-02-28', '2028-02-29', '2000-02-29'].every(isDayKey)).toBe(true);
    expect(['2027-02-29', '1900-02-29', '2027-13-01', '2027-1-5', '27-01-05', 20270105].some(isDayKey)).toBe(false);
    expect(daysBetween('2027-01-10', '2027-01-28')).toBe(18);
    expect(daysBetween('2027-03-13', '2027-03-15')).toBe(2); // across the US spring-forward weekend: still 2 days
    expect(daysBetween('2026-12-31', '2028-01-01')).toBe(366);
  });
});

describe('blockInputSchema', () => {
  it('When the block is complete, then it passes', async () => {
    expect(await errorsOf(blockInputSchema, block)).toEqual({});
  });

  it('When dates are out of order or not real, numbers are text, or acres negative, then each field is named', async () => {
    const errors = await errorsOf(blockInputSchema, { ...block, acres: -5, windowEnd: '2027-01-01', outBy: '2027-02-30', targetUtilizationPct: '45', harvestDate: '2207-09-01' });
    expect(errors).toEqual({
      acres: 'Acres must be more than 0',
      windowEnd: 'Latest out must be after the earliest-in date',
      outBy: 'Animals out by must be a real date like 2027-01-15',
      targetUtilizationPct: 'Target utilisation must be a number',
      harvestDate: 'Harvest date must be between 2000 and 2100',
    });
  });

  it('When out-by is on or before the window opens or not before harvest, then outBy is named; out-by before window end is fine', async () => {
    expect((await errorsOf(blockInputSchema, { ...block, outBy: '2027-01-04' })).outBy).toMatch(/after the earliest-in/);
    expect((await errorsOf(blockInputSchema, { ...block, harvestDate: '2027-03-01' })).outBy).toMatch(/before the harvest date/);
    expect(await errorsOf(blockInputSchema, { ...block, outBy: '2027-02-01', harvestDate: '2027-08-01' })).toEqual({});
  });

  it('When a field is misspelt, then it is named at its own path, also inside spray records', async () => {
    const errors = await errorsOf(blockInputSchema, {
      ...block,
      acrez: 3,
      sprayRecords: [{ product: 'P', appliedOn: '2026-12-01', grazingRestrictionDays: 14.5, containsCopper: false, lable: 'x' }],
    });
    expect(errors).toEqual({
      acrez: 'Unknown field: acrez',
      'sprayRecords[0].lable': 'Unknown field: lable',
      'sprayRecords[0].grazingRestrictionDays': 'Grazing restriction must be a whole number',
    });
  });

  it('When the forage method is samples or height, then lbDmPerAcre must be left out and the figure comes from lib', async () => {
    const samples = { frameAreaM2: 0.25, samples: [{ dryGrams: 52 }, { freshGrams: 240, dryMatterPct: 22 }] };
    const { lbDmPerAcre: _, ...noFigure } = block;
    expect((await errorsOf(blockInputSchema, { ...block, forageMethod: 'samples', forageSamples: samples })).lbDmPerAcre).toMatch(/Leave this out/);
    expect(await errorsOf(blockInputSchema, { ...noFigure, forageMethod: 'samples', forageSamples: samples })).toEqual({});
    expect(blockLbDmPerAcre({ forageMethod: 'samples', forageSamples: samples })).toBe(forageFromSamples(samples).lbDmPerAcre);
    const height = { heightIn: 8, residualIn: 3, lbDmPerAcrePerInch: 275 };
    expect(blockLbDmPerAcre({ forageMethod: 'height', forageHeight: height })).toBe(forageFromHeight(height).lbDmPerAcre);
    expect((await errorsOf(blockInputSchema, { ...noFigure, forageMethod: 'height' })).forageHeight).toMatch(/stand height/);
    expect((await errorsOf(blockInputSchema, { ...noFigure, forageMethod: 'height', forageHeight: { ...height, heightIn: 2 } })).forageHeight).toMatch(/no grazeable forage/);
  });

  it('When species are empty or repeated, then speciesAllowed is named', async () => {
    expect((await errorsOf(blockInputSchema, { ...block, speciesAllowed: [] })).speciesAllowed).toMatch(/at least one species/);
    expect((await errorsOf(blockInputSchema, { ...block, speciesAllowed: ['sheep', 'sheep'] })).speciesAllowed).toMatch(/once/);
    expect((await errorsOf(blockInputSchema, { ...block, speciesAllowed: ['cattle'] }))['speciesAllowed[0]']).toMatch(/sheep or goats/);
  });
});

describe('bidInputSchema', () => {
  const bid = { basis: 'head-day', rate: '0.18', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: '2027-01-10', endDate: '2027-01-28' };

  it('When the bid is complete, then it passes', async () => {
    expect(await errorsOf(bidInputSchema, { ...bid, services: ['fencing', 'guardian dogs'], note: null })).toEqual({});
  });

  it('When the rate is a number or zero, the end is before the start, or a service is unknown, then each is named', async () => {
    expect(await errorsOf(bidInputSchema, { ...bid, rate: 0.18, endDate: '2027-01-10', headCount: 600.5, services: ['shearing'] })).toEqual({
      rate: 'Rate must be text like "0.18" (dollars)',
      endDate: 'End date must be after the start date',
      headCount: 'Head count must be a whole number',
      'services[0]': 'Service must be one of: fencing, water hauling, herding, guardian dogs',
    });
    expect((await errorsOf(bidInputSchema, { ...bid, rate: '0.00' })).rate).toBe('Rate must be more than 0');
    expect((await errorsOf(bidInputSchema, { ...bid, rate: '1000000.000001' })).rate).toBe('Rate must be at most $1,000,000');
    expect(await errorsOf(bidInputSchema, { ...bid, basis: 'flat', rate: '1000000' })).toEqual({});
  });
});

describe('blockListQuerySchema', () => {
  it('When numbers come as query text, then they are read; junk, negatives and too-large pages are refused by name', async () => {
    expect(await blockListQuerySchema.validate({ maxMiles: '25', page: '2', pageSize: '10' })).toEqual({ maxMiles: 25, page: 2, pageSize: 10 });
    expect(await errorsOf(blockListQuerySchema, { maxMiles: '25mi', page: '0', pageSize: '51', minAcres: '-3', to: '2027-01-01', from: '2027-02-01', zoom: '3' })).toEqual({
      maxMiles: 'Maximum distance must be a number',
      page: 'Page must be 1 or more',
      pageSize: 'Page size must be at most 50',
      minAcres: 'Minimum acres must be a number',
      to: 'To must be on or after From',
      zoom: 'Unknown field: zoom',
    });
  });
});
