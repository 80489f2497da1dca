import crypto from 'node:crypto';
import fc from 'fast-check';
import { AMENDABLE_TERMS, amendTerms, canonicalTermsText, changedTerms, termsFromAward, type AwardFacts, type ContractTerms } from '../../lib/contract-terms';
import { sha256Hex } from '../../server/modules/contracts/contract-state';

// The text both parties sign must be the same characters for the same terms, on every device, and differ
// for any change a signer could care about. Names and figures below are invented (the demo district).

function facts(over: Partial<AwardFacts> = {}): AwardFacts {
  return {
    contractId: '6f1d7a3e-0000-4000-8000-000000000001',
    grower: { name: 'Tomás Reyes', businessName: 'Three Terraces Vineyard' },
    grazier: { name: 'Wade Kellner', businessName: 'Kellner Range Sheep' },
    block: {
      name: 'Terrace 2 vineyard rows',
      crop: 'vineyard',
      placeName: 'Calder Valley, west slope',
      acres: 1200.5,
      lbDmPerAcre: 1800,
      targetUtilizationPct: 40,
      residualHeightIn: 3,
      timeZone: 'America/Los_Angeles',
      harvestDate: '2027-09-01',
      waterOnSite: true,
      perimeterFence: 'full',
      truckAccess: true,
      youngPlantings: false,
      speciesAllowed: ['sheep'],
      outBy: '2027-03-10',
      sprayRecords: [{ product: 'Fixed copper fungicide (demo record)', appliedOn: '2026-12-15', grazingRestrictionDays: 21, containsCopper: true }],
    },
    bid: { basis: 'head-day', rate: '0.18', headCount: 600, species: 'sheep', animalClass: 'dry ewes', bodyWeightLb: 150, startDate: '2027-01-18', endDate: '2027-02-05', services: ['fencing', 'guardian dogs'] },
    ...over,
  };
}

/** The same object with its keys in another order, all the way down. */
function reordered<T>(v: T): T {
  if (Array.isArray(v)) return v.map(reordered) as T;
  if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).reverse().map(([k, x]) => [k, reordered(x)])) as T;
  return v;
}

describe('SHA-256 as the server computes it', () => {
  it('matches the published test vectors', () => {
    // NIST FIPS 180-2, Secure Hash Standard, Appendix B.1 ("abc") and B.2 (the 448-bit message).
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(sha256Hex('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe('248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1');
  });
});

describe('canonicalTermsText', () => {
  it('writes every term a signer agrees to, with plain digits and ISO days beside the readable date', () => {
    const text = canonicalTermsText(termsFromAward(facts()));
    for (const line of [
      'Contract: 6f1d7a3e-0000-4000-8000-000000000001',
      'Terms version: 1',
      'Grower: Three Terraces Vineyard (Tomás Reyes)',
      'Acres: 1200.5',
      'Standing forage: 1800 lb dry matter per acre',
      'Target take: 40 % of the standing forage',
      'Residual to leave: 3 in',
      'Price: $0.18 per head-day',
      'Head: 600',
      'Animals in: 2027-01-18 (Jan 18, 2027)',
      'Animals out by: 2027-03-10 (Mar 10, 2027)',
      'Services by the grazier: fencing, guardian dogs',
      '- Earliest safe grazing day by the spray records: 2027-01-05 (Jan 5, 2027)',
      '- Spray: Fixed copper fungicide (demo record), applied 2026-12-15, label: no grazing for 21 days (until 2027-01-05), copper: yes',
    ]) {
      expect(text.split('\n')).toContain(line);
    }
    // The cautions shown with the terms are part of what is signed: copper for sheep, food safety, bud break.
    expect(text).toMatch(/\d+\. \[danger\] Copper sprays: a risk for sheep\n {3}This block was sprayed with copper/);
    expect(text).toContain('Out before bud break');
    expect(text.endsWith('\n')).toBe(true);
    expect(text).not.toContain('\r');
  });

  it('gives the same text for the same terms, whatever order the keys were stored in and however the names were normalised', () => {
    const terms = termsFromAward(facts());
    expect(canonicalTermsText(reordered(terms))).toBe(canonicalTermsText(terms));
    // "Tomás" typed as a + combining acute (NFD) on one device and as á (NFC) on another is one name.
    const nfd = termsFromAward(facts({ grower: { name: 'Tomás Reyes'.normalize('NFD'), businessName: 'Three Terraces Vineyard' } }));
    expect(canonicalTermsText(nfd)).toBe(canonicalTermsText(terms));
  });

  it('keeps each typed value on its own line: a line break in a name cannot add a term', () => {
    const sneaky = termsFromAward(facts({ grazier: { name: 'Wade Kellner\nHead: 60', businessName: null } }));
    const lines = canonicalTermsText(sneaky).split('\n');
    expect(lines).toContain('Grazier: Wade Kellner Head: 60');
    expect(lines.filter((l) => l.startsWith('Head: '))).toEqual(['Head: 600']);
  });

  it('changes (and so does its hash) when any amendable term changes', () => {
    const base = termsFromAward(facts());
    const hash = (t: ContractTerms) => crypto.createHash('sha256').update(canonicalTermsText(t), 'utf8').digest('hex');
    const values = {
      headCount: fc.integer({ min: 1, max: 20_000 }),
      startDate: fc.constantFrom('2027-01-19', '2027-01-25'),
      endDate: fc.constantFrom('2027-02-06', '2027-03-01'),
      outBy: fc.constantFrom('2027-03-09', '2027-03-11'),
      basis: fc.constantFrom('acre' as const, 'flat' as const),
      rate: fc.constantFrom('0.17', '0.181', '12.50'),
    };
    for (const field of AMENDABLE_TERMS) {
      fc.assert(
        fc.property(values[field] as fc.Arbitrary<never>, (v) => {
          fc.pre(v !== base[field]);
          const next = amendTerms(base, { [field]: v });
          expect(next.version).toBe(2);
          expect(hash(next)).not.toBe(hash(base));
        }),
        { numRuns: 20 },
      );
    }
  });
});

describe('amendTerms and changedTerms', () => {
  it('says the cautions again for a new out-by date, and lists each change with its old value in words', () => {
    const base = termsFromAward(facts());
    const next = amendTerms(base, { outBy: '2027-03-05', headCount: 550, basis: 'acre', rate: '20.00' });
    expect(next.cautions.find((c) => c.key === 'food-safety-harvest')!.text).toContain('Animals must be out by Mar 5, 2027');
    expect(base.cautions.find((c) => c.key === 'food-safety-harvest')!.text).toContain('Animals must be out by Mar 10, 2027');
    expect(changedTerms(base, { outBy: '2027-03-05', headCount: 550, basis: 'acre', rate: '20.00' })).toEqual([
      { field: 'headCount', label: 'Head', from: '600 head', to: '550 head' },
      { field: 'outBy', label: 'Animals out by', from: 'Mar 10, 2027', to: 'Mar 5, 2027' },
      { field: 'basis', label: 'Pricing basis', from: 'Per head-day', to: 'Per acre' },
      { field: 'rate', label: 'Rate', from: '$0.18 per head-day', to: '$20.00 per acre' },
    ]);
    expect(changedTerms(base, { headCount: 600 })).toEqual([]);
  });
});
