import { useEffect, useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { BlockFilters } from '@/hooks/api/blocks';
import { useBlocks } from '@/hooks/api/blocks';
import type { BlockCardView } from '@/lib/schemas/block';
import { formatNumber } from '@/lib/format';
import { Button, EmptyState, ErrorState, LoadingState, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { BlockCard } from './block-card';
import { MARKET_PAGE_SIZE } from './market-query';

export interface MarketResultsProps {
  filters: BlockFilters;
  /** Some filter narrows the list (so an empty list says "widen", not "none yet"). */
  filtering: boolean;
  onClear: () => void;
  wide: boolean;
}

/** The open blocks for the current filters, a page at a time: "Show more" adds the next page below. */
export function MarketResults({ filters, filtering, onClear, wide }: MarketResultsProps) {
  const [pages, setPages] = useState(1);
  // Past a capped total (the server counts exactly up to 1 000), the list ends at the first page that comes back short.
  const [shortPage, setShortPage] = useState<number | null>(null);
  const key = JSON.stringify(filters);
  useEffect(() => {
    setPages(1);
    setShortPage(null);
  }, [key]);
  const first = useBlocks({ ...filters, page: 1, pageSize: MARKET_PAGE_SIZE });

  if (first.isPending) return <LoadingState label="Finding open blocks…" />;
  if (first.isError && !first.data) return <ErrorState message={first.error.message} onRetry={() => void first.refetch()} />;

  const { total, totalCapped, items } = first.data;
  if (total === 0) {
    return filtering ? (
      <EmptyState title="No open blocks match" action={<Button title="Clear the filters" variant="secondary" onPress={onClear} />}>
        Widen the distance, move your dates, lower the days of feed or acres, or clear a filter. New blocks open through the winter.
      </EmptyState>
    ) : (
      <EmptyState title="No open blocks right now">
        When growers open blocks for bids they are listed here, with the days of feed each holds for your flock. Check back soon.
      </EmptyState>
    );
  }

  const shown = Math.min(total, pages * MARKET_PAGE_SIZE);
  const more = totalCapped ? shortPage === null && items.length === MARKET_PAGE_SIZE : shown < total;
  return (
    <View style={styles.col} aria-busy={first.isFetching}>
      <View style={styles.summary}>
        <Text variant="label" testID="market-count">
          {totalCapped ? 'More than ' : ''}
          {formatNumber(total)} open block{total === 1 && !totalCapped ? '' : 's'}
          {filtering ? ' match' : ''}
        </Text>
        {first.isPlaceholderData ? (
          <Text variant="caption" tone="muted">
            Updating…
          </Text>
        ) : null}
      </View>
      {first.isError ? <ErrorState message={first.error.message} onRetry={() => void first.refetch()} /> : null}
      <Cards items={items} wide={wide} />
      {Array.from({ length: pages - 1 }, (_, i) => (
        <MorePage key={i + 2} filters={filters} page={i + 2} wide={wide} onShort={setShortPage} />
      ))}
      {more ? (
        <Button title={totalCapped ? 'Show more' : `Show more (${formatNumber(total - shown)} left)`} variant="secondary" onPress={() => setPages((p) => p + 1)} />
      ) : total > MARKET_PAGE_SIZE || totalCapped ? (
        <Text variant="caption" tone="muted" style={styles.end}>
          That is every open block that matches.
        </Text>
      ) : null}
    </View>
  );
}

function Cards({ items, wide }: { items: BlockCardView[]; wide: boolean }) {
  return (
    <View style={styles.col}>
      {items.map((b) => (
        <BlockCard key={b.id} block={b} wide={wide} />
      ))}
    </View>
  );
}

function MorePage({ filters, page, wide, onShort }: { filters: BlockFilters; page: number; wide: boolean; onShort: (page: number) => void }) {
  const q = useBlocks({ ...filters, page, pageSize: MARKET_PAGE_SIZE });
  const short = q.data !== undefined && q.data.items.length < MARKET_PAGE_SIZE;
  useEffect(() => {
    if (short) onShort(page);
  }, [short, page, onShort]);
  if (q.isPending) return <LoadingState label="Loading more blocks…" />;
  if (q.isError) return <ErrorState message={q.error.message} onRetry={() => void q.refetch()} />;
  return <Cards items={q.data.items} wide={wide} />;
}

const styles = StyleSheet.create({
  col: { gap: space.md },
  summary: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center', gap: space.sm },
  end: { textAlign: 'center' },
});
