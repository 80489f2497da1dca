import { StyleSheet, View } from 'react-native';
import type { BlockStatus } from '@/lib/schemas/block';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

// Fieldfold's own words for each state of a block.
export const BLOCK_STATUS_LABELS: Record<BlockStatus, string> = {
  draft: 'Draft — only you see it',
  open: 'Taking bids',
  awarded: 'Awarded',
  closed: 'Closed',
  withdrawn: 'Withdrawn',
};

const tone: Record<BlockStatus, { bg: string; fg: 'ink' | 'cover' | 'muted' | 'clay' }> = {
  draft: { bg: colors.surfaceSunk, fg: 'muted' },
  open: { bg: colors.coverWash, fg: 'cover' },
  awarded: { bg: colors.skyWash, fg: 'ink' },
  closed: { bg: colors.surfaceSunk, fg: 'muted' },
  withdrawn: { bg: colors.clayWash, fg: 'clay' },
};

export function StatusBadge({ status }: { status: BlockStatus }) {
  return (
    <View style={[styles.badge, { backgroundColor: tone[status].bg }]}>
      <Text variant="caption" tone={tone[status].fg}>
        {BLOCK_STATUS_LABELS[status]}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({ badge: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill } });
