import fc from 'fast-check';
import {
  ANIMAL_CLASSES,
  AU_CONVENTION,
  INTAKE_RULES_OF_THUMB,
  capacity,
  dailyIntakeLb,
  daysForHead,
  headForDays,
  utilizationForPlan,
} from '../../lib/grazing/capacity';
import { GrazingInputError } from '../../lib/grazing/errors';
import { kgToLb, lbToKg } from '../../lib/units';

// Ranges of the calculator's request schema.
const animal = fc.record({
  bodyWeightLb: fc.double({ min: 10, max: 2500, noNaN: true }),
  intakePctBodyWeight: fc.double({ min: 0.5, max: 6, noNaN: true }),
});
const acres = fc.double({ min: 0.01, max: 10_000, noNaN: true });
const lbDm = fc.double({ min: 0, max: 30_000, noNaN: true });
const util = fc.double({ min: 0.1, max: 100, noNaN: true });

describe('animal-unit convention', () => {
  it('1 AU is a 1 000 lb cow eating 26 lb DM a day; 1 AUM = 780 lb', () => {
    // Society for Range Management, Glossary of Terms Used in Range Management, 4th ed., 1998:
    // animal unit = 1 000 lb cow, ~26 lb oven-dry forage/day (2.6 % of body weight).
    // eXtension "Animal units" (2015), citing the NRCS National Range and Pasture Handbook: AUM = 26 × 30 = 780 lb.
    expect(AU_CONVENTION.lbDmPerAuDay).toBe(26);
    expect(AU_CONVENTION.daysPerAum).toBe(30);
    const cow = { bodyWeightLb: 1000, intakePctBodyWeight: 2.6 };
    expect(dailyIntakeLb(cow)).toBeCloseTo(26, 12);
    // A block whose allowable take is exactly 780 lb feeds one AU for 30 days: 1 AUM.
    const r = capacity({ acres: 1, lbDmPerAcre: 1560, utilizationPct: 50, animal: cow });
    expect(r.allowableLb).toBeCloseTo(780, 10);
    expect(r.headDays).toBeCloseTo(30, 10);
    expect(r.animalUnitDays).toBeCloseTo(30, 10);
    expect(r.aum).toBeCloseTo(1, 12);
  });

  it('lists the NRCS animal-unit equivalents for sheep and goats', () => {
    // NRCS National Range and Pasture Handbook, as tabled by eXtension "Animal units" (2015):
    // mature sheep 0.20, yearling lamb 0.15, mature goat 0.15, kid 0.10.
    const au = Object.fromEntries(ANIMAL_CLASSES.map((c) => [c.id, c.auEquivalent]));
    expect(au['ewe-dry']).toBe(0.2);
    expect(au['yearling-lamb']).toBe(0.15);
    expect(au['goat-mature']).toBe(0.15);
    expect(au['goat-kid']).toBe(0.1);
    for (const c of ANIMAL_CLASSES) {
      expect(c.auSource.length).toBeGreaterThan(10);
      expect(c.bodyWeightSource.length).toBeGreaterThan(10);
      expect(c.intake.source.length).toBeGreaterThan(10);
      expect(c.intake.pct).toBeGreaterThanOrEqual(c.intake.min);
      expect(c.intake.pct).toBeLessThanOrEqual(c.intake.max);
    }
  });

  it('carries the ATTRA intake rules of thumb', () => {
    // NCAT ATTRA, "Grazier's Math: Matching Forage to Animal Demand": dry ewes 2.5 %, lactating ewes 4.5 %,
    // goats 4–5 % of body weight.
    expect(INTAKE_RULES_OF_THUMB.dryEwe.pct).toBe(2.5);
    expect(INTAKE_RULES_OF_THUMB.lactatingEwe.pct).toBe(4.5);
    expect([INTAKE_RULES_OF_THUMB.goat.min, INTAKE_RULES_OF_THUMB.goat.max]).toEqual([4, 5]);
  });
});

