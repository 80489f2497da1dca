import { StyleSheet, View } from 'react-native';
import type { ContractStatus } from '@/lib/schemas/contract';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

// Fieldfold's words for each state of a contract. Signing arrives in the next release, and the first
// state says so plainly rather than offering a button that does nothing.
export const CONTRACT_STATUS_LABELS: Record<ContractStatus, string> = {
  'to-sign': 'Awaiting signatures — signing comes next',
  signed: 'Signed by both',
  completed: 'Completed',
  cancelled: 'Cancelled',
};

const look: Record<ContractStatus, { bg: string; tone: 'caution' | 'cover' | 'ink' | 'muted' }> = {
  'to-sign': { bg: colors.cautionWash, tone: 'caution' },
  signed: { bg: colors.coverWash, tone: 'cover' },
  completed: { bg: colors.skyWash, tone: 'ink' },
  cancelled: { bg: colors.surfaceSunk, tone: 'muted' },
};

export function ContractStatusBadge({ status }: { status: ContractStatus }) {
  return (
    <View style={[styles.badge, { backgroundColor: look[status].bg }]}>
      <Text variant="caption" tone={look[status].tone}>
        {CONTRACT_STATUS_LABELS[status]}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({ badge: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill } });
