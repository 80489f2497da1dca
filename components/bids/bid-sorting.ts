import type { BidView } from '@/lib/schemas/bid';

// Columns a grower can sort the bid comparison by; each reads a figure already normalised by lib/grazing.
export const BID_SORT_KEYS = {
  total: { label: 'Estimated total', value: (b: BidView) => b.normalised.estimatedTotalCents },
  perAcre: { label: 'Per acre', value: (b: BidView) => b.normalised.costPerAcreCents },
  perHeadDay: { label: 'Per head-day', value: (b: BidView) => Number(b.normalised.costPerHeadDayRate) },
  utilisation: { label: 'Predicted take', value: (b: BidView) => b.normalised.predictedUtilizationPct },
  headDays: { label: 'Head-days', value: (b: BidView) => b.normalised.headDays },
  start: { label: 'Start', value: (b: BidView) => b.startDate },
  record: { label: 'Record', value: (b: BidView) => b.grazier.completedContracts },
} as const;

export type BidSortKey = keyof typeof BID_SORT_KEYS;

/** Live bids first, then by the chosen column; ties keep the order bids arrived in. */
export function sortBids(bids: readonly BidView[], key: BidSortKey, direction: 'asc' | 'desc'): BidView[] {
  const read = BID_SORT_KEYS[key].value;
  const sign = direction === 'asc' ? 1 : -1;
  return bids
    .map((b, i) => ({ b, i }))
    .sort((x, y) => {
      const live = Number(y.b.status === 'live') - Number(x.b.status === 'live');
      if (live) return live;
      const a = read(x.b);
      const c = read(y.b);
      if (a < c) return -sign;
      if (a > c) return sign;
      return x.i - y.i;
    })
    .map(({ b }) => b);
}
