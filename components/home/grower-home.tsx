import { EmptyState, Screen, TwoPane } from '@/components/ui';
import { useSession } from '@/hooks/auth/session';
import { CalculatorCard } from './calculator-card';
import { ProfileNudge } from './profile-nudge';

export function GrowerHome() {
  const { user } = useSession();
  return (
    <Screen title="My blocks" subtitle={user?.businessName ?? user?.name}>
      <ProfileNudge role="grower" />
      <TwoPane
        main={
          <EmptyState title="No blocks yet — post your first block">
            A block is one piece of ground you want grazed: its acres, the forage standing on it, when animals may come in and the date they must be out.
          </EmptyState>
        }
        side={<CalculatorCard />}
      />
    </Screen>
  );
}
