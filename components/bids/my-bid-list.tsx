import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import { BID_STATUSES, type BidStatus, type BidView } from '@/lib/schemas/bid';
import { useMyBids } from '@/hooks/api/bids';
import { useContracts } from '@/hooks/api/contracts';
import { useLayout } from '@/hooks/use-layout';
import { EmptyState, ErrorState, LoadingState, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { MyBidCard } from './my-bid-card';

const SECTION_TITLES: Record<BidStatus, string> = {
  live: 'Live',
  accepted: 'Accepted',
  declined: 'Declined',
  withdrawn: 'Withdrawn',
};

/** My bids, grouped by what became of them: live first, then accepted, declined, withdrawn. */
export function MyBidList() {
  const bids = useMyBids();
  const contracts = useContracts();
  const { isWide } = useLayout();

  if (bids.isPending) return <LoadingState label="Loading your bids…" />;
  if (bids.isError) return <ErrorState message={bids.error.message} onRetry={() => void bids.refetch()} />;
  if (bids.data.length === 0) {
    return (
      <EmptyState
        title="No bids yet"
        action={
          <Link href="/">
            <Text tone="cover" variant="bodyStrong">
              Find grazing →
            </Text>
          </Link>
        }
      >
        Open a block from Find grazing and bid per head-day, per acre or a flat price for the job.
      </EmptyState>
    );
  }

  const contractByBid = new Map(contracts.items.map((c) => [c.bidId, c.id]));
  const groups = BID_STATUSES.map((status) => ({ status, items: bids.data.filter((b) => b.status === status) })).filter((g) => g.items.length > 0);

  return (
    <View style={styles.col}>
      {groups.map((g) => (
        <View key={g.status} style={styles.col} aria-label={`${SECTION_TITLES[g.status]} bids`}>
          <Text variant="heading" role="heading" aria-level={2}>
            {SECTION_TITLES[g.status]} ({g.items.length})
          </Text>
          <View style={[styles.grid, isWide && styles.gridWide]}>
            {g.items.map((bid: BidView) => (
              <View key={bid.id} style={isWide ? styles.cellWide : undefined}>
                <MyBidCard bid={bid} contractId={contractByBid.get(bid.id)} />
              </View>
            ))}
          </View>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.md },
  grid: { gap: space.md },
  gridWide: { flexDirection: 'row', flexWrap: 'wrap' },
  cellWide: { flexBasis: '48%', flexGrow: 1, maxWidth: '50%', minWidth: 320 },
});
