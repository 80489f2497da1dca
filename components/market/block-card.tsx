import { Image, Pressable, StyleSheet, View } from 'react-native';
import { Link } from 'expo-router';
import type { BlockCardView } from '@/lib/schemas/block';
import { formatDay, formatDayRange, formatNumber, formatWholeDays } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { photoSrc } from '@/components/blocks/photo-strip';
import { CautionFlag, flaggedCautions } from './caution-flag';

/** One open block in Find grazing: what a grazier decides on at a glance; the whole card opens the block. */
export function BlockCard({ block, wide }: { block: BlockCardView; wide?: boolean }) {
  const photo = block.photos[0];
  const flagged = flaggedCautions(block);
  const caution = flagged[0];
  const place = [block.crop, block.placeName].filter(Boolean).join(' · ');
  return (
    <Link href={`/blocks/${block.id}`} asChild>
      <Pressable
        role="link"
        aria-label={`${block.name}, ${place}`}
        testID={`block-card-${block.id}`}
        // One flat style object: Link's asChild slot spreads the child's style, so arrays and functions are lost on the web.
        style={StyleSheet.flatten([styles.card, wide && styles.cardWide])}
      >
        {photo ? (
          <Image
            source={{ uri: photoSrc(photo.url) }}
            style={wide ? styles.thumbWide : styles.thumb}
            accessibilityLabel={`Photo of ${block.name}`}
            resizeMode="cover"
          />
        ) : null}
        <View style={styles.body}>
          <View style={styles.head}>
            <Text variant="heading" style={styles.name}>
              {block.name}
            </Text>
            {block.distanceMiles != null ? (
              <Text variant="label" tone="muted">
                {formatNumber(block.distanceMiles, 1)} mi
              </Text>
            ) : null}
          </View>
          <Text variant="caption" tone="muted">
            {place} · {formatNumber(block.acres, 2)} acres · {block.speciesAllowed.join(' and ')}
          </Text>

          <View style={styles.facts}>
            <Fact label="Grazeable" value={formatDayRange(block.grazeFrom, block.grazeUntil)} />
            <Fact label="Out by" value={formatDay(block.outBy)} />
          </View>

          {block.daysForMyFlock != null && block.flockFit ? (
            <Text variant="bodyStrong" tone="cover" testID="card-days">
              Feeds your {formatNumber(block.flockFit.headCount)} head for {formatWholeDays(block.daysForMyFlock)}
            </Text>
          ) : (
            <Text variant="caption" tone="muted">
              Add your flock in Account to see the days of feed here.
            </Text>
          )}

          {block.viewer.myLiveBidId ? (
            <View style={styles.mine}>
              <Text variant="caption" tone="cover">
                You have a live bid on this block
              </Text>
            </View>
          ) : null}
          {caution ? <CautionFlag caution={caution} more={flagged.length - 1} /> : null}
        </View>
      </Pressable>
    </Link>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <View style={styles.fact}>
      <Text variant="caption" tone="muted">
        {label}
      </Text>
      <Text variant="label">{value}</Text>
    </View>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, overflow: 'hidden' },
  cardWide: { flexDirection: 'row' },
  mine: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill, backgroundColor: colors.coverWash },
  thumb: { width: '100%', height: 132, backgroundColor: colors.surfaceSunk },
  thumbWide: { width: 180, alignSelf: 'stretch', minHeight: 150, backgroundColor: colors.surfaceSunk },
  body: { flex: 1, padding: space.lg, gap: space.sm },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'baseline', gap: space.sm },
  name: { flexShrink: 1 },
  facts: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  fact: { flexGrow: 1, flexBasis: 130, paddingHorizontal: space.md, paddingVertical: space.sm, borderRadius: radius.md, backgroundColor: colors.paper, gap: 2 },
});
