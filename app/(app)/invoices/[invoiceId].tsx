import { Stack, useLocalSearchParams } from 'expo-router';
import { ErrorState, LoadingState, Screen } from '@/components/ui';
import { InvoiceDetail } from '@/components/invoices/invoice-detail';
import { useInvoice } from '@/hooks/api/invoices';

export default function InvoiceScreen() {
  const { invoiceId } = useLocalSearchParams<{ invoiceId: string }>();
  const invoice = useInvoice(invoiceId);
  if (invoice.isPending) return <LoadingState label="Loading the invoice…" />;
  if (invoice.isError) return <ErrorState message={invoice.error.message} onRetry={() => invoice.refetch()} />;
  const inv = invoice.data;
  return (
    <Screen title={`Invoice ${inv.numberLabel}`} subtitle={`Grazing on ${inv.block.name}`} back={{ label: 'Invoices', href: '/invoices' }}>
      <Stack.Screen options={{ title: `Invoice ${inv.numberLabel} · Fieldfold` }} />
      <InvoiceDetail invoice={inv} />
    </Screen>
  );
}
