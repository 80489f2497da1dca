import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { BidView } from '@/lib/schemas/bid';
import type { BlockView } from '@/lib/schemas/block';
import { formatCents } from '@/lib/money';
import { formatDayRange, formatNumber } from '@/lib/format';
import { Button, Card, EmptyState, ErrorState, LoadingState, Notice, Text } from '@/components/ui';
import { colors, fonts, radius, space } from '@/components/ui/theme';
import { useLayout } from '@/hooks/use-layout';
import { useAwardBid, useBlockBids } from '@/hooks/api/bids';
import { ApiError } from '@/hooks/api/client';
import { BID_SORT_KEYS, sortBids, type BidSortKey } from './bid-sorting';
import { BASIS_UNIT } from '@/lib/terms';
import { SPECIES_CAUTION_KEYS } from '@/lib/grazing/safety';
import { CautionFlag } from '@/components/market/caution-flag';


/** Declined and withdrawn bids stay listed for the record, dimmed; the accepted one stays bright. */
const isSetAside = (b: BidView) => b.status === 'declined' || b.status === 'withdrawn';

const STATUS_WORDS = { live: 'Live', accepted: 'Awarded', declined: 'Not chosen', withdrawn: 'Withdrawn' } as const;

function Utilisation({ bid }: { bid: BidView }) {
  const n = bid.normalised;
  const pct = Number.isFinite(n.predictedUtilizationPct) ? `${formatNumber(n.predictedUtilizationPct, 0)} %` : 'more than stands';
  return (
    <Text variant="caption" tone={n.overgrazes ? 'danger' : 'ok'}>
      {pct} of standing vs {formatNumber(n.targetUtilizationPct)} % target{n.overgrazes ? ' — overgrazes' : ''}
    </Text>
  );
}

/** The cautions this bid's species brings to the block (copper for sheep…): the block-wide ones are beside the table. */
function SpeciesCautions({ bid, lines }: { bid: BidView; lines?: number }) {
  const own = bid.cautions.filter((c) => c.tone !== 'info' && SPECIES_CAUTION_KEYS.includes(c.key));
  if (!own.length) return null;
  return (
    <View style={styles.flags} testID={`bid-cautions-${bid.id}`}>
      {own.map((c) => (
        <CautionFlag key={c.key} caution={c} lines={lines} />
      ))}
    </View>
  );
}

function AwardButton({ bid, block, onAwarded }: { bid: BidView; block: BlockView; onAwarded: (name: string) => void }) {
  const award = useAwardBid(block.id);
  const [confirming, setConfirming] = useState(false);
  const who = bid.grazier.businessName ?? bid.grazier.name;
  if (bid.status !== 'live' || block.status !== 'open') return null;
  if (bid.conflicts.length) return <Text variant="caption" tone="danger">{bid.conflicts[0].message}</Text>;
  if (!confirming) return <Button title="Award" compact onPress={() => setConfirming(true)} testID={`award-${bid.id}`} />;
  return (
    <View style={styles.confirm}>
      <Text variant="caption">
        Award to {who}? The other bids are declined and a contract is drawn up for both of you to sign.
      </Text>
      {award.error ? <Text variant="caption" tone="danger">{award.error instanceof ApiError ? award.error.message : 'The award did not go through.'}</Text> : null}
      <View style={styles.confirmRow}>
        <Button
          title="Confirm award"
          compact
          loading={award.isPending}
          testID={`confirm-award-${bid.id}`}
          onPress={() => award.mutate(bid.id, { onSuccess: () => onAwarded(who) })}
        />
        <Button title="Cancel" compact variant="quiet" onPress={() => setConfirming(false)} />
      </View>
    </View>
  );
}

function SortHeader({ k, sort, onSort, flex }: { k: BidSortKey; sort: { key: BidSortKey; dir: 'asc' | 'desc' }; onSort: (k: BidSortKey) => void; flex: number }) {
  const on = sort.key === k;
  return (
    <Pressable role="button" aria-label={`Sort by ${BID_SORT_KEYS[k].label}`} onPress={() => onSort(k)} style={[styles.th, { flex }]}>
      <Text variant="caption" tone={on ? 'cover' : 'muted'} style={styles.thText}>
        {BID_SORT_KEYS[k].label}
        {on ? (sort.dir === 'asc' ? ' ↑' : ' ↓') : ''}
      </Text>
    </Pressable>
  );
}

