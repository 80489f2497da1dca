import { Stack, useLocalSearchParams } from 'expo-router';
import { ErrorState, LoadingState } from '@/components/ui';
import { BlockOwnerView } from '@/components/blocks/block-owner-view';
import { BlockMarketView } from '@/components/market/block-market-view';
import { useBlock } from '@/hooks/api/blocks';

// One address for a block: its owner manages it and compares bids; a grazier reads it and bids.
export default function BlockScreen() {
  const { blockId } = useLocalSearchParams<{ blockId: string }>();
  const block = useBlock(blockId);
  if (block.isPending) return <LoadingState label="Loading the block…" />;
  if (block.isError) return <ErrorState message={block.error.message} onRetry={() => block.refetch()} />;
  return (
    <>
      <Stack.Screen options={{ title: `${block.data.name} · Fieldfold` }} />
      {block.data.viewer.isOwner ? <BlockOwnerView block={block.data} /> : <BlockMarketView block={block.data} />}
    </>
  );
}
