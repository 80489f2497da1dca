import { Screen } from '@/components/ui';
import { MyBidList } from '@/components/bids/my-bid-list';

export default function MyBidsScreen() {
  return (
    <Screen title="My bids" subtitle="Your bids on growers' blocks: live until the grower awards the block">
      <MyBidList />
    </Screen>
  );
}
