import type { ChargeBasis } from './money';
import type { BidTermsView } from './schemas/bid';
import { formatDayRange, formatNumber } from './format';

// The terms of a stay, declared once: a bid offers them, a contract snapshots them at award, an amendment
// changes some of them, and the screens, mail and PDFs describe them in the same words.

/** The fields that make up a bid's terms (and a contract's copy of them), in display order. */
export const TERM_FIELDS = ['basis', 'rate', 'headCount', 'species', 'animalClass', 'bodyWeightLb', 'startDate', 'endDate', 'services'] as const satisfies ReadonlyArray<keyof BidTermsView>;
export type TermField = (typeof TERM_FIELDS)[number];

/** Copies exactly the term fields from a bid, a contract or a form's values. */
export function pickTerms<T extends BidTermsView>(source: T): BidTermsView {
  const out = {} as Record<TermField, unknown>;
  for (const f of TERM_FIELDS) out[f] = f === 'services' ? [...source.services] : source[f];
  return out as unknown as BidTermsView;
}

/** Fieldfold's words for each pricing basis. */
export const BASIS_OPTIONS: ReadonlyArray<{ value: ChargeBasis; label: string }> = [
  { value: 'head-day', label: 'Per head-day' },
  { value: 'acre', label: 'Per acre' },
  { value: 'flat', label: 'Flat price' },
];

/** What the rate field's unit says for each basis. */
export const RATE_UNIT: Record<ChargeBasis, string> = { 'head-day': '$ per head-day', acre: '$ per acre', flat: '$ for the job' };

/** What follows a price: "per head-day", "per acre", "for the job". */
export const BASIS_UNIT: Record<ChargeBasis, string> = { 'head-day': 'per head-day', acre: 'per acre', flat: 'for the job' };

/** The unit an invoice line's quantity is counted in, for each pricing basis. */
export const BASIS_QUANTITY_UNIT: Record<ChargeBasis, string> = { 'head-day': 'head-days', acre: 'acres', flat: 'job' };

/** "$0.18", "$0.1875", "$1,250.00": a rate in dollars as its decimal text (up to 6 decimals), grouped, at least 2 decimals. */
export function formatRateAmount(rate: string): string {
  const [whole, frac = ''] = rate.split('.');
  return `$${whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',')}.${frac.padEnd(2, '0')}`;
}

/** "$0.18 per head-day", "$22.50 per acre", "$4,200.00 for the job" — the rate as the grazier wrote it, grouped. */
export function formatRate(basis: ChargeBasis, rate: string): string {
  return `${formatRateAmount(rate)} ${BASIS_UNIT[basis]}`;
}

/** "600 dry ewes (sheep), 150 lb · Jan 5 – Jan 19, 2027" */
export function stayLine(t: { headCount: number; animalClass: string; species: string; bodyWeightLb: number; startDate: string; endDate: string }): string {
  return `${formatNumber(t.headCount)} ${t.animalClass} (${t.species}), ${formatNumber(t.bodyWeightLb)} lb · ${formatDayRange(t.startDate, t.endDate)}`;
}