describe('daily intake', () => {
  it('ATTRA: a 1 050 lb cow at 3 % eats 31.5 lb a day', () => {
    // NCAT ATTRA, "Grazier's Math: Matching Forage to Animal Demand" (worked example).
    expect(dailyIntakeLb({ bodyWeightLb: 1050, intakePctBodyWeight: 3 })).toBeCloseTo(31.5, 12);
  });

  it('NRC 1985 maintenance ewes as intake inputs: 50 kg → 1.0 kg DM/day, 70 kg → 1.2 kg', () => {
    // NRC, Nutrient Requirements of Sheep, 6th ed., 1985 (maintenance rows): 50 kg ewe 1.0 kg DM/day
    // (2.0 % BW); 70 kg ewe 1.2 kg DM/day (1.7 % BW; 1.2 / 70 = 1.71 %).
    const ewe50 = { bodyWeightLb: kgToLb(50), intakePctBodyWeight: 2.0 };
    expect(lbToKg(dailyIntakeLb(ewe50))).toBeCloseTo(1.0, 12);
    const pct70 = (1.2 / 70) * 100;
    expect(pct70).toBeCloseTo(1.7, 1);
    const ewe70 = { bodyWeightLb: kgToLb(70), intakePctBodyWeight: pct70 };
    expect(lbToKg(dailyIntakeLb(ewe70))).toBeCloseTo(1.2, 12);
    // Used in a capacity question: 1 000 kg DM allowable feeds a 50 kg ewe for 1 000 head-days.
    const r = capacity({ acres: 1, lbDmPerAcre: kgToLb(2000), utilizationPct: 50, animal: ewe50 });
    expect(r.headDays).toBeCloseTo(1000, 9);
  });
});

describe('capacity', () => {
  it('worked example (invented numbers, for illustration only)', () => {
    // Invented: 20 ac of winter cover at 1 500 lb DM/ac, take half, 150 lb dry ewes at 2.5 % (ATTRA).
    // standing 30 000 lb; allowable 15 000 lb; intake 3.75 lb/head/day; 4 000 head-days;
    // AUD = 15 000 / 26 = 576.923…; AUM = AUD / 30 = 19.230…
    const r = capacity({ acres: 20, lbDmPerAcre: 1500, utilizationPct: 50, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } });
    expect(r.standingLb).toBe(30_000);
    expect(r.allowableLb).toBe(15_000);
    expect(r.dailyIntakeLbPerHead).toBeCloseTo(3.75, 12);
    expect(r.headDays).toBeCloseTo(4000, 9);
    expect(r.animalUnitDays).toBeCloseTo(15_000 / 26, 9);
    expect(r.aum).toBeCloseTo(15_000 / 26 / 30, 9);
    // 200 ewes can stay 20 days; for a 30-day stay the feed carries 133 ewes, not 133.3.
    expect(daysForHead(r.headDays, 200)).toBeCloseTo(20, 9);
    expect(headForDays(r.headDays, 30)).toBe(133);
    expect(headForDays(r.headDays, 20)).toBe(200);
    // The same 200 ewes for 20 days use exactly the 50 % planned; 25 days would take 62.5 %.
    const plan = { acres: 20, lbDmPerAcre: 1500, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } };
    expect(utilizationForPlan({ ...plan, headCount: 200, days: 20 })).toBeCloseTo(50, 9);
    expect(utilizationForPlan({ ...plan, headCount: 200, days: 25 })).toBeCloseTo(62.5, 9);
  });

  it('is linear in acres (property)', () => {
    fc.assert(
      fc.property(acres, lbDm, util, animal, fc.integer({ min: 1, max: 50 }), (a, lb, u, an, k) => {
        const one = capacity({ acres: a, lbDmPerAcre: lb, utilizationPct: u, animal: an });
        const many = capacity({ acres: a * k, lbDmPerAcre: lb, utilizationPct: u, animal: an });
        expect(Math.abs(many.headDays - one.headDays * k)).toBeLessThanOrEqual(1e-12 * Math.max(1, many.headDays));
        expect(Math.abs(many.aum - one.aum * k)).toBeLessThanOrEqual(1e-12 * Math.max(1, many.aum));
      }),
    );
  });

  it('is linear in utilisation (property)', () => {
    fc.assert(
      fc.property(acres, lbDm, fc.double({ min: 0.1, max: 50, noNaN: true }), animal, (a, lb, u, an) => {
        const half = capacity({ acres: a, lbDmPerAcre: lb, utilizationPct: u, animal: an });
        const full = capacity({ acres: a, lbDmPerAcre: lb, utilizationPct: u * 2, animal: an });
        expect(Math.abs(full.headDays - 2 * half.headDays)).toBeLessThanOrEqual(1e-12 * Math.max(1, full.headDays));
        expect(Math.abs(full.allowableLb - 2 * half.allowableLb)).toBeLessThanOrEqual(1e-12 * Math.max(1, full.allowableLb));
      }),
    );
  });

  it('AUD equals allowable ÷ 26 whatever the animal (property)', () => {
    fc.assert(
      fc.property(acres, lbDm, util, animal, (a, lb, u, an) => {
        const r = capacity({ acres: a, lbDmPerAcre: lb, utilizationPct: u, animal: an });
        expect(Math.abs(r.animalUnitDays - r.allowableLb / 26)).toBeLessThanOrEqual(1e-12 * Math.max(1, r.animalUnitDays));
      }),
    );
  });

  it('refuses nonsense inputs with the field named', () => {
    const animal150 = { bodyWeightLb: 150, intakePctBodyWeight: 2.5 };
    expect(() => capacity({ acres: 0, lbDmPerAcre: 1, utilizationPct: 50, animal: animal150 })).toThrow(expect.objectContaining({ field: 'acres' }));
    expect(() => capacity({ acres: 1, lbDmPerAcre: 1, utilizationPct: 101, animal: animal150 })).toThrow(expect.objectContaining({ field: 'utilizationPct' }));
    expect(() => capacity({ acres: 1, lbDmPerAcre: 1, utilizationPct: 50, animal: { bodyWeightLb: 0, intakePctBodyWeight: 2 } })).toThrow(GrazingInputError);
  });
});

describe('head for days / days for head', () => {
  it('never promises more head than the feed carries, and no fewer than it could (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e7, noNaN: true }), fc.double({ min: 0.01, max: 365, noNaN: true }), (hd, days) => {
        const head = headForDays(hd, days);
        expect(Number.isInteger(head)).toBe(true);
        // Within the 1e-9 float tolerance documented in capacity.ts.
        expect(head * days).toBeLessThanOrEqual(hd * (1 + 1e-9) + 1e-9);
        expect((head + 1) * days).toBeGreaterThan(hd);
      }),
    );
  });

  it('does not lose a head to float noise on an exact quotient', () => {
    // 0.1 × 3 = 0.30000000000000004 in floating point; 0.3 / 0.1 = 2.9999999999999996.
    expect(headForDays(0.3, 0.1)).toBe(3);
    expect(headForDays(29.999, 10)).toBe(2);
  });

  it('days for head is head-days ÷ head (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e7, noNaN: true }), fc.integer({ min: 1, max: 20_000 }), (hd, n) => {
        expect(daysForHead(hd, n) * n).toBeCloseTo(hd, 4);
      }),
    );
  });

  it('utilisation of a plan with no standing forage is infinite, or 0 with no animals', () => {
    const base = { acres: 5, lbDmPerAcre: 0, animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 } };
    expect(utilizationForPlan({ ...base, headCount: 10, days: 1 })).toBe(Number.POSITIVE_INFINITY);
    expect(utilizationForPlan({ ...base, headCount: 0, days: 10 })).toBe(0);
  });

  it('a stay sized by headForDays never exceeds the planned utilisation (property)', () => {
    fc.assert(
      fc.property(acres, fc.double({ min: 1, max: 30_000, noNaN: true }), util, animal, fc.integer({ min: 1, max: 120 }), (a, lb, u, an, days) => {
        const cap = capacity({ acres: a, lbDmPerAcre: lb, utilizationPct: u, animal: an });
        const head = headForDays(cap.headDays, days);
        const predicted = utilizationForPlan({ acres: a, lbDmPerAcre: lb, headCount: head, days, animal: an });
        expect(predicted).toBeLessThanOrEqual(u * (1 + 1e-9));
      }),
    );
  });
});
