import { cautionsForBlock, earliestSafeDate, sprayRestrictionEnds, type CautionBlock, type SprayRecord } from '../../lib/grazing/safety';
import { grazeSpan, publishProblem, stayConflicts } from '../../lib/grazing/graze-window';

const spray = (appliedOn: string, grazingRestrictionDays: number, containsCopper = false, product = 'Product A'): SprayRecord => ({
  product,
  appliedOn,
  grazingRestrictionDays,
  containsCopper,
});

const block = (over: Partial<CautionBlock & { windowStart: string; windowEnd: string }> = {}) => ({
  crop: 'orchard',
  sprayRecords: [] as SprayRecord[],
  windowStart: '2027-01-04',
  windowEnd: '2027-03-05',
  outBy: '2027-03-01',
  harvestDate: '2027-09-20' as string | null,
  youngPlantings: false,
  waterOnSite: true,
  speciesAllowed: ['sheep', 'goats'] as Array<'sheep' | 'goats'>,
  ...over,
});

describe('earliestSafeDate', () => {
  it('When there are no spray records, then there is no restriction date', () => {
    expect(earliestSafeDate([])).toBeNull();
  });

  it('When one product was applied, then the safe date is applied on + the label days, across month and year ends', () => {
    expect(sprayRestrictionEnds(spray('2026-12-20', 30))).toBe('2027-01-19');
    expect(earliestSafeDate([spray('2026-12-20', 30)])).toBe('2027-01-19');
    expect(earliestSafeDate([spray('2027-01-31', 1)])).toBe('2027-02-01');
    expect(earliestSafeDate([spray('2027-01-31', 0)])).toBe('2027-01-31');
  });

  it('When a leap day falls inside the interval, then it counts as a day', () => {
    expect(earliestSafeDate([spray('2028-02-15', 14)])).toBe('2028-02-29');
    expect(earliestSafeDate([spray('2027-02-15', 14)])).toBe('2027-03-01');
  });

  it('When an earlier spray has a longer interval, then it sets the date (not the latest application)', () => {
    const records = [spray('2026-10-01', 120, false, 'Long'), spray('2026-12-10', 14, false, 'Short')];
    // 2026-10-01 + 120 d = 2027-01-29; 2026-12-10 + 14 d = 2026-12-24.
    expect(earliestSafeDate(records)).toBe('2027-01-29');
  });

  it('When a label restricts grazing for 18 months (548 days), then the date is that far out', () => {
    expect(earliestSafeDate([spray('2026-01-01', 548)])).toBe('2027-07-03');
  });
});

