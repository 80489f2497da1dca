import { StyleSheet, View } from 'react-native';
import { CONTRACT_STATUSES, CONTRACT_STATUS_LABELS } from '@/lib/schemas/contract';
import { useContracts } from '@/hooks/api/contracts';
import { useActiveRole, useSession } from '@/hooks/auth/session';
import { useLayout } from '@/hooks/use-layout';
import { Button, EmptyState, ErrorState, LoadingState, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { ContractCard } from './contract-card';
import { nextStep, sideOf } from './next-step';

/** Both parties' contracts, grouped by status in the order a contract moves through them; newest first within a group. */
export function ContractList() {
  const contracts = useContracts();
  const { user } = useSession();
  const role = useActiveRole();
  const { isWide } = useLayout();

  if (contracts.isPending) return <LoadingState label="Loading your contracts…" />;
  if (contracts.isError) return <ErrorState message={contracts.error.message} onRetry={() => void contracts.refetch()} />;
  if (contracts.items.length === 0) {
    return (
      <EmptyState title="No contracts yet">
        {role === 'grazier'
          ? 'A contract starts when a grower awards one of your bids. Its agreed terms appear here.'
          : 'A contract starts when you award a bid on one of your blocks. Its agreed terms appear here.'}
      </EmptyState>
    );
  }
  const groups = CONTRACT_STATUSES.map((status) => ({ status, items: contracts.items.filter((c) => c.status === status) })).filter((g) => g.items.length > 0);
  const mine = contracts.items.filter((c) => nextStep(c, sideOf(c, user?.id)).mine).length;
  return (
    <View style={styles.groups}>
      {mine > 0 ? (
        <Notice tone="caution" title={`${mine} ${mine === 1 ? 'contract needs' : 'contracts need'} you`}>
          Each card says what to do next.
        </Notice>
      ) : null}
      {groups.map((g) => (
        <View key={g.status} style={styles.group} role="list" aria-label={CONTRACT_STATUS_LABELS[g.status]}>
          <Text variant="heading" role="heading">
            {CONTRACT_STATUS_LABELS[g.status]} · {g.items.length}
          </Text>
          <View style={[styles.grid, isWide && styles.gridWide]}>
            {g.items.map((c) => (
              <View key={c.id} style={isWide ? styles.cellWide : undefined} role="listitem">
                <ContractCard contract={c} viewerId={user?.id} />
              </View>
            ))}
          </View>
        </View>
      ))}
      {contracts.hasNextPage ? (
        <Button title="Show more contracts" variant="secondary" loading={contracts.isFetchingNextPage} onPress={() => void contracts.fetchNextPage()} />
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  groups: { gap: space.xl },
  group: { gap: space.sm },
  grid: { gap: space.md },
  gridWide: { flexDirection: 'row', flexWrap: 'wrap' },
  cellWide: { flexBasis: '48%', flexGrow: 1, maxWidth: '50%', minWidth: 320 },
});
