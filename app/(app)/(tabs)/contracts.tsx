import { Screen } from '@/components/ui';
import { ContractList } from '@/components/contracts/contract-list';

export default function ContractsScreen() {
  return (
    <Screen title="Contracts" subtitle="Head-day contracts: signing, the grazing log and the sign-off, grouped by where each stands">
      <ContractList />
    </Screen>
  );
}
