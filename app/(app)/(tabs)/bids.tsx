import { EmptyState, Screen } from '@/components/ui';

export default function MyBidsScreen() {
  return (
    <Screen title="My bids" subtitle="Bids you have placed on open blocks">
      <EmptyState title="No bids yet">Open a block from Find grazing and bid head-days, per acre or a flat price for the job.</EmptyState>
    </Screen>
  );
}
