import { StyleSheet, View } from 'react-native';
import type { InvoiceSide, InvoiceTotals } from '@/lib/schemas/invoice';
import { formatCents } from '@/lib/money';
import { Figure } from '@/components/ui';
import { space } from '@/components/ui/theme';

function count(n: number, what = 'invoice'): string {
  return `${n} ${what}${n === 1 ? '' : 's'}`;
}

/** Three figures over the list: still owed, of that overdue, and paid this season. */
export function InvoiceTotalsRow({ totals, side }: { totals: InvoiceTotals; side: InvoiceSide }) {
  return (
    <View style={styles.row} role="group" aria-label={side === 'receivable' ? 'Receivables' : 'Payables'}>
      <Figure
        strong
        label={side === 'receivable' ? 'Owed to you' : 'You owe'}
        value={formatCents(totals.outstandingCents)}
        detail={count(totals.outstandingCount)}
        testID="total-outstanding"
      />
      <Figure label="Overdue" value={formatCents(totals.overdueCents)} detail={count(totals.overdueCount)} testID="total-overdue" />
      <Figure
        label={`Paid this season (${totals.season})`}
        value={formatCents(totals.paidThisSeasonCents)}
        detail={count(totals.paidThisSeasonCount)}
        testID="total-paid"
      />
    </View>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm } });
