import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { BidStatus, BidView } from '@/lib/schemas/bid';
import { formatCents } from '@/lib/money';
import { formatNumber } from '@/lib/format';
import { Card, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { BID_STATUS_LABELS, formatRate, stayLine } from './bid-terms';

const badge: Record<BidStatus, { bg: string; tone: 'cover' | 'ink' | 'muted' | 'clay' }> = {
  live: { bg: colors.coverWash, tone: 'cover' },
  accepted: { bg: colors.skyWash, tone: 'ink' },
  declined: { bg: colors.surfaceSunk, tone: 'muted' },
  withdrawn: { bg: colors.clayWash, tone: 'clay' },
};

export function BidStatusBadge({ status }: { status: BidStatus }) {
  return (
    <View style={[styles.badge, { backgroundColor: badge[status].bg }]}>
      <Text variant="caption" tone={badge[status].tone}>
        {BID_STATUS_LABELS[status]}
      </Text>
    </View>
  );
}

/** One of my bids: its block, terms, the figures the grower compares, and what happened to it. */
export function MyBidCard({ bid, contractId }: { bid: BidView; contractId?: string }) {
  const n = bid.normalised;
  // A grazier may open a block while it is open, or once it is contracted to them; otherwise it is private again.
  const blockOpen = bid.block.status === 'open' || bid.status === 'accepted';
  return (
    <Card style={styles.card} testID={`my-bid-${bid.id}`}>
      <View style={styles.head}>
        {blockOpen ? (
          <Link href={`/blocks/${bid.blockId}`}>
            <Text variant="heading" tone="cover">
              {bid.block.name} →
            </Text>
          </Link>
        ) : (
          <Text variant="heading">{bid.block.name}</Text>
        )}
        <BidStatusBadge status={bid.status} />
      </View>
      <Text variant="caption" tone="muted">
        {bid.block.crop}
        {bid.block.placeName ? ` · ${bid.block.placeName}` : ''} · {formatNumber(bid.block.acres, 2)} acres
      </Text>
      <Text variant="bodyStrong">{formatRate(bid.basis, bid.rate)}</Text>
      <Text>{stayLine(bid)}</Text>
      <View style={styles.figures}>
        <Figure label="Estimated total" value={formatCents(n.estimatedTotalCents)} />
        <Figure label="Head-days" value={formatNumber(n.headDays)} />
        <Figure label="Per acre" value={formatCents(n.costPerAcreCents)} />
        <Figure label="Per head-day" value={`$${n.costPerHeadDayRate}`} />
      </View>
      <Text variant="caption" tone={n.overgrazes ? 'danger' : 'muted'}>
        Takes {Number.isFinite(n.predictedUtilizationPct) ? `${formatNumber(n.predictedUtilizationPct)} %` : 'more than stands'} of the standing forage; target{' '}
        {formatNumber(n.targetUtilizationPct)} %{n.overgrazes ? ' — over the target' : ''}
      </Text>
      {bid.services.length ? (
        <Text variant="caption" tone="muted">
          Includes {bid.services.join(', ')}
        </Text>
      ) : null}
      <Outcome bid={bid} contractId={contractId} />
    </Card>
  );
}

function Outcome({ bid, contractId }: { bid: BidView; contractId?: string }) {
  switch (bid.status) {
    case 'live':
      return (
        <View style={styles.col}>
          {bid.conflicts.length ? (
            <Notice tone="danger" title="The grower changed the block: this bid no longer fits">
              <Text variant="caption">{bid.conflicts.map((c) => c.message).join(' ')} It cannot be awarded until you change it.</Text>
            </Notice>
          ) : null}
          <Link href={`/blocks/${bid.blockId}/bid`}>
            <Text variant="bodyStrong" tone="cover">
              Change or withdraw this bid →
            </Text>
          </Link>
        </View>
      );
    case 'accepted':
      return contractId ? (
        <Link href={`/contracts/${contractId}`}>
          <Text variant="bodyStrong" tone="cover">
            Open the contract →
          </Text>
        </Link>
      ) : (
        <Text variant="caption" tone="muted">
          Awarded to you: the contract is in Contracts.
        </Text>
      );
    case 'declined':
      return (
        <Text variant="caption" tone="muted">
          {bid.block.status === 'awarded' || bid.block.status === 'closed' ? 'The grower awarded another bid.' : 'The grower did not take this bid.'}
        </Text>
      );
    case 'withdrawn':
      return bid.block.status === 'open' ? (
        <Link href={`/blocks/${bid.blockId}`}>
          <Text variant="caption" tone="cover">
            The block is still open: bid again →
          </Text>
        </Link>
      ) : (
        <Text variant="caption" tone="muted">
          You withdrew it.
        </Text>
      );
  }
}

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <View style={styles.figure}>
      <Text variant="caption" tone="muted">
        {label}
      </Text>
      <Text variant="label">{value}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.sm, flexWrap: 'wrap' },
  badge: { paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill },
  figures: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  figure: { flexGrow: 1, flexBasis: '40%', paddingHorizontal: space.md, paddingVertical: space.xs, borderRadius: radius.md, backgroundColor: colors.paper },
  col: { gap: space.sm },
});
