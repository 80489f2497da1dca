import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreateInvoiceInput, InvoiceListView, InvoiceSide, InvoiceView } from '@/lib/schemas/invoice';
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

function isBusy(inv: InvoiceView | undefined): boolean {
  return !!inv && (inv.status === 'draft' || inv.payment.inProgress);
}

export const invoicesQueryOptions = (side: InvoiceSide) =>
  queryOptions({
    queryKey: invoiceKeys.list(side),
    queryFn: () => api<InvoiceListView>(`/invoices${queryString({ side })}`),
    staleTime: staleTimes.list,
  });

export const invoiceQueryOptions = (id: string) =>
  queryOptions({
    queryKey: invoiceKeys.detail(id),
    queryFn: () => api<{ invoice: InvoiceView }>(`/invoices/${enc(id)}`).then((r) => r.invoice),
    staleTime: staleTimes.detail,
  });

export function useInvoices(side: InvoiceSide) {
  return useQuery({ ...invoicesQueryOptions(side), refetchInterval: (q) => (q.state.data?.items.some(isBusy) ? INVOICE_BUSY_POLL_MS : false) });
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
