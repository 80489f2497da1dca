import type { ChargeBasis } from '@/lib/money';
import type { BidStatus } from '@/lib/schemas/bid';
import { formatDayRange, formatNumber } from '@/lib/format';

// Fieldfold's words for a bid's terms, shared by the bid form, My bids and the contract pages.

export const BASIS_OPTIONS: ReadonlyArray<{ value: ChargeBasis; label: string }> = [
  { value: 'head-day', label: 'Per head-day' },
  { value: 'acre', label: 'Per acre' },
  { value: 'flat', label: 'Flat price' },
];

/** What the rate field's unit says for each basis. */
export const RATE_UNIT: Record<ChargeBasis, string> = { 'head-day': '$ per head-day', acre: '$ per acre', flat: '$ for the job' };

// The rate's words live in lib/ so the invoice and the PDFs say it the same way.
export { formatRate } from '@/lib/rates';

/** "$0.1800" from normaliseBid's 4-decimal rate text. */
export function formatHeadDayRate(rate4: string): string {
  return `$${rate4}`;
}

export const BID_STATUS_LABELS: Record<BidStatus, string> = {
  live: 'Live — the grower can award it',
  accepted: 'Accepted — a contract was made',
  declined: 'Declined',
  withdrawn: 'Withdrawn by you',
};

/** "600 dry ewes (sheep), 150 lb · Jan 5 – Jan 19, 2027" */
export function stayLine(t: { headCount: number; animalClass: string; species: string; bodyWeightLb: number; startDate: string; endDate: string }): string {
  return `${formatNumber(t.headCount)} ${t.animalClass} (${t.species}), ${formatNumber(t.bodyWeightLb)} lb · ${formatDayRange(t.startDate, t.endDate)}`;
}
