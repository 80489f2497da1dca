import fc from 'fast-check';
import { DAYS_WARNING, logFigures, NEAR_TARGET_SHARE, type LogFiguresInput } from '../../lib/grazing/log-figures';
import { HEAD_DAY_DECIMALS } from '../../lib/grazing/head-days';
import { INTAKE_RULES_OF_THUMB } from '../../lib/grazing/capacity';
import { kgToLb, lbToKg } from '../../lib/units';

// The worked stays below are invented (the demo's kind of block and flock); the intake figures they rest
// on are published and named beside each check.

const LA = 'America/Los_Angeles';
const at = (iso: string) => Date.parse(iso);

/** 600 dry ewes of 150 lb on an 80 ac walnut block at 2 000 lb DM/ac, target take 45 %, Jan 10–28 2027, out by Mar 1. */
function stay(over: Partial<LogFiguresInput> = {}): LogFiguresInput {
  return {
    moves: [
      { at: '2027-01-10T08:00:00-08:00', change: 600 },
      { at: '2027-01-20T08:00:00-08:00', change: -600 },
    ],
    nowMs: at('2027-01-20T12:00:00-08:00'),
    timeZone: LA,
    stay: { startDate: '2027-01-10', endDate: '2027-01-28', outBy: '2027-03-01', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150 },
    block: { acres: 80, lbDmPerAcre: 2000, targetUtilizationPct: 45, residualHeightIn: 3 },
    ...over,
  };
}

const keys = (r: ReturnType<typeof logFigures>) => r.alerts.map((a) => a.key);

describe('logFigures: forage eaten from head-days and intake', () => {
  it('A finished stay of 600 dry ewes for 10 days eats 22 500 lb DM of a 72 000 lb target take', () => {
    // NCAT ATTRA, "Grazier's Math: Matching Forage to Animal Demand": dry ewes eat about 2.5 % of body weight a day,
    // so a 150 lb ewe eats 3.75 lb DM; 600 head × 10 days = 6 000 head-days × 3.75 = 22 500 lb.
    expect(INTAKE_RULES_OF_THUMB.dryEwe.pct).toBe(2.5);
    const r = logFigures(stay());
    expect(r).toMatchObject({ headNow: 0, headDaysSoFar: 6000, dailyIntakeLbPerHead: 3.75, intakeBasis: 'dry ewe', plannedHeadDays: 600 * 18 });
    expect(r.eatenLb).toBeCloseTo(22_500, 9);
    // Standing 80 × 2 000 = 160 000 lb; 45 % of it is the target take.
    expect(r.standingLb).toBe(160_000);
    expect(r.targetTakeLb).toBeCloseTo(72_000, 9);
    expect(r.utilizationSoFarPct).toBeCloseTo(14.0625, 9);
    // Off the block: nothing more is projected and the count stops at the move out.
    expect(r.projectedEatenLb).toBeCloseTo(r.eatenLb, 9);
    expect(r.until).toBe('2027-01-20T16:00:00.000Z');
    expect(r.lastOutAt).toBe('2027-01-20T08:00:00-08:00');
    expect(r.alerts).toEqual([]);
  });

  it('Goats eat by the goat rule of thumb: 240 wethers of 120 lb at 4.5 % eat 5.4 lb DM a head a day', () => {
    // NCAT ATTRA, "Grazier's Math": goats 4–5 % of body weight (the product's default 4.5 %).
    const r = logFigures(
      stay({
        moves: [{ at: '2027-01-10T08:00:00-08:00', change: 240 }, { at: '2027-01-11T08:00:00-08:00', change: -240 }],
        stay: { ...stay().stay, headCount: 240, species: 'goats', animalClass: 'wethers', bodyWeightLb: 120 },
      }),
    );
    expect(r.dailyIntakeLbPerHead).toBeCloseTo(5.4, 12);
    expect(r.eatenLb).toBeCloseTo(240 * 5.4, 9);
  });

  it('The ATTRA dry-ewe figure the log uses is above NRC maintenance intake, so the eaten estimate does not understate the take', () => {
    // NRC, Nutrient Requirements of Sheep, 6th ed., 1985 (maintenance): a 50 kg ewe eats 1.0 kg DM/day; a 70 kg ewe 1.2 kg.
    for (const [kg, nrcKg] of [[50, 1.0], [70, 1.2]] as const) {
      const r = logFigures(stay({ moves: [{ at: '2027-01-10T08:00:00-08:00', change: 1 }, { at: '2027-01-11T08:00:00-08:00', change: -1 }], stay: { ...stay().stay, bodyWeightLb: kgToLb(kg) } }));
      expect(lbToKg(r.eatenLb)).toBeCloseTo(kg * 0.025, 12);
      expect(lbToKg(r.eatenLb)).toBeGreaterThan(nrcKg);
    }
  });

  it('Head-days follow elapsed time across the spring daylight-saving change at the block (a 23-hour day)', () => {
    // Mar 14, 2027 is 23 hours long in Los Angeles: 100 head from noon on the 13th to noon on the 15th are on for 47 h.
    const r = logFigures(
      stay({
        moves: [{ at: '2027-03-13T12:00:00-08:00', change: 100 }, { at: '2027-03-15T12:00:00-07:00', change: -100 }],
        stay: { ...stay().stay, startDate: '2027-03-13', endDate: '2027-03-20', outBy: '2027-03-25' },
        nowMs: at('2027-03-15T13:00:00-07:00'),
      }),
    );
    expect(r.byDay.map((d) => d.date)).toEqual(['2027-03-13', '2027-03-14', '2027-03-15']);
    expect(r.byDay[1].headDays).toBeCloseTo((100 * 23) / 24, 4);
    expect(r.headDaysSoFar).toBeCloseTo((100 * 47) / 24, 4);
  });
});

