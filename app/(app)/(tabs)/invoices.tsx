import { Screen } from '@/components/ui';
import { InvoiceList } from '@/components/invoices/invoice-list';
import { ReadyToInvoice } from '@/components/invoices/ready-to-invoice';
import { useActiveRole } from '@/hooks/auth/session';

export default function InvoicesScreen() {
  const role = useActiveRole();
  const grazier = role === 'grazier';
  return (
    <Screen title="Invoices" subtitle={grazier ? 'Receivables: what growers owe you for grazing' : 'Payables: what you owe graziers for grazing'}>
      {grazier ? <ReadyToInvoice /> : null}
      <InvoiceList side={grazier ? 'receivable' : 'payable'} />
    </Screen>
  );
}
