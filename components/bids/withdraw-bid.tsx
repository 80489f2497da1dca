import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import type { BidView } from '@/lib/schemas/bid';
import { useWithdrawBid } from '@/hooks/api/bids';
import { Button, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormError } from '@/components/form/form-error';

/** Withdraw a live bid, after one confirming step (a withdrawn bid cannot be revived, only replaced by a new one). */
export function WithdrawBid({ bid, onWithdrawn }: { bid: BidView; onWithdrawn: (bid: BidView) => void }) {
  const withdraw = useWithdrawBid();
  const [confirming, setConfirming] = useState(false);
  if (!confirming) {
    return <Button title="Withdraw my bid" variant="quiet" onPress={() => setConfirming(true)} />;
  }
  return (
    <View style={styles.col}>
      <Notice tone="caution" title="Withdraw this bid?">
        <Text variant="caption">The grower will no longer be able to award it. While the block is open you can place a new bid.</Text>
      </Notice>
      <FormError message={withdraw.error?.message} />
      <View style={styles.row}>
        <Button
          title="Withdraw bid"
          variant="danger"
          loading={withdraw.isPending}
          onPress={() => withdraw.mutate(bid.id, { onSuccess: (withdrawn) => onWithdrawn(withdrawn) })}
        />
        <Button title="Keep it" variant="secondary" onPress={() => setConfirming(false)} disabled={withdraw.isPending} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.sm },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
