import fc from 'fast-check';
import { all, create } from 'mathjs';
import { GrazingInputError } from '../../lib/grazing/errors';
import { chargeLines, formatCents, parseRate, quantityToUnits, rateToString } from '../../lib/money';

// Independent arbitrary-precision reference: mathjs BigNumber (decimal.js), rounding half-up (mode 4).
const math = create(all, { number: 'BigNumber', precision: 64 });
const ROUND_HALF_UP = 4;
function referenceCents(quantity: string, rate: string): number {
  const cents = math.bignumber(quantity).times(math.bignumber(rate)).times(100);
  return Number(cents.toDecimalPlaces(0, ROUND_HALF_UP).toString());
}

describe('rates are exact', () => {
  it('parses decimal dollars to micro-dollars', () => {
    expect(parseRate('0.18')).toBe(180_000n);
    expect(parseRate('0.125')).toBe(125_000n);
    expect(parseRate('0.1875')).toBe(187_500n);
    expect(parseRate('12')).toBe(12_000_000n);
    expect(rateToString(parseRate('0.180000'))).toBe('0.18');
    expect(rateToString(parseRate('12.5'))).toBe('12.50');
    expect(rateToString(parseRate('0.000001'))).toBe('0.000001');
  });

  it('refuses what is not a plain decimal with at most 6 decimals', () => {
    for (const bad of ['.5', '1.', '-1', '1e3', '0.1234567', ' 1', '$1', '1,000', '']) {
      expect(() => parseRate(bad)).toThrow(GrazingInputError);
    }
  });

  it('reads quantities by their decimal text, up to 4 decimals', () => {
    expect(quantityToUnits(1234.5)).toBe(12_345_000n);
    expect(quantityToUnits(0.1)).toBe(1_000n);
    expect(quantityToUnits(80.25)).toBe(802_500n);
    expect(quantityToUnits(1e21)).toBe(10n ** 25n);
    expect(() => quantityToUnits(1.00001)).toThrow(GrazingInputError);
    expect(() => quantityToUnits(1e-7)).toThrow(GrazingInputError);
    expect(() => quantityToUnits(-1)).toThrow(GrazingInputError);
  });
});

