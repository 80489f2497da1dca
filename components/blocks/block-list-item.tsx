import { Pressable, StyleSheet, View } from 'react-native';
import { useRouter } from 'expo-router';
import type { BlockCardView } from '@/lib/schemas/block';
import { formatDay, formatDayRange, formatNumber } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { StatusBadge } from './status-badge';

/** One of the grower's own blocks in their list. */
export function OwnBlockItem({ block }: { block: BlockCardView }) {
  const router = useRouter();
  return (
      <Pressable
        role="link"
        onPress={() => router.push(`/blocks/${block.id}`)}
        style={(s) => [styles.item, (s as { hovered?: boolean }).hovered && styles.hover]}
        aria-label={`Block ${block.name}`}
      >
        <View style={styles.head}>
          <Text variant="heading" style={{ flexShrink: 1 }}>
            {block.name}
          </Text>
          <StatusBadge status={block.status} />
        </View>
        <Text tone="muted">
          {formatNumber(block.acres, 2)} acres of {block.crop}
          {block.placeName ? ` · ${block.placeName}` : ''}
        </Text>
        <Text variant="caption">
          Grazeable {formatDayRange(block.grazeFrom, block.grazeUntil)} · out by {formatDay(block.outBy)}
        </Text>
        {block.status === 'open' ? (
          <Text variant="label" tone="cover">
            {block.liveBidCount ? `${block.liveBidCount} live bid${block.liveBidCount === 1 ? '' : 's'} — compare them` : 'No bids yet'}
          </Text>
        ) : null}
      </Pressable>
  );
}

const styles = StyleSheet.create({
  item: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.lg, gap: space.xs },
  hover: { borderColor: colors.cover },
  head: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, alignItems: 'flex-start' },
});