function BidTable({ bids, block, sort, onSort, onAwarded }: { bids: BidView[]; block: BlockView; sort: { key: BidSortKey; dir: 'asc' | 'desc' }; onSort: (k: BidSortKey) => void; onAwarded: (n: string) => void }) {
  return (
    <View style={styles.table} role="table" aria-label="Bids compared">
        <View style={[styles.tr, styles.thead]} role="row">
          <View style={[styles.th, { flex: 2.2 }]}>
            <Text variant="caption" tone="muted" style={styles.thText}>
              Grazier
            </Text>
          </View>
          <View style={[styles.th, { flex: 1.6 }]}>
            <Text variant="caption" tone="muted" style={styles.thText}>
              Offer
            </Text>
          </View>
          <SortHeader k="headDays" sort={sort} onSort={onSort} flex={1.6} />
          <SortHeader k="total" sort={sort} onSort={onSort} flex={1.1} />
          <View style={{ flex: 1.3 }}>
            <SortHeader k="perAcre" sort={sort} onSort={onSort} flex={0} />
            <SortHeader k="perHeadDay" sort={sort} onSort={onSort} flex={0} />
          </View>
          <SortHeader k="utilisation" sort={sort} onSort={onSort} flex={1.5} />
          <View style={[styles.th, { flex: 1.2 }]} />
        </View>
        {bids.map((b) => (
          <View key={b.id} style={[styles.tr, isSetAside(b) && styles.faded]} role="row" testID={`bid-row-${b.id}`}>
            <View style={[styles.td, { flex: 2.2 }]}>
              <Text variant="bodyStrong">{b.grazier.businessName ?? b.grazier.name}</Text>
              <Text variant="caption" tone="muted">
                {b.grazier.completedContracts} completed on Fieldfold · {STATUS_WORDS[b.status]}
              </Text>
            </View>
            <View style={[styles.td, { flex: 1.6 }]}>
              <Text>
                ${b.rate} {BASIS_UNIT[b.basis]}
              </Text>
              <Text variant="caption" tone="muted">
                {b.services.length ? b.services.join(', ') : 'no extra services'}
              </Text>
            </View>
            <View style={[styles.td, { flex: 1.6 }]}>
              <Text>
                {formatNumber(b.headCount)} {b.species} × {b.normalised.days} d
              </Text>
              <Text variant="caption" tone="muted">
                {formatNumber(b.normalised.headDays)} head-days · {formatDayRange(b.startDate, b.endDate)}
              </Text>
              <SpeciesCautions bid={b} lines={4} />
            </View>
            <View style={[styles.td, { flex: 1.1 }]}>
              <Text variant="bodyStrong">{formatCents(b.normalised.estimatedTotalCents)}</Text>
            </View>
            <View style={[styles.td, { flex: 1.3 }]}>
              <Text>{formatCents(b.normalised.costPerAcreCents)}/acre</Text>
              <Text variant="caption" tone="muted">
                ${b.normalised.costPerHeadDayRate}/head-day
              </Text>
            </View>
            <View style={[styles.td, { flex: 1.5 }]}>
              <Utilisation bid={b} />
            </View>
            <View style={[styles.td, { flex: 1.2 }]}>
              <AwardButton bid={b} block={block} onAwarded={onAwarded} />
            </View>
          </View>
        ))}
    </View>
  );
}

function BidCard({ bid: b, block, onAwarded }: { bid: BidView; block: BlockView; onAwarded: (n: string) => void }) {
  return (
    <Card style={isSetAside(b) ? styles.faded : undefined} testID={`bid-card-${b.id}`}>
      <View style={styles.cardHead}>
        <View style={{ flex: 1 }}>
          <Text variant="bodyStrong">{b.grazier.businessName ?? b.grazier.name}</Text>
          <Text variant="caption" tone="muted">
            {b.grazier.completedContracts} completed on Fieldfold · {STATUS_WORDS[b.status]}
          </Text>
        </View>
        <Text variant="figure">{formatCents(b.normalised.estimatedTotalCents)}</Text>
      </View>
      <Text>
        ${b.rate} {BASIS_UNIT[b.basis]} · {formatNumber(b.headCount)} {b.species} × {b.normalised.days} days ({formatNumber(b.normalised.headDays)} head-days)
      </Text>
      <Text variant="caption" tone="muted">
        {formatDayRange(b.startDate, b.endDate)} · {formatCents(b.normalised.costPerAcreCents)}/acre · ${b.normalised.costPerHeadDayRate}/head-day
      </Text>
      <Utilisation bid={b} />
      <SpeciesCautions bid={b} />
      {b.note ? <Text variant="caption">“{b.note}”</Text> : null}
      <AwardButton bid={b} block={block} onAwarded={onAwarded} />
    </Card>
  );
}

/** The grower's side-by-side of every bid on a block, each put on the same footing by lib/grazing/bid-compare. */
export function BidComparison({ block }: { block: BlockView }) {
  const { isWide } = useLayout();
  const bids = useBlockBids(block.id);
  const [sort, setSort] = useState<{ key: BidSortKey; dir: 'asc' | 'desc' }>({ key: 'total', dir: 'asc' });
  const [awardedTo, setAwardedTo] = useState<string | null>(null);
  const onSort = (key: BidSortKey) => setSort((s) => ({ key, dir: s.key === key && s.dir === 'asc' ? 'desc' : 'asc' }));

  if (bids.isPending) return <LoadingState label="Loading bids…" />;
  if (bids.isError) return <ErrorState message={bids.error.message} onRetry={() => bids.refetch()} />;
  if (!bids.data.length) {
    return (
      <EmptyState title={block.status === 'open' ? 'No bids yet' : 'No bids'}>
        {block.status === 'open' ? 'Graziers near you see this block now. You will get an email when a bid arrives.' : 'Open the block for bids to let graziers find it.'}
      </EmptyState>
    );
  }
  const sorted = sortBids(bids.data, sort.key, sort.dir);
  return (
    <View style={{ gap: space.md }}>
      {awardedTo ? <Notice tone="ok" title={`Awarded to ${awardedTo}`}>The contract is in Contracts, waiting for both signatures.</Notice> : null}
      {!isWide ? (
        <View style={styles.sortRow}>
          <Text variant="caption" tone="muted">
            Sort by
          </Text>
          {(['total', 'perHeadDay', 'utilisation', 'record'] as const).map((k) => (
            <Pressable key={k} onPress={() => onSort(k)} role="button" aria-label={`Sort by ${BID_SORT_KEYS[k].label}`}>
              <Text variant="caption" tone={sort.key === k ? 'cover' : 'muted'}>
                {BID_SORT_KEYS[k].label}
                {sort.key === k ? (sort.dir === 'asc' ? ' ↑' : ' ↓') : ''}
              </Text>
            </Pressable>
          ))}
        </View>
      ) : null}
      {isWide ? (
        <BidTable bids={sorted} block={block} sort={sort} onSort={onSort} onAwarded={setAwardedTo} />
      ) : (
        sorted.map((b) => <BidCard key={b.id} bid={b} block={block} onAwarded={setAwardedTo} />)
      )}
      <Text variant="caption" tone="muted">
        Totals are estimates from each bid's head count and dates; the invoice bills the head-days both of you sign off in the grazing log. Predicted
        take uses the bid's body weight and an intake rule of thumb for its species (NCAT ATTRA, "Grazier's Math").
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  flags: { gap: space.xs, marginTop: space.xs },
  table: { width: '100%', borderWidth: 1, borderColor: colors.line, borderRadius: radius.lg, backgroundColor: colors.surface, overflow: 'hidden' },
  tr: { flexDirection: 'row', borderTopWidth: 1, borderTopColor: colors.line, alignItems: 'flex-start' },
  thead: { borderTopWidth: 0, backgroundColor: colors.surfaceSunk },
  th: { paddingHorizontal: space.md, paddingVertical: space.sm },
  thText: { fontFamily: fonts.bodyStrong },
  td: { paddingHorizontal: space.md, paddingVertical: space.md, gap: 2 },
  faded: { opacity: 0.6 },
  cardHead: { flexDirection: 'row', gap: space.md, alignItems: 'flex-start' },
  confirm: { gap: space.xs, padding: space.sm, borderRadius: radius.md, backgroundColor: colors.cautionWash },
  confirmRow: { flexDirection: 'row', gap: space.xs, flexWrap: 'wrap' },
  sortRow: { flexDirection: 'row', gap: space.md, flexWrap: 'wrap', alignItems: 'center' },
});
