import fc from 'fast-check';
import { normaliseBid, stayDays, type BidTerms } from '../../lib/grazing/bid-compare';
import { intakeForFlock } from '../../lib/grazing/flock-intake';
import { utilizationForPlan } from '../../lib/grazing/capacity';
import { chargeLines } from '../../lib/money';
import { GrazingInputError } from '../../lib/grazing/errors';
import { addDays } from '../../lib/day-keys';

const block = { acres: 80, lbDmPerAcre: 2000, targetUtilizationPct: 45 };
const bid = (over: Partial<BidTerms> = {}): BidTerms => ({
  basis: 'head-day',
  rate: '0.18',
  headCount: 600,
  bodyWeightLb: 150,
  species: 'sheep',
  animalClass: 'dry ewes',
  startDate: '2027-01-10',
  endDate: '2027-01-28',
  ...over,
});

describe('normaliseBid worked examples', () => {
  it('When 600 dry ewes stay 18 days at $0.18 per head-day on 80 ac, then 10 800 head-days cost $1 944.00, $24.30 an acre', () => {
    const n = normaliseBid(bid(), block);
    expect(n).toMatchObject({ days: 18, headDays: 10_800, quantity: 10_800, estimatedTotalCents: 194_400, costPerAcreCents: 2_430, costPerHeadDayRate: '0.1800' });
    // Demand 10 800 × 150 lb × 2.5 % = 40 500 lb of 80 × 2 000 = 160 000 lb standing: 25.3125 %.
    expect(n.predictedUtilizationPct).toBeCloseTo(25.3125, 10);
    expect(n).toMatchObject({ intakePctBodyWeight: 2.5, targetUtilizationPct: 45, overgrazes: false });
  });

  it('When the bid is per acre on 80.25 ac at $22.50, then the total rounds half-up once: $1 805.625 → $1 805.63', () => {
    const n = normaliseBid(bid({ basis: 'acre', rate: '22.50' }), { ...block, acres: 80.25 });
    expect(n.quantity).toBe(80.25);
    expect(n.estimatedTotalCents).toBe(180_563);
    // 180 563 ¢ / 80.25 ac = 2 250.006… ¢; 180 563 ¢ / 10 800 head-days = $0.167187… → "0.1672".
    expect(n.costPerAcreCents).toBe(2_250);
    expect(n.costPerHeadDayRate).toBe('0.1672');
  });

  it('When the bid is a flat $4 200 for 600 ewes over 14 days on 36 ac of 1 800 lb, then it is $0.5000 a head-day and overgrazes a 40 % target', () => {
    const n = normaliseBid(bid({ basis: 'flat', rate: '4200', startDate: '2027-01-20', endDate: '2027-02-03' }), { acres: 36, lbDmPerAcre: 1800, targetUtilizationPct: 40 });
    expect(n).toMatchObject({ days: 14, headDays: 8_400, quantity: 1, estimatedTotalCents: 420_000, costPerHeadDayRate: '0.5000', costPerAcreCents: 11_667 });
    // 8 400 × 3.75 lb = 31 500 lb of 64 800 lb: 48.6 %.
    expect(n.predictedUtilizationPct).toBeCloseTo((31_500 / 64_800) * 100, 10);
    expect(n.overgrazes).toBe(true);
  });

  it('When the flock is goats or ewes with lambs, then intake follows ATTRA (4.5 %); weaned lambs use the 3 % preset', () => {
    expect(normaliseBid(bid({ species: 'goats', animalClass: 'wethers', bodyWeightLb: 120 }), block).intakePctBodyWeight).toBe(4.5);
    expect(normaliseBid(bid({ animalClass: 'ewes with lambs' }), block).intakePctBodyWeight).toBe(4.5);
    expect(intakeForFlock('sheep', 'weaned lambs').pct).toBe(3);
    expect(intakeForFlock('mixed', 'mixed')).toMatchObject({ pct: 4.5, basis: 'goat' });
  });

  it('When the end is not after the start, then the stay is refused at endDate', () => {
    expect(() => stayDays('2027-01-10', '2027-01-10')).toThrow(GrazingInputError);
    expect(() => normaliseBid(bid({ endDate: '2027-01-09' }), block)).toThrow(/after the start/);
  });
});

describe('normaliseBid properties', () => {
  const micros = fc.integer({ min: 1, max: 50_000_000 }); // $0.000001 … $50
  const rateOf = (m: number) => `${Math.floor(m / 1e6)}.${String(m % 1e6).padStart(6, '0')}`;
  const acres = fc.integer({ min: 1, max: 2_000_000 }).map((u) => u / 100); // 0.01 … 20 000 ac
  const stay = fc.record({ headCount: fc.integer({ min: 1, max: 20_000 }), days: fc.integer({ min: 1, max: 180 }) });

  it('head-days are head × days; the total is the calculator\'s; total ÷ head-days gives back the rate within rounding', () => {
    fc.assert(
      fc.property(micros, acres, stay, (m, a, s) => {
        const rate = rateOf(m);
        const n = normaliseBid(bid({ rate, headCount: s.headCount, endDate: addDays('2027-01-10', s.days) }), { ...block, acres: a });
        expect(n.headDays).toBe(s.headCount * s.days);
        expect(n.estimatedTotalCents).toBe(chargeLines({ basis: 'head-day', quantity: n.headDays, rate }).totalCents);
        // The total is within half a cent of head-days × rate …
        expect(Math.abs(n.estimatedTotalCents / 100 - n.headDays * (m / 1e6))).toBeLessThanOrEqual(0.005 + 1e-9 * n.estimatedTotalCents);
        // … and the per-head-day figure, 4 decimals, times head-days is within rounding of the total.
        expect(Math.abs(Number(n.costPerHeadDayRate) * n.headDays - n.estimatedTotalCents / 100)).toBeLessThanOrEqual(0.00005 * n.headDays + 1e-6 * n.estimatedTotalCents + 1e-9);
        expect(Math.abs(n.costPerAcreCents * a - n.estimatedTotalCents)).toBeLessThanOrEqual(0.5 * a + 1e-6 * n.estimatedTotalCents);
      }),
    );
  });

  it('per-acre and flat totals are acres × rate and the rate; utilisation is lib\'s utilizationForPlan and overgrazes above target', () => {
    fc.assert(
      fc.property(micros, acres, stay, fc.integer({ min: 1, max: 100 }), (m, a, s, target) => {
        const rate = rateOf(m);
        const terms = { headCount: s.headCount, endDate: addDays('2027-01-10', s.days), rate };
        const perAcre = normaliseBid(bid({ ...terms, basis: 'acre' }), { ...block, acres: a, targetUtilizationPct: target });
        expect(Math.abs(perAcre.estimatedTotalCents / 100 - a * (m / 1e6))).toBeLessThanOrEqual(0.005 + 1e-9 * perAcre.estimatedTotalCents);
        const flat = normaliseBid(bid({ ...terms, basis: 'flat' }), { ...block, acres: a });
        // m micro-dollars is m / 10 000 cents, rounded half-up (integer arithmetic, exact in a double here).
        expect(flat).toMatchObject({ quantity: 1, estimatedTotalCents: Math.floor((m + 5_000) / 10_000) });
        const u = utilizationForPlan({ acres: a, lbDmPerAcre: block.lbDmPerAcre, headCount: s.headCount, days: s.days, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } });
        expect(perAcre.predictedUtilizationPct).toBe(u);
        expect(perAcre.overgrazes).toBe(u > target);
      }),
    );
  });
});
