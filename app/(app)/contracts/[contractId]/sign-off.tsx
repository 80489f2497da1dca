import { Stack, useLocalSearchParams } from 'expo-router';
import { ErrorState, LoadingState, Screen } from '@/components/ui';
import { SignOffPanel } from '@/components/contracts/sign-off-panel';
import { sideOf } from '@/components/contracts/next-step';
import { useContract, useContractLog } from '@/hooks/api/contracts';
import { useSession } from '@/hooks/auth/session';
import { useQueuedEntries } from '@/hooks/offline/use-log-queue';

export default function SignOffScreen() {
  const { contractId } = useLocalSearchParams<{ contractId: string }>();
  const contract = useContract(contractId);
  const log = useContractLog(contractId);
  const queue = useQueuedEntries(contractId ?? '');
  const { user } = useSession();
  if (contract.isError) return <ErrorState message={contract.error.message} onRetry={() => contract.refetch()} />;
  if (log.isError) return <ErrorState message={log.error.message} onRetry={() => log.refetch()} />;
  if (contract.isPending || !log.log) return <LoadingState label="Opening the sign-off…" />;
  const c = contract.data;
  const side = sideOf(c, user?.id) ?? 'grower';
  return (
    <Screen title="Sign-off" subtitle={`${c.block.name} · the head-days both of you agree`} back={{ label: 'Contract', href: `/contracts/${c.id}` }} narrow>
      <Stack.Screen options={{ title: `Sign-off · ${c.block.name} · Fieldfold` }} />
      <SignOffPanel contract={c} figures={log.log.figures} side={side} waitingOnPhone={queue.items.filter((q) => q.state !== 'sent').length} />
    </Screen>
  );
}
