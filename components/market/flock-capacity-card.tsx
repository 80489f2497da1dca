import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { BlockView } from '@/lib/schemas/block';
import { formatNumber, formatWholeDays } from '@/lib/format';
import { Card, Figure, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

/** What this block holds for the viewer's own flock at the grower's target take, and how far it is (figures from the server's lib/ arithmetic). */
export function FlockCapacityCard({ block }: { block: BlockView }) {
  const fit = block.flockFit;
  return (
    <Card style={styles.card}>
      <Text variant="heading">For your flock</Text>
      {fit && block.capacity != null && block.daysForMyFlock != null ? (
        <>
          <View style={styles.grid}>
            <Figure
              label={`Days for your ${formatNumber(fit.headCount)} head`}
              value={formatWholeDays(block.daysForMyFlock)}
              detail="whole days, rounded down"
              testID="flock-days"
              strong
            />
            <Figure label="Capacity" value={formatNumber(Math.floor(block.capacity))} detail="head-days" testID="flock-head-days" strong />
          </View>
          <Text variant="caption" tone="muted">
            At the grower's target take of {formatNumber(block.targetUtilizationPct)} % of {formatNumber(block.lbDmPerAcre)} lb DM/ac on{' '}
            {formatNumber(block.acres, 2)} acres, with {formatNumber(fit.bodyWeightLb)} lb animals eating {formatNumber(fit.intakePctBodyWeight, 1)} % of body
            weight a day ({fit.intakeBasis}; {fit.intakeSource}). Check the stand yourself: these are estimates.
          </Text>
        </>
      ) : (
        <Text tone="muted">
          Describe your flock in{' '}
          <Link href="/account">
            <Text tone="cover" variant="bodyStrong">
              Account
            </Text>
          </Link>{' '}
          to see how many days this block feeds it.
        </Text>
      )}
      <View style={styles.distance}>
        <Text variant="caption" tone="muted">
          Distance
        </Text>
        <Text variant="bodyStrong" testID="block-distance">
          {block.distanceMiles != null ? `${formatNumber(block.distanceMiles, 1)} miles from your home base` : 'Add your home base in Account to see it'}
        </Text>
        <Text variant="caption" tone="muted">
          As the crow flies; the road is longer.
        </Text>
      </View>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  distance: { gap: 2 },
});
