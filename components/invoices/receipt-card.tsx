import { StyleSheet, View } from 'react-native';
import type { InvoiceView } from '@/lib/schemas/invoice';
import { formatCents } from '@/lib/money';
import { formatDay } from '@/lib/format';
import { Card, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

/** Shown once an invoice is paid: what, when, how, and the payments service's reference. */
export function ReceiptCard({ invoice }: { invoice: InvoiceView }) {
  const r = invoice.receipt;
  if (!r) return null;
  return (
    <Card style={styles.card} testID="receipt">
      <View style={styles.head}>
        <View style={styles.mark}>
          <Text variant="label" tone="onCover">
            ✓
          </Text>
        </View>
        <Text variant="heading">Receipt</Text>
      </View>
      <Text variant="figure" testID="receipt-amount">
        {formatCents(r.amountCents)} paid
      </Text>
      <Text>
        {formatDay(r.paidDay)} · invoice {invoice.numberLabel} · {invoice.grower.businessName ?? invoice.grower.name} to {invoice.grazier.businessName ?? invoice.grazier.name}
      </Text>
      {r.method ? <Text variant="caption" tone="muted">Paid with: {r.method}</Text> : null}
      {r.reference ? <Text variant="caption" tone="muted">Payment reference: {r.reference}</Text> : null}
      <Text variant="caption" tone="muted">
        Both of you were sent this receipt by mail.
      </Text>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.sm, borderColor: colors.cover, backgroundColor: colors.coverWash },
  head: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  mark: { width: 26, height: 26, borderRadius: radius.pill, backgroundColor: colors.cover, alignItems: 'center', justifyContent: 'center' },
});
