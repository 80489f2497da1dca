import { StyleSheet, View } from 'react-native';
import { INVOICE_STATUS_LABELS, type InvoiceDisplayStatus } from '@/lib/schemas/invoice';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

// The words for each state live in lib/schemas/invoice.ts (mail and the PDF say the same); the look is here.
const look: Record<InvoiceDisplayStatus, { bg: string; tone: 'caution' | 'cover' | 'ink' | 'muted' | 'danger' }> = {
  draft: { bg: colors.surfaceSunk, tone: 'muted' },
  sent: { bg: colors.skyWash, tone: 'ink' },
  overdue: { bg: colors.dangerWash, tone: 'danger' },
  paid: { bg: colors.coverWash, tone: 'cover' },
  void: { bg: colors.surfaceSunk, tone: 'muted' },
};

export function InvoiceStatusBadge({ status, testID }: { status: InvoiceDisplayStatus; testID?: string }) {
  return (
    <View style={[styles.badge, { backgroundColor: look[status].bg }]}>
      <Text variant="caption" tone={look[status].tone} testID={testID}>
        {INVOICE_STATUS_LABELS[status]}
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({ badge: { alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill } });
