import { Stack, useLocalSearchParams } from 'expo-router';
import { ErrorState, LoadingState, Screen } from '@/components/ui';
import { GrazingLog } from '@/components/grazing-log/grazing-log';
import { useContract, useContractLog } from '@/hooks/api/contracts';
import { useSession } from '@/hooks/auth/session';

export default function GrazingLogScreen() {
  const { contractId } = useLocalSearchParams<{ contractId: string }>();
  const contract = useContract(contractId);
  const log = useContractLog(contractId);
  const { user } = useSession();
  if (contract.isError) return <ErrorState message={contract.error.message} onRetry={() => contract.refetch()} />;
  if (log.isError) return <ErrorState message={log.error.message} onRetry={() => log.refetch()} />;
  if (contract.isPending || !log.log) return <LoadingState label="Opening the grazing log…" />;
  const c = contract.data;
  return (
    <Screen title="Grazing log" subtitle={`${c.block.name} · ${c.grazier.businessName ?? c.grazier.name}`} back={{ label: 'Contract', href: `/contracts/${c.id}` }}>
      <Stack.Screen options={{ title: `Grazing log · ${c.block.name} · Fieldfold` }} />
      <GrazingLog
        contract={c}
        log={log.log}
        side={c.grazier.id === user?.id ? 'grazier' : 'grower'}
        onShowOlder={() => void log.fetchNextPage()}
        loadingOlder={log.isFetchingNextPage}
      />
    </Screen>
  );
}
