import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatNumber } from '@/lib/format';

/** Share of the standing forage a stay would eat, against the grower's target (the marker). */
export function UtilisationMeter({ predictedPct, targetPct }: { predictedPct: number; targetPct: number }) {
  const over = predictedPct > targetPct;
  const finite = Number.isFinite(predictedPct);
  // The scale runs to 100 %, or further when the stay needs more than stands, so the marker stays in view.
  const scale = Math.max(100, finite ? predictedPct : 100);
  const fill = finite ? (predictedPct / scale) * 100 : 100;
  const mark = (targetPct / scale) * 100;
  const shown = finite ? `${formatNumber(predictedPct, 0)} %` : 'more than stands';
  return (
    <View style={styles.wrap} aria-label={`Predicted take ${shown} of standing forage; the grower's target is ${formatNumber(targetPct)} %`}>
      <View style={styles.legend}>
        <Text variant="label" tone={over ? 'danger' : 'ok'} testID="preview-utilisation">
          Takes {shown} of the standing forage
        </Text>
        <Text variant="caption" tone="muted">
          target {formatNumber(targetPct)} %
        </Text>
      </View>
      <View style={styles.bar}>
        <View style={[styles.fill, { width: `${fill}%`, backgroundColor: over ? colors.danger : colors.cover }]} />
        <View style={[styles.mark, { left: `${mark}%` }]} />
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  legend: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'baseline', gap: space.sm, flexWrap: 'wrap' },
  bar: { height: 14, borderRadius: radius.pill, overflow: 'hidden', backgroundColor: colors.surfaceSunk, borderWidth: 1, borderColor: colors.line },
  fill: { height: '100%' },
  mark: { position: 'absolute', top: -1, bottom: -1, width: 3, marginLeft: -1.5, backgroundColor: colors.ink },
});
