import type { ReactNode } from 'react';
import { Link, useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { BlockView } from '@/lib/schemas/block';
import { formatDay, formatDayRange, formatNumber } from '@/lib/format';
import { useBid } from '@/hooks/api/bids';
import { useLayout } from '@/hooks/use-layout';
import { Button, Card, Notice, Screen, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { BlockFacts } from '@/components/blocks/block-facts';
import { PhotoStrip } from '@/components/blocks/photo-strip';
import { StatusBadge } from '@/components/blocks/status-badge';
import { CautionList } from '@/components/safety/caution-list';
import { formatRate, stayLine } from '@/components/bids/bid-terms';
import { formatCents } from '@/lib/money';
import { FlockCapacityCard } from './flock-capacity-card';

/** A block as a grazier sees it: photos, facts, what it holds for my flock, its cautions, and the way to bid. */
export function BlockMarketView({ block }: { block: BlockView }) {
  const { isWide } = useLayout();
  const router = useRouter();
  const bidHref = `/blocks/${block.id}/bid`;
  const action = block.viewer.myLiveBidId ? (
    <Button title="Edit my bid" onPress={() => router.push(bidHref)} />
  ) : block.viewer.canBid ? (
    <Button title="Bid on this block" onPress={() => router.push(bidHref)} />
  ) : null;

  const subtitle = [block.crop, block.placeName, `posted by ${block.owner.businessName ?? block.owner.name}`].filter(Boolean).join(' · ');
  const photos = block.photos.length ? <PhotoStrip photos={block.photos} height={isWide ? 180 : 140} /> : null;
  const bidCard = <BidCard block={block} action={action} />;
  const facts = <BlockFacts block={block} />;
  const cautions = <CautionList cautions={block.cautions} title="Cautions for this block" />;

  return (
    <Screen title={block.name} subtitle={subtitle}>
      <View style={styles.top}>
        <Link href="/">
          <Text tone="cover" variant="bodyStrong">
            ← Find grazing
          </Text>
        </Link>
        {block.status !== 'open' ? <StatusBadge status={block.status} /> : null}
      </View>
      {photos}
      {isWide ? (
        <View style={styles.wide}>
          <View style={styles.main}>
            {facts}
            {cautions}
          </View>
          <View style={styles.side}>
            <FlockCapacityCard block={block} />
            {bidCard}
          </View>
        </View>
      ) : (
        <View style={styles.col}>
          <FlockCapacityCard block={block} />
          {bidCard}
          {cautions}
          {facts}
        </View>
      )}
    </Screen>
  );
}

/** The dates a bid must fit, my live bid if I have one, and the call to action. */
function BidCard({ block, action }: { block: BlockView; action: ReactNode }) {
  return (
    <Card style={styles.bid}>
      <Text variant="heading">{block.viewer.myLiveBidId ? 'Your bid' : block.status === 'open' ? 'Bid' : 'Dates'}</Text>
      <Text>
        Animals may be on the block <Text variant="bodyStrong">{formatDayRange(block.grazeFrom, block.grazeUntil)}</Text> and must be out by{' '}
        <Text variant="bodyStrong">{formatDay(block.outBy)}</Text>.
      </Text>
      {block.earliestSafeDate && block.earliestSafeDate >= block.windowStart ? (
        <Text variant="caption" tone="muted">
          The window opens on {formatDay(block.windowStart)}, but no grazing before {formatDay(block.earliestSafeDate)}: a spray's label restriction runs until
          then.
        </Text>
      ) : null}
      {block.viewer.myLiveBidId ? <MyLiveBid bidId={block.viewer.myLiveBidId} /> : null}
      {action}
      {!action ? (
        block.status === 'open' ? (
          <Notice tone="info">Bidding is not open to this account.</Notice>
        ) : (
          // A grazier sees a block that is no longer open only when it is contracted to them.
          <Notice tone="ok" title="Awarded to you">
            <Link href="/contracts">
              <Text variant="caption" tone="cover">
                The agreed terms are in Contracts →
              </Text>
            </Link>
          </Notice>
        )
      ) : null}
    </Card>
  );
}

function MyLiveBid({ bidId }: { bidId: string }) {
  const mine = useBid(bidId);
  const bid = mine.data;
  if (mine.isPending) return <Text tone="muted">Loading your bid…</Text>;
  if (!bid) return null;
  return (
    <View style={styles.mine} testID="my-live-bid">
      <Text variant="bodyStrong">{formatRate(bid.basis, bid.rate)}</Text>
      <Text variant="caption">{stayLine(bid)}</Text>
      <Text variant="caption" tone="muted">
        Estimated total {formatCents(bid.normalised.estimatedTotalCents)} · {formatNumber(bid.normalised.headDays)} head-days
      </Text>
      {bid.conflicts.length ? (
        <Notice tone="danger" title="The block changed: your bid no longer fits">
          {bid.conflicts.map((c) => c.message).join(' ')}
        </Notice>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  top: { flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', gap: space.sm },
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 3, minWidth: 0, gap: space.lg },
  side: { flex: 2, minWidth: 300, gap: space.md },
  col: { gap: space.lg },
  bid: { gap: space.md },
  mine: { gap: 2 },
});
