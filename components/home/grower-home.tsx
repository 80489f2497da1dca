import { View } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, EmptyState, ErrorState, LoadingState, Screen, TwoPane } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { OwnBlockItem } from '@/components/blocks/block-list-item';
import { useBlocks } from '@/hooks/api/blocks';
import { useSession } from '@/hooks/auth/session';
import { CalculatorCard } from './calculator-card';
import { ProfileNudge } from './profile-nudge';

export function GrowerHome() {
  const { user } = useSession();
  const router = useRouter();
  const blocks = useBlocks({ view: 'mine', pageSize: 50 });
  const post = <Button title="Post a block" onPress={() => router.push('/blocks/new')} testID="post-block" />;
  return (
    <Screen title="My blocks" subtitle={user?.businessName ?? user?.name} actions={blocks.data?.items.length ? post : undefined}>
      <ProfileNudge role="grower" />
      <TwoPane
        main={
          blocks.isPending ? (
            <LoadingState label="Loading your blocks…" />
          ) : blocks.isError ? (
            <ErrorState message={blocks.error.message} onRetry={() => blocks.refetch()} />
          ) : blocks.data.items.length === 0 ? (
            <EmptyState title="No blocks yet — post your first block" action={post}>
              A block is one piece of ground you want grazed: its acres, the forage standing on it, when animals may come in and the date they must be out.
            </EmptyState>
          ) : (
            <View style={{ gap: space.md }}>
              {blocks.data.items.map((b) => (
                <OwnBlockItem key={b.id} block={b} />
              ))}
            </View>
          )
        }
        side={<CalculatorCard />}
      />
    </Screen>
  );
}