describe('logFigures: where the stay is heading', () => {
  it('With animals on, head-days run to now and the projection runs to the start of the agreed end date', () => {
    const r = logFigures(stay({ moves: [{ at: '2027-01-10T08:00:00-08:00', change: 600 }], nowMs: at('2027-01-20T08:00:00-08:00') }));
    expect(r.headNow).toBe(600);
    expect(r.headDaysSoFar).toBe(6000);
    // 600 head × 7 2/3 days more to Jan 28 00:00 at the block.
    const more = 600 * (7 + 16 / 24);
    expect(r.projectedEatenLb).toBeCloseTo((6000 + more) * 3.75, 6);
    expect(r.projectedUtilizationPct).toBeCloseTo(((6000 + more) * 3.75 * 100) / 160_000, 9);
    expect(r.daysLeftInWindow).toBe(8);
    expect(r.daysToOutBy).toBe(40);
    expect(r.lastOutAt).toBeNull();
  });

  it(`Warns ${DAYS_WARNING} days ahead of the out-by date, and as danger once it has passed with animals on`, () => {
    const long = { ...stay().stay, endDate: '2027-03-01' };
    const on = [{ at: '2027-01-10T08:00:00-08:00', change: 100 }];
    const near = logFigures(stay({ moves: on, stay: long, nowMs: at('2027-02-26T09:00:00-08:00') }));
    expect(near.daysToOutBy).toBe(3);
    expect(near.alerts.find((a) => a.key === 'out-by-near')?.text).toBe('3 days to the animals-out-by date (Mar 1, 2027).');
    expect(keys(logFigures(stay({ moves: on, stay: long, nowMs: at('2027-02-25T09:00:00-08:00') })))).not.toContain('out-by-near');
    const past = logFigures(stay({ moves: on, stay: long, nowMs: at('2027-03-02T09:00:00-08:00') }));
    expect(past.alerts[0]).toMatchObject({ key: 'after-out-by', tone: 'danger' });
    expect(past.daysToOutBy).toBe(0);
    // Once the animals are off, the dates warn no more.
    expect(keys(logFigures(stay({ nowMs: at('2027-03-02T09:00:00-08:00') })))).toEqual([]);
  });

  it(`Warns at ${NEAR_TARGET_SHARE * 100} % of the target take, when it is reached, and when the projection overshoots it`, () => {
    // Target 72 000 lb ÷ 3.75 lb = 19 200 head-days.
    const on = (headDays: number) => logFigures(stay({ moves: [{ at: '2027-01-10T00:00:00-08:00', change: 1000 }], nowMs: at('2027-01-10T00:00:00-08:00') + (headDays / 1000) * 86_400_000, stay: { ...stay().stay, endDate: '2027-02-28' } }));
    expect(keys(on(17_280))).toContain('target-near');
    expect(keys(on(17_000))).not.toContain('target-near');
    expect(on(19_200).alerts[0]).toMatchObject({ key: 'target-reached', tone: 'danger' });
    expect(keys(on(5_000))).toContain('projected-over-target');
  });

  it('Warns when the last residual is below the agreed one, when more head are on than contracted, and when losses are logged', () => {
    const r = logFigures(stay({ moves: [{ at: '2027-01-10T08:00:00-08:00', change: 650 }], latestResidualHeightIn: 2.5, lossesSoFar: 2, nowMs: at('2027-01-12T08:00:00-08:00') }));
    expect(keys(r)).toEqual(expect.arrayContaining(['residual-below', 'head-over-contract', 'losses-logged']));
    expect(r.alerts.find((a) => a.key === 'head-over-contract')!.text).toBe('650 head on the block, more than the 600 in the contract: agree an amendment.');
    expect(r.warnings).toEqual(r.alerts.map((a) => a.text));
  });

  it('An empty log has no head-days and no counting window', () => {
    const r = logFigures(stay({ moves: [] }));
    expect(r).toMatchObject({ headNow: 0, headDaysSoFar: 0, byDay: [], until: null, firstInAt: null, eatenLb: 0 });
  });
});

describe('logFigures: properties', () => {
  it('The head now is the sum of the moves, the days add up to the total, and eaten = head-days × intake', () => {
    const units = (v: number) => Math.round(v * 10 ** HEAD_DAY_DECIMALS);
    const start = at('2027-01-10T00:00:00-08:00');
    fc.assert(
      fc.property(fc.array(fc.record({ gapMin: fc.integer({ min: 0, max: 3000 }), change: fc.integer({ min: -300, max: 300 }) }), { maxLength: 12 }), (raw) => {
        let t = start;
        let head = 0;
        const moves: Array<{ at: string; change: number }> = [];
        for (const m of raw) {
          t += m.gapMin * 60_000;
          const change = head + m.change < 0 ? -head : m.change;
          if (change === 0) continue;
          head += change;
          moves.push({ at: new Date(t).toISOString(), change });
        }
        const r = logFigures(stay({ moves, nowMs: t + 3_600_000 }));
        expect(r.headNow).toBe(head);
        expect(r.byDay.reduce((n, d) => n + units(d.headDays), 0)).toBe(units(r.headDaysSoFar));
        expect(r.eatenLb).toBeCloseTo(r.headDaysSoFar * 3.75, 6);
        expect(r.projectedEatenLb).toBeGreaterThanOrEqual(r.eatenLb - 1e-9);
      }),
      { numRuns: 150 },
    );
  });
});
