import { Card, EmptyState, Screen, Text, TwoPane } from '@/components/ui';
import { useSession } from '@/hooks/auth/session';
import { CalculatorCard } from './calculator-card';
import { ProfileNudge } from './profile-nudge';

export function GrazierHome() {
  const { user } = useSession();
  const flock = user?.flock;
  return (
    <Screen title="Find grazing" subtitle={user?.businessName ?? user?.name}>
      <ProfileNudge role="grazier" />
      <TwoPane
        main={
          <EmptyState title="No open blocks near you yet">
            When growers open blocks for bids they are listed here, nearest first, with the days of feed each holds for your flock.
          </EmptyState>
        }
        side={
          <>
            {flock ? (
              <Card>
                <Text variant="label" tone="muted">
                  Your flock
                </Text>
                <Text variant="figure">{flock.headCount.toLocaleString('en-US')} head</Text>
                <Text tone="muted">
                  {flock.species} · {flock.animalClass} · about {flock.bodyWeightLb} lb each
                </Text>
              </Card>
            ) : null}
            <CalculatorCard />
          </>
        }
      />
    </Screen>
  );
}
