import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { InvoiceSide } from '@/lib/schemas/invoice';
import { useInvoices } from '@/hooks/api/invoices';
import { useLayout } from '@/hooks/use-layout';
import { Button, Chip, EmptyState, ErrorState, LoadingState, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { InvoiceCard } from './invoice-card';
import { InvoiceTable } from './invoice-table';
import { InvoiceTotalsRow } from './invoice-totals';
import { INVOICE_SORT_KEYS, sortInvoices, type InvoiceSortKey, type SortDir } from './invoice-sorting';

const PHONE_SORTS: InvoiceSortKey[] = ['due', 'amount', 'status', 'number'];

/**
 * The money view of one side: totals over every invoice, then the invoices a page at a time — cards on a phone, a
 * sortable table from 1024 px (sorted among those shown; "Show more" fetches the next page, due first).
 */
export function InvoiceList({ side }: { side: InvoiceSide }) {
  const invoices = useInvoices(side);
  const { isWide } = useLayout();
  const [sort, setSort] = useState<{ key: InvoiceSortKey; dir: SortDir }>({ key: 'status', dir: 'asc' });
  const onSort = (key: InvoiceSortKey) => setSort((s) => ({ key, dir: s.key === key && s.dir === 'asc' ? 'desc' : 'asc' }));

  if (invoices.isPending) return <LoadingState label="Loading invoices…" />;
  if (invoices.isError || !invoices.list) return <ErrorState message={invoices.error?.message ?? 'Could not load the invoices'} onRetry={() => void invoices.refetch()} />;
  const { items, totals, total } = invoices.list;
  if (!items.length) {
    return (
      <EmptyState title="No invoices yet">
        {side === 'receivable'
          ? 'When both of you have agreed the head-days at sign-off, the contract shows under “Ready to invoice” above.'
          : 'Invoices for grazing on your blocks arrive here once the head-days are signed off.'}
      </EmptyState>
    );
  }
  const sorted = sortInvoices(items, sort.key, sort.dir);
  const listed = items.filter((i) => i.status !== 'void').reduce((sum, i) => sum + i.totalCents, 0);
  return (
    <View style={styles.col}>
      <InvoiceTotalsRow totals={totals} side={side} />
      {isWide ? (
        <InvoiceTable items={sorted} sort={sort} onSort={onSort} totalCents={listed} of={total} />
      ) : (
        <>
          <View style={styles.sorts} role="group" aria-label="Sort invoices">
            <Text variant="caption" tone="muted">
              Sort by
            </Text>
            {PHONE_SORTS.map((k) => (
              <Chip
                key={k}
                label={`${INVOICE_SORT_KEYS[k].label}${sort.key === k ? (sort.dir === 'asc' ? ' ↑' : ' ↓') : ''}`}
                on={sort.key === k}
                onPress={() => onSort(k)}
              />
            ))}
          </View>
          {sorted.map((inv) => (
            <InvoiceCard key={inv.id} invoice={inv} />
          ))}
        </>
      )}
      {invoices.hasNextPage ? (
        <Button title={`Show more invoices (${items.length} of ${total} shown)`} variant="secondary" loading={invoices.isFetchingNextPage} onPress={() => void invoices.fetchNextPage()} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.md },
  sorts: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm },
});
