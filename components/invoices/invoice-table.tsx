import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import type { InvoiceListItem } from '@/lib/schemas/invoice';
import { formatCents } from '@/lib/money';
import { formatDay } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { InvoiceStatusBadge } from './invoice-status';
import { counterparty, INVOICE_SORT_KEYS, type InvoiceSortKey, type SortDir } from './invoice-sorting';

interface Sort {
  key: InvoiceSortKey;
  dir: SortDir;
}

function Header({ k, sort, onSort, flex, align, label }: { k: InvoiceSortKey; sort: Sort; onSort: (k: InvoiceSortKey) => void; flex: number; align?: 'right'; label?: string }) {
  const on = sort.key === k;
  const name = label ?? INVOICE_SORT_KEYS[k].label;
  return (
    <Pressable role="button" aria-label={`Sort by ${name}`} onPress={() => onSort(k)} style={[styles.th, { flex }]}>
      <Text variant="caption" tone={on ? 'cover' : 'muted'} style={[styles.thText, align === 'right' && styles.right]}>
        {name}
        {on ? (sort.dir === 'asc' ? ' ↑' : ' ↓') : ''}
      </Text>
    </Pressable>
  );
}

/** From 1024 px: every invoice on one row, sortable by each column, with the total under the amounts. */
/** `of`: how many invoices the side holds in all (the table shows the pages fetched so far). */
export function InvoiceTable({ items, sort, onSort, totalCents, of }: { items: InvoiceListItem[]; sort: Sort; onSort: (k: InvoiceSortKey) => void; totalCents: number; of: number }) {
  const side = items[0]?.viewerSide ?? 'receivable';
  return (
    <View style={styles.table} role="table" aria-label="Invoices">
      <View style={[styles.tr, styles.thead]} role="row">
        <Header k="number" sort={sort} onSort={onSort} flex={1.1} />
        <Header k="party" sort={sort} onSort={onSort} flex={2.4} label={side === 'receivable' ? 'Grower' : 'Grazier'} />
        <Header k="issued" sort={sort} onSort={onSort} flex={1.2} />
        <Header k="due" sort={sort} onSort={onSort} flex={1.2} />
        <Header k="status" sort={sort} onSort={onSort} flex={1.6} />
        <Header k="amount" sort={sort} onSort={onSort} flex={1.2} align="right" />
      </View>
      {items.map((inv) => (
        <Link key={inv.id} href={`/invoices/${inv.id}`} asChild>
          <Pressable role="link" aria-label={`Invoice ${inv.numberLabel}`} style={StyleSheet.flatten(styles.tr)} testID={`invoice-row-${inv.id}`}>
            <View style={[styles.td, { flex: 1.1 }]}>
              <Text variant="bodyStrong" tone="cover">
                {inv.numberLabel}
              </Text>
            </View>
            <View style={[styles.td, { flex: 2.4 }]}>
              <Text>{counterparty(inv)}</Text>
              <Text variant="caption" tone="muted">
                {inv.block.name}
              </Text>
            </View>
            <View style={[styles.td, { flex: 1.2 }]}>
              <Text>{formatDay(inv.issueDate)}</Text>
            </View>
            <View style={[styles.td, { flex: 1.2 }]}>
              <Text>{formatDay(inv.dueDate)}</Text>
            </View>
            <View style={[styles.td, { flex: 1.6 }]}>
              <InvoiceStatusBadge status={inv.displayStatus} />
              {inv.receipt ? (
                <Text variant="caption" tone="muted">
                  Paid {formatDay(inv.receipt.paidDay)}
                </Text>
              ) : null}
            </View>
            <View style={[styles.td, { flex: 1.2 }]}>
              <Text variant="bodyStrong" style={styles.right}>
                {formatCents(inv.totalCents)}
              </Text>
            </View>
          </Pressable>
        </Link>
      ))}
      <View style={[styles.tr, styles.tfoot]} role="row">
        <View style={[styles.td, { flex: 8.7 }]}>
          <Text variant="label">
            {items.length < of ? `${items.length} of ${of} invoices shown` : `${items.length} invoice${items.length === 1 ? '' : 's'}`}
          </Text>
        </View>
        <View style={[styles.td, { flex: 1.2 }]}>
          <Text variant="bodyStrong" style={styles.right} testID="table-total">
            {formatCents(totalCents)}
          </Text>
        </View>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  table: { borderWidth: 1, borderColor: colors.line, borderRadius: radius.lg, backgroundColor: colors.surface, overflow: 'hidden' },
  tr: { flexDirection: 'row', alignItems: 'center', borderBottomWidth: 1, borderBottomColor: colors.line, paddingHorizontal: space.md },
  thead: { backgroundColor: colors.surfaceSunk },
  tfoot: { backgroundColor: colors.paper, borderBottomWidth: 0 },
  th: { paddingVertical: space.sm, paddingHorizontal: space.xs },
  thText: { textTransform: 'uppercase', letterSpacing: 0.5 },
  td: { paddingVertical: space.md, paddingHorizontal: space.xs, gap: 2 },
  right: { textAlign: 'right' },
});
