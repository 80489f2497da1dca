import { Screen } from '@/components/ui';
import { ContractList } from '@/components/contracts/contract-list';

export default function ContractsScreen() {
  return (
    <Screen title="Contracts" subtitle="Head-day contracts: the terms agreed when a bid is awarded">
      <ContractList />
    </Screen>
  );
}
