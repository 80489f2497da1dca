import { EmptyState, Screen } from '@/components/ui';
import { useActiveRole } from '@/hooks/auth/session';

export default function InvoicesScreen() {
  const role = useActiveRole();
  return (
    <Screen title="Invoices" subtitle="Head-days signed off, billed and paid">
      <EmptyState title="No invoices yet">
        {role === 'grazier'
          ? 'After both sides sign off a grazing log you can invoice the agreed head-days here.'
          : 'Invoices for grazing on your blocks arrive here once the log is signed off.'}
      </EmptyState>
    </Screen>
  );
}
