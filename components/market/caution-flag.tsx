import { StyleSheet, View } from 'react-native';
import type { BlockView, CautionFlagView } from '@/lib/schemas/block';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

/** A spray restriction that ends before the window opens does not limit the stay, so it does not lead on a card. */
function binds(c: CautionFlagView, block: Pick<BlockView, 'earliestSafeDate' | 'windowStart'>): boolean {
  return !(c.key === 'pesticide-restriction' && block.earliestSafeDate != null && block.earliestSafeDate < block.windowStart);
}

/**
 * The cautions worth flagging on a card, most serious first (the server's order); info notes and spent spray
 * restrictions are left to the block page, which lists every caution.
 */
export function flaggedCautions<C extends CautionFlagView>(block: Pick<BlockView, 'earliestSafeDate' | 'windowStart'> & { cautions: readonly C[] }): C[] {
  return block.cautions.filter((c) => c.tone !== 'info' && binds(c, block));
}

const look = {
  danger: { bg: colors.dangerWash, line: colors.danger, tone: 'danger' as const, mark: '!' },
  caution: { bg: colors.cautionWash, line: colors.cautionLine, tone: 'caution' as const, mark: '!' },
  info: { bg: colors.skyWash, line: colors.sky, tone: 'ink' as const, mark: 'i' },
};

/** A one-line flag for a caution; the full text is on the block page. */
export function CautionFlag({ caution, more, lines = 2 }: { caution: CautionFlagView; more?: number; /** Lines of text before it is cut short (a narrow table cell needs more). */ lines?: number }) {
  const l = look[caution.tone];
  return (
    <View style={[styles.flag, { backgroundColor: l.bg, borderColor: l.line }]} aria-label={`Caution: ${caution.title}`}>
      <Text variant="label" tone={l.tone}>
        {l.mark}
      </Text>
      <Text variant="caption" tone={l.tone} style={styles.text} numberOfLines={lines}>
        {caution.title}
        {more ? ` · ${more} more on the block page` : ''}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  flag: { flexDirection: 'row', alignItems: 'center', gap: space.sm, alignSelf: 'flex-start', paddingHorizontal: space.md, paddingVertical: space.xs, borderRadius: radius.pill, borderWidth: 1, maxWidth: '100%' },
  text: { flexShrink: 1 },
});
