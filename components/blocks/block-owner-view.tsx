import { useState } from 'react';
import { View } from 'react-native';
import { useRouter } from 'expo-router';
import type { BlockView } from '@/lib/schemas/block';
import { formatDay } from '@/lib/format';
import { Button, Card, Notice, Screen, Text, TwoPane } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { CautionList } from '@/components/safety/caution-list';
import { BidComparison } from '@/components/bids/bid-comparison';
import { useBlockAction } from '@/hooks/api/blocks';
import { ApiError } from '@/hooks/api/client';
import { BlockFacts } from './block-facts';
import { BlockPhotos } from './block-photos';
import { StatusBadge } from './status-badge';

function OwnerActions({ block }: { block: BlockView }) {
  const router = useRouter();
  const publish = useBlockAction(block.id, 'publish');
  const withdraw = useBlockAction(block.id, 'withdraw');
  const [confirmWithdraw, setConfirmWithdraw] = useState(false);
  const error = publish.error ?? withdraw.error;
  const editable = block.status === 'draft' || block.status === 'open';
  return (
    <View style={{ gap: space.sm }}>
      <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>
        {block.status === 'draft' ? <Button title="Open for bids" loading={publish.isPending} onPress={() => publish.mutate()} testID="publish-block" /> : null}
        {editable ? <Button title="Edit" variant="secondary" onPress={() => router.push(`/blocks/${block.id}/edit`)} /> : null}
        {editable && !confirmWithdraw ? <Button title="Withdraw" variant="quiet" onPress={() => setConfirmWithdraw(true)} /> : null}
      </View>
      {confirmWithdraw ? (
        <Notice tone="caution" title="Withdraw this block?">
          <Text variant="caption">Graziers stop seeing it and every live bid is declined. You can post it again as a new block.</Text>
          <View style={{ flexDirection: 'row', gap: space.sm, marginTop: space.xs }}>
            <Button title="Withdraw block" variant="danger" compact loading={withdraw.isPending} onPress={() => withdraw.mutate(undefined, { onSuccess: () => setConfirmWithdraw(false) })} />
            <Button title="Keep it" variant="quiet" compact onPress={() => setConfirmWithdraw(false)} />
          </View>
        </Notice>
      ) : null}
      {error ? <Notice tone="danger">{error instanceof ApiError ? error.message : 'That did not go through.'}</Notice> : null}
    </View>
  );
}

/** The grower's page for one of their blocks: its state and actions, the bids compared, the facts and cautions. */
export function BlockOwnerView({ block }: { block: BlockView }) {
  return (
    <Screen back={{ label: 'My blocks', href: '/' }} title={block.name} subtitle={`${block.crop} · ${block.placeName ?? 'no place name'} · updated ${formatDay(block.updatedAt.slice(0, 10))}`} actions={<StatusBadge status={block.status} />}>
      <OwnerActions block={block} />
      {/* The comparison needs the full width for its columns; the facts and cautions sit below it. */}
      <Card>
        <Text variant="heading">Bids{block.liveBidCount ? ` · ${block.liveBidCount} live` : ''}</Text>
        {block.status === 'draft' ? (
          <Text tone="muted">Open the block for bids when the details are right; graziers cannot see a draft.</Text>
        ) : (
          <BidComparison block={block} />
        )}
      </Card>
      <TwoPane
        main={
          <>
            <BlockFacts block={block} />
            <BlockPhotos block={block} />
          </>
        }
        side={<CautionList cautions={block.cautions} title="Cautions on this block" />}
      />
    </Screen>
  );
}
