import { StyleSheet, View } from 'react-native';
import { CONTRACT_STATUS_LABELS, type ContractStatus } from '@/lib/schemas/contract';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

// The words for each state live in lib/schemas/contract.ts (mail and PDFs say the same); the look is here.
const look: Record<ContractStatus, { bg: string; tone: 'caution' | 'cover' | 'ink' | 'muted' }> = {
  'to-sign': { bg: colors.cautionWash, tone: 'caution' },
  signed: { bg: colors.coverWash, tone: 'cover' },
  grazing: { bg: colors.coverWash, tone: 'cover' },
  'sign-off': { bg: colors.cautionWash, tone: 'caution' },
  agreed: { bg: colors.skyWash, tone: 'ink' },
  invoiced: { bg: colors.skyWash, tone: 'ink' },
  paid: { bg: colors.coverWash, tone: 'cover' },
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
