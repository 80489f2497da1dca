import fc from 'fast-check';
import { forageFromHeight, forageFromSamples, sampleDryGrams, STAND_HEIGHT_FACTORS } from '../../lib/grazing/forage';
import { GrazingInputError } from '../../lib/grazing/errors';
import { ft2ToM2 } from '../../lib/units';

const ONE_FT2_M2 = ft2ToM2(1);

describe('clip-and-weigh factors', () => {
  it('1 ft² frame: grams × 96 ≈ lb DM/ac (exact factor 96.03)', () => {
    // Rounded published factor ×96 for a 1 ft² frame, quoted in TRADE.md ("Clip-and-weigh forage estimates")
    // beside USDA-NRCS Idaho, Technical Note Range No. 3, "Estimating Initial Stocking Rates", 2009;
    // exact 43 560 / 453.592 37 = 96.033.
    const r = forageFromSamples({ frameAreaM2: ONE_FT2_M2, samples: [{ dryGrams: 1 }] });
    expect(r.lbDmPerAcre).toBeCloseTo(96.03, 2);
    expect(Math.abs(r.lbDmPerAcre / 96 - 1)).toBeLessThan(0.001);
    // The exact arithmetic from the definitions, independently of lib/units.
    expect(r.lbDmPerAcre).toBeCloseTo(43560 / 453.59237, 10);
  });

  it('9.6 ft² hoop: grams × 10 ≈ lb DM/ac', () => {
    // USDA-NRCS Idaho, Technical Note Range No. 3, "Estimating Initial Stocking Rates", 2009.
    const grams = 123.4;
    const r = forageFromSamples({ frameAreaM2: ft2ToM2(9.6), samples: [{ dryGrams: grams }] });
    expect(r.lbDmPerAcre).toBeCloseTo((grams * 43560) / 453.59237 / 9.6, 8);
    expect(Math.abs(r.lbDmPerAcre / (grams * 10) - 1)).toBeLessThan(0.001);
  });

  it('0.25 m² quadrat: grams × 40 = kg DM/ha exactly', () => {
    // ×40 → kg/ha for a 0.25 m² quadrat (TRADE.md, "Clip-and-weigh forage estimates"); it is exact, since
    // 1 g/m² = 10 kg/ha by SI definition. Common practice, no single source.
    const r = forageFromSamples({ frameAreaM2: 0.25, samples: [{ dryGrams: 37 }] });
    expect(r.kgDmPerHa).toBeCloseTo(37 * 40, 10);
  });

  it('fresh weight × dry-matter fraction = dry weight', () => {
    // TRADE.md: "Fresh weight × dry-matter fraction = dry weight". 250 g fresh at 20 % DM is 50 g dry.
    expect(sampleDryGrams({ freshGrams: 250, dryMatterPct: 20 })).toBeCloseTo(50, 12);
    const fresh = forageFromSamples({ frameAreaM2: ONE_FT2_M2, samples: [{ freshGrams: 250, dryMatterPct: 20 }] });
    const dry = forageFromSamples({ frameAreaM2: ONE_FT2_M2, samples: [{ dryGrams: 50 }] });
    expect(fresh.lbDmPerAcre).toBeCloseTo(dry.lbDmPerAcre, 10);
  });
});