describe('chargeLines', () => {
  it('rounds half-up at exactly half a cent', () => {
    // "0.125" × 3 head-days = 37.5 cents → 38 (the brief's fractional-cent example).
    expect(chargeLines({ basis: 'head-day', quantity: 3, rate: '0.125' }).subtotalCents).toBe(38);
    // 0.5 cent → 1; 0.4999 cent → 0.
    expect(chargeLines({ basis: 'head-day', quantity: 1, rate: '0.005' }).subtotalCents).toBe(1);
    expect(chargeLines({ basis: 'head-day', quantity: 1, rate: '0.004999' }).subtotalCents).toBe(0);
    // 1 234.5 head-days × $0.1875 = $231.46875 → 23 146.875 cents → 23 147.
    expect(chargeLines({ basis: 'head-day', quantity: 1234.5, rate: '0.1875' }).subtotalCents).toBe(23147);
  });

  it('has no floating-point drift', () => {
    // In floating point 0.1 × 3 × 100 = 30.000000000000004 and 1.005 × 100 = 100.49999999999999.
    expect(chargeLines({ basis: 'head-day', quantity: 3, rate: '0.1' }).subtotalCents).toBe(30);
    expect(chargeLines({ basis: 'acre', quantity: 1.005, rate: '1' }).subtotalCents).toBe(101);
    expect(chargeLines({ basis: 'acre', quantity: 80.25, rate: '12.5' }).subtotalCents).toBe(100313);
  });

  it('adds fees after the grazing subtotal', () => {
    const r = chargeLines({
      basis: 'acre',
      quantity: 40,
      rate: '35',
      feesCents: [
        { label: 'Hauling', amountCents: 25_000 },
        { label: 'Water trailer', amountCents: 7_550 },
      ],
    });
    expect(r.lines).toEqual([
      { kind: 'grazing', label: 'Grazing (acres)', quantity: 40, rate: '35.00', amountCents: 140_000 },
      { kind: 'fee', label: 'Hauling', quantity: 1, rate: '250.00', amountCents: 25_000 },
      { kind: 'fee', label: 'Water trailer', quantity: 1, rate: '75.50', amountCents: 7_550 },
    ]);
    expect(r.subtotalCents).toBe(140_000);
    expect(r.totalCents).toBe(140_000 + 25_000 + 7_550);
  });

  it('a flat charge has quantity 1', () => {
    const r = chargeLines({ basis: 'flat', rate: '1500' });
    expect(r.lines[0]).toMatchObject({ quantity: 1, amountCents: 150_000 });
    expect(chargeLines({ basis: 'flat', quantity: 1, rate: '1500' }).totalCents).toBe(150_000);
    expect(() => chargeLines({ basis: 'flat', quantity: 2, rate: '1500' })).toThrow(expect.objectContaining({ field: 'quantity' }));
  });

  it('refuses negative fees and bad rates, naming the field', () => {
    expect(() => chargeLines({ basis: 'head-day', quantity: 1, rate: '0.1', feesCents: [{ label: 'Credit', amountCents: -100 }] })).toThrow(
      expect.objectContaining({ field: 'feesCents[0].amountCents' }),
    );
    expect(() => chargeLines({ basis: 'head-day', quantity: 1, rate: '-0.1' })).toThrow(expect.objectContaining({ field: 'rate' }));
    expect(() => chargeLines({ basis: 'head-day', rate: '0.1' })).toThrow(expect.objectContaining({ field: 'quantity' }));
  });

  const quantityText = fc
    .tuple(fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 0, max: 9999 }))
    .map(([whole, frac]) => `${whole}.${String(frac).padStart(4, '0')}`);
  const rateText = fc
    .tuple(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: 0, max: 999_999 }))
    .map(([whole, frac]) => `${whole}.${String(frac).padStart(6, '0')}`);
  const fees = fc.array(fc.record({ label: fc.constantFrom('Hauling', 'Water', 'Fencing'), amountCents: fc.integer({ min: 0, max: 10_000_000 }) }), {
    maxLength: 5,
  });

  it('matches an arbitrary-precision decimal reference (mathjs BigNumber) (property)', () => {
    fc.assert(
      fc.property(quantityText, rateText, (q, rate) => {
        const r = chargeLines({ basis: 'head-day', quantity: Number(q), rate });
        expect(r.subtotalCents).toBe(referenceCents(q, rate));
      }),
      { numRuns: 300 },
    );
  });

  it('lines add up to the total; the subtotal is the grazing line (property)', () => {
    fc.assert(
      fc.property(quantityText, rateText, fees, fc.constantFrom('head-day' as const, 'acre' as const), (q, rate, feeList, basis) => {
        const r = chargeLines({ basis, quantity: Number(q), rate, feesCents: feeList });
        expect(r.lines).toHaveLength(1 + feeList.length);
        expect(r.totalCents).toBe(r.lines.reduce((a, l) => a + l.amountCents, 0));
        expect(r.subtotalCents).toBe(r.lines[0].amountCents);
        for (const l of r.lines) expect(Number.isSafeInteger(l.amountCents)).toBe(true);
      }),
    );
  });
});

describe('formatCents', () => {
  it('prints dollars with grouping', () => {
    expect(formatCents(123_456)).toBe('$1,234.56');
    expect(formatCents(0)).toBe('$0.00');
    expect(formatCents(5)).toBe('$0.05');
    expect(formatCents(100_000_000)).toBe('$1,000,000.00');
    expect(formatCents(-500)).toBe('-$5.00');
    expect(() => formatCents(1.5)).toThrow(GrazingInputError);
  });

  it('agrees with Intl.NumberFormat en-US currency (property)', () => {
    const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
    fc.assert(
      fc.property(fc.integer({ min: -1e12, max: 1e12 }), (cents) => {
        // Reference from BigInt-free decimal text so the division cannot round: "123456" → "1234.56".
        const abs = Math.abs(cents);
        const text = `${cents < 0 ? '-' : ''}${Math.floor(abs / 100)}.${String(abs % 100).padStart(2, '0')}`;
        expect(formatCents(cents)).toBe(usd.format(text as unknown as number));
      }),
    );
  });
});
