import { infiniteQueryOptions, queryOptions, useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { DEFAULT_INVOICE_PAGE, type CreateInvoiceInput, type InvoiceListView, type InvoiceSide, type InvoiceListItem, type InvoiceTotals, type InvoiceView } from '@/lib/schemas/invoice';
import type { TestPaymentMethodId } from '@/lib/payments';
import { api, queryString } from './client';
import { staleTimes } from './query-client';
import { contractKeys } from './contracts';

export const invoiceKeys = {
  all: ['invoices'] as const,
  lists: () => [...invoiceKeys.all, 'list'] as const,
  list: (side: InvoiceSide) => [...invoiceKeys.lists(), side] as const,
  detail: (id: string) => [...invoiceKeys.all, 'detail', id] as const,
};

const enc = encodeURIComponent;

/** While the server is still issuing an invoice, or a payment is going through, look again every few seconds. */
export const INVOICE_BUSY_POLL_MS = 3_000;

function isBusy(inv: InvoiceListItem | undefined): boolean {
  return !!inv && (inv.status === 'draft' || inv.payment.inProgress);
}

/** A season's invoices of one side come a page at a time, due first; `fetchNextPage` reads the next. */
export const invoicesQueryOptions = (side: InvoiceSide) =>
  infiniteQueryOptions({
    queryKey: invoiceKeys.list(side),
    queryFn: ({ pageParam }) => api<InvoiceListView>(`/invoices${queryString({ side, limit: DEFAULT_INVOICE_PAGE, cursor: pageParam || undefined })}`),
    initialPageParam: '',
    getNextPageParam: (last) => last.nextCursor || undefined,
    staleTime: staleTimes.list,
  });

/** The invoices fetched so far, with the totals and count over the whole side (the newest page's). */
export interface InvoiceListPages {
  items: InvoiceListItem[];
  totals: InvoiceTotals;
  total: number;
}

export const invoiceQueryOptions = (id: string) =>
  queryOptions({
    queryKey: invoiceKeys.detail(id),
    queryFn: () => api<{ invoice: InvoiceView }>(`/invoices/${enc(id)}`).then((r) => r.invoice),
    staleTime: staleTimes.detail,
  });

export function useInvoices(side: InvoiceSide) {
  const q = useInfiniteQuery({ ...invoicesQueryOptions(side), refetchInterval: (q) => (q.state.data?.pages.some((p) => p.items.some(isBusy)) ? INVOICE_BUSY_POLL_MS : false) });
  const pages = q.data?.pages ?? [];
  const last = pages.at(-1);
  const list: InvoiceListPages | undefined = last ? { items: pages.flatMap((p) => p.items), totals: last.totals, total: last.total } : undefined;
  return { ...q, list };
}

export function useInvoice(id: string | undefined) {
  return useQuery({ ...invoiceQueryOptions(id ?? ''), enabled: !!id, refetchInterval: (q) => (isBusy(q.state.data) ? INVOICE_BUSY_POLL_MS : false) });
}

/** An invoice changes the money views, its own detail and its contract's status. */
function useInvoiceChanged() {
  const qc = useQueryClient();
  return (invoice?: InvoiceView) => {
    void qc.invalidateQueries({ queryKey: invoiceKeys.lists() });
    void qc.invalidateQueries({ queryKey: contractKeys.all });
    if (invoice) qc.setQueryData(invoiceKeys.detail(invoice.id), invoice);
  };
}

export function useCreateInvoice() {
  const changed = useInvoiceChanged();
  return useMutation({
    mutationFn: ({ contractId, ...body }: CreateInvoiceInput & { contractId: string }) =>
      api<{ invoice: InvoiceView }>(`/contracts/${enc(contractId)}/invoice`, { body }).then((r) => r.invoice),
    onSuccess: changed,
  });
}

export function usePayInvoice(invoiceId: string) {
  const qc = useQueryClient();
  const changed = useInvoiceChanged();
  return useMutation({
    mutationFn: (paymentMethod: TestPaymentMethodId) => api<{ invoice: InvoiceView }>(`/invoices/${enc(invoiceId)}/pay`, { body: { paymentMethod } }).then((r) => r.invoice),
    onSuccess: changed,
    // A decline is stored on the invoice (its reason shows there too): read it again either way.
    onError: () => {
      void qc.invalidateQueries({ queryKey: invoiceKeys.detail(invoiceId) });
      void qc.invalidateQueries({ queryKey: invoiceKeys.lists() });
    },
  });
}
