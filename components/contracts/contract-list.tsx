import { StyleSheet, View } from 'react-native';
import { useContracts } from '@/hooks/api/contracts';
import { useActiveRole, useSession } from '@/hooks/auth/session';
import { useLayout } from '@/hooks/use-layout';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { ContractCard } from './contract-card';

/** Both parties' contracts, newest first as the API returns them. */
export function ContractList() {
  const contracts = useContracts();
  const { user } = useSession();
  const role = useActiveRole();
  const { isWide } = useLayout();

  if (contracts.isPending) return <LoadingState label="Loading your contracts…" />;
  if (contracts.isError) return <ErrorState message={contracts.error.message} onRetry={() => void contracts.refetch()} />;
  if (contracts.data.length === 0) {
    return (
      <EmptyState title="No contracts yet">
        {role === 'grazier'
          ? 'A contract starts when a grower awards one of your bids. Its agreed terms appear here.'
          : 'A contract starts when you award a bid on one of your blocks. Its agreed terms appear here.'}
      </EmptyState>
    );
  }
  return (
    <View style={[styles.grid, isWide && styles.gridWide]}>
      {contracts.data.map((c) => (
        <View key={c.id} style={isWide ? styles.cellWide : undefined}>
          <ContractCard contract={c} viewerId={user?.id} />
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({
  grid: { gap: space.md },
  gridWide: { flexDirection: 'row', flexWrap: 'wrap' },
  cellWide: { flexBasis: '48%', flexGrow: 1, maxWidth: '50%', minWidth: 320 },
});
