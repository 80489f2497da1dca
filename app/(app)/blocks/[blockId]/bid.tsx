import { Link, Stack, useLocalSearchParams, useRouter } from 'expo-router';
import { EmptyState, ErrorState, LoadingState, Screen, Text } from '@/components/ui';
import { BidForm } from '@/components/bids/bid-form';
import { useBlock } from '@/hooks/api/blocks';
import { useBid } from '@/hooks/api/bids';
import { useSession } from '@/hooks/auth/session';
import { formatNumber } from '@/lib/format';

// A new bid on the block, or a change to my live bid on it (the block says which); on success, My bids.
export default function BidScreen() {
  const { blockId } = useLocalSearchParams<{ blockId: string }>();
  const router = useRouter();
  const { user } = useSession();
  const block = useBlock(blockId);
  const mine = useBid(block.data?.viewer.myLiveBidId);

  if (block.isPending) return <LoadingState label="Loading the block…" />;
  if (block.isError) return <ErrorState message={block.error.message} onRetry={() => block.refetch()} />;
  const b = block.data;
  const liveId = b.viewer.myLiveBidId;
  if (liveId && mine.isPending) return <LoadingState label="Loading your bid…" />;
  if (liveId && mine.isError) return <ErrorState message={mine.error.message} onRetry={() => mine.refetch()} />;
  const bid = liveId && mine.data?.id === liveId ? mine.data : undefined;

  const back = (
    <Link href={`/blocks/${b.id}`}>
      <Text tone="cover" variant="bodyStrong">
        ← Back to the block
      </Text>
    </Link>
  );
  const title = bid ? 'Change my bid' : 'Bid on this block';
  return (
    <Screen title={title} subtitle={`${b.name} · ${b.crop} · ${formatNumber(b.acres, 2)} acres`}>
      <Stack.Screen options={{ title: `${title} · ${b.name} · Fieldfold` }} />
      {back}
      {liveId && !bid ? (
        <ErrorState message="Your live bid on this block was not found. Open My bids to see where it stands." onRetry={() => mine.refetch()} />
      ) : !bid && !b.viewer.canBid ? (
        <EmptyState title="This block is not taking bids">
          {b.status === 'open' ? 'Only grazier accounts can bid, and not on their own blocks.' : 'The grower has awarded, closed or withdrawn it.'}
        </EmptyState>
      ) : (
        <BidForm block={b} user={user} bid={bid} onDone={() => router.dismissTo('/bids')} />
      )}
    </Screen>
  );
}
