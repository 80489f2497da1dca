import fc from 'fast-check';
import { all, create } from 'mathjs';
import { GrazingInputError } from '../../lib/grazing/errors';
import { displayStatus, invoiceCharge, invoiceNumberLabel, invoicePrefix, invoiceTotals, seasonOf } from '../../lib/invoices';
import { chargeLines } from '../../lib/money';
import { paymentFailureInWords } from '../../lib/payments';

// The invoice's arithmetic is the calculator's: lib/money chargeLines. These checks pin that, the quantity each
// basis bills, and the wording and status rules the screens, mail and PDF share.

// Independent arbitrary-precision reference: mathjs BigNumber (decimal.js), each line rounded half-up (mode 4).
const math = create(all, { number: 'BigNumber', precision: 64 });
const referenceCents = (quantity: string, rate: string) => Number(math.bignumber(quantity).times(math.bignumber(rate)).times(100).toDecimalPlaces(0, 4).toString());

describe('invoiceCharge', () => {
  test('When the basis is per head-day, then it bills the agreed head-days at the rate, to the cent of chargeLines', () => {
    const c = invoiceCharge({ basis: 'head-day', rate: '0.18', agreedHeadDays: 10_837.5, acres: 80 });
    expect(c).toMatchObject(chargeLines({ basis: 'head-day', quantity: 10_837.5, rate: '0.18' }));
    expect(c.quantity).toBe(10_837.5);
    // 10 837.5 × 0.18 = 1 950.75 exactly
    expect(c.totalCents).toBe(195_075);
    expect(c.lines[0].description).toBe('Grazing: 10,837.5 head-days × $0.18 per head-day');
  });

  test('When the basis is per acre or flat, then it bills the contracted acres, or the price once, whatever the head-days', () => {
    expect(invoiceCharge({ basis: 'acre', rate: '38', agreedHeadDays: 9_999, acres: 36.5 })).toMatchObject({ quantity: 36.5, totalCents: 138_700 });
    expect(invoiceCharge({ basis: 'flat', rate: '4200', agreedHeadDays: null, acres: 36.5 })).toMatchObject({ quantity: 1, totalCents: 420_000 });
  });

  test('When a hauling fee is on the contract, then it is its own line and adds to the total', () => {
    const c = invoiceCharge({ basis: 'head-day', rate: '0.18', agreedHeadDays: 1000, acres: 10, fees: [{ label: 'Hauling and mobilisation', amountCents: 45_000 }] });
    expect(c.lines.map((l) => [l.description, l.amountCents])).toEqual([
      ['Grazing: 1,000 head-days × $0.18 per head-day', 18_000],
      ['Hauling and mobilisation', 45_000],
    ]);
    expect(c.totalCents).toBe(63_000);
  });

  test('When head-days are not agreed on a head-day contract, then there is nothing to bill', () => {
    expect(() => invoiceCharge({ basis: 'head-day', rate: '0.18', agreedHeadDays: null, acres: 80 })).toThrow(GrazingInputError);
  });

  test('For any agreed head-days and rate, the total is the exact product rounded half-up (mathjs BigNumber)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), fc.integer({ min: 1, max: 50_000_000 }), (tenThousandths, micros) => {
        const q = (tenThousandths / 10_000).toString();
        const rate = (micros / 1_000_000).toFixed(6);
        expect(invoiceCharge({ basis: 'head-day', rate, agreedHeadDays: Number(q), acres: 1 }).totalCents).toBe(referenceCents(q, rate));
      }),
    );
  });
});

describe('numbers, statuses and totals', () => {
  test('When a grazier is named, then the invoice prefix is up to three initials, and the number is padded to four digits', () => {
    expect(invoicePrefix('Kellner Range Sheep')).toBe('KRS');
    expect(invoicePrefix('Haas Brush Goats & Co')).toBe('HBG');
    expect(invoicePrefix('Émile Côté')).toBe('EC');
    expect(invoicePrefix('4242')).toBe('FF');
    expect(invoiceNumberLabel('KRS', 7)).toBe('KRS-0007');
    expect(invoiceNumberLabel('KRS', 12_345)).toBe('KRS-12345');
  });

  test('When a sent invoice passes its due day, then it is overdue from the next day; paid and void never are', () => {
    expect(displayStatus('sent', '2027-02-15', '2027-02-15')).toBe('sent');
    expect(displayStatus('sent', '2027-02-15', '2027-02-16')).toBe('overdue');
    expect(displayStatus('paid', '2027-02-15', '2027-03-01')).toBe('paid');
    expect(displayStatus('void', '2027-02-15', '2027-03-01')).toBe('void');
  });

  test('When totals are taken, then owed counts issued-but-unpaid, overdue is part of it, and paid counts the season only', () => {
    const t = invoiceTotals(
      [
        { displayStatus: 'sent', totalCents: 10_000, paidDay: null },
        { displayStatus: 'overdue', totalCents: 20_000, paidDay: null },
        { displayStatus: 'draft', totalCents: 5_000, paidDay: null },
        { displayStatus: 'paid', totalCents: 40_000, paidDay: '2027-01-20' },
        { displayStatus: 'paid', totalCents: 80_000, paidDay: '2026-12-30' },
        { displayStatus: 'void', totalCents: 99_000, paidDay: null },
      ],
      seasonOf('2027-02-01'),
    );
    expect(t).toEqual({ outstandingCents: 35_000, outstandingCount: 3, overdueCents: 20_000, overdueCount: 1, paidThisSeasonCents: 40_000, paidThisSeasonCount: 1, season: '2027' });
  });

  test('When the payments API declines, then the reason reads in plain words by decline code', () => {
    expect(paymentFailureInWords('card_declined', 'insufficient_funds')).toMatch(/does not have enough funds/);
    expect(paymentFailureInWords('card_declined', 'generic_decline')).toMatch(/bank gave no reason/);
    expect(paymentFailureInWords('card_declined', 'something_new')).toMatch(/bank gave no reason/);
    expect(paymentFailureInWords('processing_error', null)).toMatch(/Nothing was charged/);
  });
});
