import type { BidStatus } from '@/lib/schemas/bid';

// The words for a bid's terms live once in lib/terms.ts (mail and PDFs use them too); re-exported here for screens.
export { BASIS_OPTIONS, BASIS_UNIT, RATE_UNIT, formatRate, stayLine } from '@/lib/terms';

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