describe('sample statistics', () => {
  it('mean, sample sd (n − 1), min and max over mixed samples', () => {
    // Invented example: dry grams 10, 20 (as 100 g fresh at 20 %), 30 → mean 20, sd 10.
    const r = forageFromSamples({
      frameAreaM2: 0.25,
      samples: [{ dryGrams: 10 }, { freshGrams: 100, dryMatterPct: 20 }, { dryGrams: 30 }],
    });
    expect(r.sampleCount).toBe(3);
    expect(r.meanDryGrams).toBeCloseTo(20, 12);
    expect(r.sdDryGrams).toBeCloseTo(10, 12);
    expect(r.minDryGrams).toBe(10);
    expect(r.maxDryGrams).toBe(30);
    expect(r.kgDmPerHa).toBeCloseTo(20 * 40, 10);
  });

  it('sd is 0 for a single sample', () => {
    const r = forageFromSamples({ frameAreaM2: 0.25, samples: [{ dryGrams: 12 }] });
    expect(r.sdDryGrams).toBe(0);
    expect(r.meanDryGrams).toBe(12);
  });

  it('the estimate is proportional to the mean and inversely to the frame area (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 5000, noNaN: true }), { minLength: 1, maxLength: 30 }),
        fc.double({ min: 0.01, max: 10, noNaN: true }),
        (grams, area) => {
          const r = forageFromSamples({ frameAreaM2: area, samples: grams.map((g) => ({ dryGrams: g })) });
          const mean = grams.reduce((a, b) => a + b, 0) / grams.length;
          expect(r.kgDmPerHa).toBeCloseTo((mean / area) * 10, 6);
          expect(r.minDryGrams).toBeLessThanOrEqual(r.meanDryGrams + 1e-9);
          expect(r.maxDryGrams).toBeGreaterThanOrEqual(r.meanDryGrams - 1e-9);
          expect(r.sdDryGrams).toBeGreaterThanOrEqual(0);
        },
      ),
    );
  });

  it('refuses an empty sample list, a zero frame and an impossible DM %', () => {
    expect(() => forageFromSamples({ frameAreaM2: 0.25, samples: [] })).toThrow(GrazingInputError);
    expect(() => forageFromSamples({ frameAreaM2: 0, samples: [{ dryGrams: 1 }] })).toThrow(expect.objectContaining({ field: 'frameAreaM2' }));
    expect(() => forageFromSamples({ frameAreaM2: 0.25, samples: [{ dryGrams: 1 }, { freshGrams: 10, dryMatterPct: 0 }] })).toThrow(
      expect.objectContaining({ field: 'samples[1].dryMatterPct' }),
    );
  });
});

describe('stand height method', () => {
  it('lists the University of Maine Appendix D orchardgrass/legume factors with their source', () => {
    // University of Maine Cooperative Extension, Pasture Course, Lesson 1, Appendix D ("Visual Method"):
    // orchardgrass/legume fair 150–200, good 250–300, excellent 300–350 lb DM/ac per inch.
    const ranges = STAND_HEIGHT_FACTORS.map((f) => [f.condition, f.lbDmPerAcrePerInchMin, f.lbDmPerAcrePerInchMax]);
    expect(ranges).toEqual([
      ['fair', 150, 200],
      ['good', 250, 300],
      ['excellent', 300, 350],
    ]);
    for (const f of STAND_HEIGHT_FACTORS) {
      expect(f.source).toMatch(/University of Maine.*Appendix D/);
      expect(f.lbDmPerAcrePerInch).toBe((f.lbDmPerAcrePerInchMin + f.lbDmPerAcrePerInchMax) / 2);
    }
  });

  it('usable inches above the residual × factor', () => {
    // Invented example with a Maine Appendix D factor (good orchardgrass/legume, low end 250 lb/ac/in):
    // an 8 in stand grazed to a 3 in residual ("take half, leave half … 2–3 in": common practice, no single source) leaves
    // 5 usable inches → 5 × 250 = 1 250 lb DM/ac.
    const good = STAND_HEIGHT_FACTORS.find((f) => f.id === 'orchardgrass-legume-good')!;
    const r = forageFromHeight({ heightIn: 8, residualIn: 3, lbDmPerAcrePerInch: good.lbDmPerAcrePerInchMin });
    expect(r.usableInches).toBe(5);
    expect(r.lbDmPerAcre).toBe(1250);
  });

  it('a stand at or below the residual offers nothing', () => {
    expect(forageFromHeight({ heightIn: 2, residualIn: 3, lbDmPerAcrePerInch: 300 })).toEqual({ usableInches: 0, lbDmPerAcre: 0 });
  });
});
