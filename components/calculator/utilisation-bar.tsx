import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatNumber } from '@/lib/format';

/** Standing forage as one bar: the share taken beside the share left on the ground as residue. */
export function UtilisationBar({ takenPct, standingLb }: { takenPct: number; standingLb: number }) {
  const taken = Math.max(0, Math.min(100, takenPct));
  const heavy = taken > 50;
  return (
    <View style={{ gap: space.xs }} aria-label={`Take ${formatNumber(taken)} % of standing forage, leave ${formatNumber(100 - taken)} %`}>
      <View style={styles.bar}>
        <View style={[styles.taken, { width: `${taken}%`, backgroundColor: heavy ? colors.clay : colors.cover }]} />
        <View style={styles.left} />
        <View style={[styles.mark, { left: '50%' }]} />
      </View>
      <View style={styles.legend}>
        <Text variant="caption" tone={heavy ? 'clay' : 'cover'}>
          Taken {formatNumber(taken)} % · {formatNumber((standingLb * taken) / 100)} lb DM
        </Text>
        <Text variant="caption" tone="muted">
          Left {formatNumber(100 - taken)} %
        </Text>
      </View>
      {heavy ? (
        <Text variant="caption" tone="clay">
          Over half the standing forage: check the residual on the ground before planning this much.
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { height: 18, borderRadius: radius.pill, overflow: 'hidden', flexDirection: 'row', backgroundColor: colors.surfaceSunk, borderWidth: 1, borderColor: colors.line },
  taken: { height: '100%' },
  left: { flex: 1, backgroundColor: '#D8CFA8' },
  mark: { position: 'absolute', top: 0, bottom: 0, width: 2, marginLeft: -1, backgroundColor: colors.ink, opacity: 0.35 },
  legend: { flexDirection: 'row', justifyContent: 'space-between', gap: space.sm, flexWrap: 'wrap' },
});
