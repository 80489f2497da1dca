import { EmptyState, Screen } from '@/components/ui';
import { useActiveRole } from '@/hooks/auth/session';

export default function ContractsScreen() {
  const role = useActiveRole();
  return (
    <Screen title="Contracts" subtitle="Head-day contracts, their grazing logs and sign-off">
      <EmptyState title="No contracts yet">
        {role === 'grazier'
          ? 'A contract starts when a grower awards one of your bids.'
          : 'A contract starts when you award a bid on one of your blocks.'}
      </EmptyState>
    </Screen>
  );
}