describe('cautionsForBlock', () => {
  it('When a block was sprayed with copper and the flock is sheep, then a danger caution cites Duncan 1997 and says to ask a vet', () => {
    const c = cautionsForBlock(block({ crop: 'vineyard', sprayRecords: [spray('2026-12-15', 21, true, 'Copper X')] }), { species: 'sheep' });
    const copper = c.find((x) => x.key === 'copper-sheep')!;
    expect(copper.tone).toBe('danger');
    expect(copper.text).toMatch(/Copper X \(Dec 15, 2026\)/);
    expect(copper.text).toMatch(/Duncan, In Practice 19\(9\), 1997/);
    expect(copper.text).toMatch(/vet/);
    expect(c.some((x) => x.key === 'copper')).toBe(false);
  });

  it('When the flock is goats only, then the copper caution is a caution, not the sheep danger; a mixed flock gets the sheep one', () => {
    const b = block({ sprayRecords: [spray('2026-12-15', 21, true)] });
    expect(cautionsForBlock(b, { species: 'goats' }).find((x) => x.key.startsWith('copper'))).toMatchObject({ key: 'copper', tone: 'caution' });
    expect(cautionsForBlock(b, { species: 'mixed' }).find((x) => x.key.startsWith('copper'))!.key).toBe('copper-sheep');
    // With no flock given, the block allows sheep, so the sheep caution shows.
    expect(cautionsForBlock(b).find((x) => x.key.startsWith('copper'))!.key).toBe('copper-sheep');
  });

  it('When spray records exist, then the pesticide caution gives the restriction end, the product and the label source', () => {
    const c = cautionsForBlock(block({ sprayRecords: [spray('2026-12-28', 30, false, 'Herbicide B')] }));
    const p = c.find((x) => x.key === 'pesticide-restriction')!;
    expect(p).toMatchObject({ tone: 'danger', title: 'No grazing before Jan 27, 2027' });
    expect(p.text).toMatch(/Herbicide B, applied Dec 28, 2026, label: no grazing for 30 days/);
    expect(p.text).toMatch(/US EPA Label Review Manual, ch\. 11/);
  });

  it('When no spray records were entered, then the grazier is told to ask and read the labels', () => {
    const c = cautionsForBlock(block());
    expect(c.find((x) => x.key === 'spray-records-none')).toMatchObject({ tone: 'caution' });
    expect(c.some((x) => x.key === 'pesticide-restriction')).toBe(false);
  });

  it('When animals are out fewer than 120 days before harvest, then the food-safety caution is a danger naming the gap and the rules', () => {
    const c = cautionsForBlock(block({ outBy: '2027-03-01', harvestDate: '2027-05-01' }));
    const f = c.find((x) => x.key === 'food-safety-harvest')!;
    expect(f.tone).toBe('danger');
    expect(f.text).toMatch(/out by Mar 1, 2027, 61 days before harvest on May 1, 2027/);
    expect(f.text).toMatch(/21 CFR 112, subpart I/);
    expect(f.text).toMatch(/7 CFR 205\.203/);
    expect(cautionsForBlock(block()).find((x) => x.key === 'food-safety-harvest')!.tone).toBe('caution');
  });

  it('When the block is fallow or pasture, then there is no food-safety caution', () => {
    expect(cautionsForBlock(block({ crop: 'fallow', harvestDate: null })).some((x) => x.key === 'food-safety-harvest')).toBe(false);
    expect(cautionsForBlock(block({ crop: 'pasture', harvestDate: null })).some((x) => x.key === 'food-safety-harvest')).toBe(false);
  });

  it('When there are young plantings, a vineyard, or no water, then the matching cautions appear', () => {
    const c = cautionsForBlock(block({ crop: 'vineyard', youngPlantings: true, waterOnSite: false }));
    expect(c.find((x) => x.key === 'young-plantings')!.tone).toBe('danger');
    expect(c.find((x) => x.key === 'bud-break')).toBeDefined();
    expect(c.find((x) => x.key === 'water-and-heat')).toMatchObject({ tone: 'caution', title: 'No water on site: haul water' });
    expect(c.find((x) => x.key === 'electric-fence-public')!.text).toMatch(/warning signs/);
  });

  it('When the flock is a species the grower does not allow, then that comes first as a danger', () => {
    const c = cautionsForBlock(block({ speciesAllowed: ['sheep'] }), { species: 'goats' });
    expect(c[0]).toMatchObject({ key: 'species-not-allowed', tone: 'danger' });
  });

  it('Every caution defers to the label, local rules or licensed advice, and dangers come before cautions before info', () => {
    const c = cautionsForBlock(
      block({ crop: 'vineyard', youngPlantings: true, waterOnSite: false, speciesAllowed: ['sheep'], sprayRecords: [spray('2026-12-15', 21, true)] }),
      { species: 'mixed' },
    );
    expect(c.length).toBeGreaterThanOrEqual(8);
    for (const x of c) expect(x.text).toMatch(/local rules/);
    const rank = { danger: 0, caution: 1, info: 2 };
    expect(c.map((x) => rank[x.tone])).toEqual([...c.map((x) => rank[x.tone])].sort());
  });
});

describe('graze window', () => {
  it('When a spray restriction ends inside the window, then grazing starts on that date and stops at the earlier of window end and out-by', () => {
    expect(grazeSpan(block({ sprayRecords: [spray('2027-01-01', 20)] }))).toEqual({ from: '2027-01-21', until: '2027-03-01', earliestSafeDate: '2027-01-21' });
    expect(grazeSpan(block({ outBy: '2027-03-20' })).until).toBe('2027-03-05');
  });

  it('When out-by has passed, the window has passed, or the restriction covers the window, then publishing is refused with that reason', () => {
    expect(publishProblem(block(), '2026-12-01')).toBeNull();
    expect(publishProblem(block(), '2027-03-01')!.code).toBe('out_by_passed');
    expect(publishProblem(block({ outBy: '2027-03-20', windowEnd: '2027-03-05' }), '2027-03-06')!.code).toBe('window_passed');
    const covered = publishProblem(block({ sprayRecords: [spray('2027-01-01', 90, false, 'Z')] }), '2026-12-01')!;
    expect(covered.code).toBe('spray_restriction_covers_window');
    expect(covered.message).toMatch(/2027-04-01: Z applied 2027-01-01/);
  });

  it('When a stay starts inside a restriction, ends after out-by, or brings a species not allowed, then each is named at its field', () => {
    const b = block({ speciesAllowed: ['sheep'], sprayRecords: [spray('2026-12-28', 30, false, 'Herbicide B')] });
    const c = stayConflicts({ startDate: '2027-01-20', endDate: '2027-03-03', species: 'goats' }, b, '2026-12-01');
    expect(c.map((x) => x.field)).toEqual(['startDate', 'endDate', 'species']);
    expect(c[0].message).toMatch(/inside a pesticide grazing restriction: Herbicide B .* earliest safe date is 2027-01-27/);
    expect(c[1].message).toMatch(/animals-out-by date, 2027-03-01/);
    expect(stayConflicts({ startDate: '2027-01-27', endDate: '2027-03-01', species: 'sheep' }, b, '2026-12-01')).toEqual([]);
  });

  it('When today is given, then a start in the past is refused; without it (an award), the agreed dates are judged only against the block', () => {
    const stay = { startDate: '2027-01-10', endDate: '2027-01-20', species: 'sheep' as const };
    expect(stayConflicts(stay, block(), '2027-01-11')[0]).toMatchObject({ field: 'startDate', message: expect.stringMatching(/has passed/) });
    expect(stayConflicts(stay, block())).toEqual([]);
  });
});
