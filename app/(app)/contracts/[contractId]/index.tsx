import { Stack, useLocalSearchParams } from 'expo-router';
import { ErrorState, LoadingState, Screen } from '@/components/ui';
import { ContractDetail } from '@/components/contracts/contract-detail';
import { useContract } from '@/hooks/api/contracts';
import { useSession } from '@/hooks/auth/session';

export default function ContractScreen() {
  const { contractId } = useLocalSearchParams<{ contractId: string }>();
  const contract = useContract(contractId);
  const { user } = useSession();
  if (contract.isPending) return <LoadingState label="Loading the contract…" />;
  if (contract.isError) return <ErrorState message={contract.error.message} onRetry={() => contract.refetch()} />;
  const c = contract.data;
  return (
    <Screen title={`Contract · ${c.block.name}`} subtitle={`${c.block.crop}${c.block.placeName ? ` · ${c.block.placeName}` : ''}`} back={{ label: 'Contracts', href: '/contracts' }}>
      <Stack.Screen options={{ title: `Contract · ${c.block.name} · Fieldfold` }} />
      <ContractDetail contract={c} viewerId={user?.id} viewerName={user?.name ?? ''} />
    </Screen>
  );
}
