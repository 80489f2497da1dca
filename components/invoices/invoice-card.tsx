import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import type { InvoiceListItem } from '@/lib/schemas/invoice';
import { formatCents } from '@/lib/money';
import { formatDay } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { InvoiceStatusBadge } from './invoice-status';
import { counterparty } from './invoice-sorting';

/** One invoice on a phone: number and amount, who, the block, and when it is (or was) due. */
export function InvoiceCard({ invoice: inv }: { invoice: InvoiceListItem }) {
  return (
    <Link href={`/invoices/${inv.id}`} asChild>
      <Pressable
        role="link"
        aria-label={`Invoice ${inv.numberLabel}, ${formatCents(inv.totalCents)}`}
        // One flat style object: Link's asChild slot spreads the child's style, so arrays are lost on the web.
        style={StyleSheet.flatten(styles.card)}
        testID={`invoice-card-${inv.id}`}
      >
        <View style={styles.head}>
          <Text variant="bodyStrong">{inv.numberLabel}</Text>
          <Text variant="figure">{formatCents(inv.totalCents)}</Text>
        </View>
        <Text>
          {counterparty(inv)} · {inv.block.name}
        </Text>
        <View style={styles.foot}>
          <InvoiceStatusBadge status={inv.displayStatus} />
          <Text variant="caption" tone="muted">
            {inv.receipt ? `Paid ${formatDay(inv.receipt.paidDay)}` : `Due ${formatDay(inv.dueDate)}`}
          </Text>
        </View>
      </Pressable>
    </Link>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.lg, gap: space.xs },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'baseline', gap: space.sm },
  foot: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' },
});
