import type { InvoiceDisplayStatus, InvoiceListItem } from '@/lib/schemas/invoice';

// Columns the money views sort by. Status sorts by what needs doing first: overdue, then awaiting payment, being
// issued, paid, void.
const STATUS_ORDER: Record<InvoiceDisplayStatus, number> = { overdue: 0, sent: 1, draft: 2, paid: 3, void: 4 };

export const INVOICE_SORT_KEYS = {
  due: { label: 'Due', value: (i: InvoiceListItem) => i.dueDate },
  amount: { label: 'Amount', value: (i: InvoiceListItem) => i.totalCents },
  status: { label: 'Status', value: (i: InvoiceListItem) => STATUS_ORDER[i.displayStatus] },
  issued: { label: 'Issued', value: (i: InvoiceListItem) => i.issueDate },
  number: { label: 'Number', value: (i: InvoiceListItem) => i.numberLabel },
  party: { label: 'Who', value: (i: InvoiceListItem) => (i.viewerSide === 'receivable' ? (i.grower.businessName ?? i.grower.name) : (i.grazier.businessName ?? i.grazier.name)).toLowerCase() },
} as const;

export type InvoiceSortKey = keyof typeof INVOICE_SORT_KEYS;
export type SortDir = 'asc' | 'desc';

/** Sorted by the chosen column; ties keep the server's order (due date, then number). */
export function sortInvoices(items: readonly InvoiceListItem[], key: InvoiceSortKey, dir: SortDir): InvoiceListItem[] {
  const read = INVOICE_SORT_KEYS[key].value;
  const sign = dir === 'asc' ? 1 : -1;
  return items
    .map((inv, i) => ({ inv, i }))
    .sort((x, y) => {
      const a = read(x.inv);
      const b = read(y.inv);
      if (a < b) return -sign;
      if (a > b) return sign;
      return x.i - y.i;
    })
    .map(({ inv }) => inv);
}

/** The other party's name, from the viewer's side. */
export function counterparty(inv: InvoiceListItem): string {
  const p = inv.viewerSide === 'receivable' ? inv.grower : inv.grazier;
  return p.businessName ?? p.name;
}
