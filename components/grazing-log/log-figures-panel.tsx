import { StyleSheet, View } from 'react-native';
import { Card, Figure, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatNumber } from '@/lib/format';
import type { LogFiguresView } from '@/hooks/api/contracts';

function days(n: number) {
  return `${formatNumber(n)} day${Math.abs(n) === 1 ? '' : 's'}`;
}

/** Forage eaten against the grower's target take, as a bar with the target at its end. */
function TakeBar({ eatenLb, targetTakeLb }: { eatenLb: number; targetTakeLb: number }) {
  const share = targetTakeLb > 0 ? eatenLb / targetTakeLb : 0;
  const over = share > 1;
  const scale = Math.max(1, share);
  return (
    <View style={styles.take} aria-label={`Forage eaten ${formatNumber(eatenLb)} lb of the ${formatNumber(targetTakeLb)} lb target take`}>
      <View style={styles.takeLegend}>
        <Text variant="label" tone={over ? 'danger' : 'ink'} testID="figure-eaten">
          {formatNumber(eatenLb)} lb eaten of {formatNumber(targetTakeLb)} lb target
        </Text>
        <Text variant="caption" tone={over ? 'danger' : 'muted'}>
          {formatNumber(share * 100)} % of the target take
        </Text>
      </View>
      <View style={styles.bar}>
        <View style={[styles.fill, { width: `${(share / scale) * 100}%`, backgroundColor: over ? colors.danger : colors.cover }]} />
        <View style={[styles.mark, { left: `${(1 / scale) * 100}%` }]} />
      </View>
    </View>
  );
}

/**
 * The running figures of the log: head now, head-days so far, forage eaten against the target, days left,
 * and the server's warnings. `queuedMoves` says the phone included moves still waiting to send.
 */
export function LogFiguresPanel({ figures, queuedMoves, problem, closed }: { figures: LogFiguresView; queuedMoves: number; problem: string | null; closed?: boolean }) {
  const f = figures;
  return (
    <Card style={styles.card} aria-label="Running figures">
      <Text variant="heading">{closed ? 'The stay' : 'So far'}</Text>
      <View style={styles.grid}>
        <Figure strong label="Head on the block" value={formatNumber(f.headNow)} testID="figure-head-now" />
        {/* A stay of a few hours is a fraction of a head-day: show it rather than a bare 0. */}
        <Figure strong label={closed ? 'Head-days logged' : 'Head-days so far'} value={formatNumber(f.headDaysSoFar, f.headDaysSoFar < 10 ? 4 : 1)} testID="figure-head-days" />
        {closed ? null : (
          <>
            <Figure label="Days left in the window" value={days(f.daysLeftInWindow)} />
            <Figure label="Days to the out-by date" value={days(f.daysToOutBy)} detail={f.daysToOutBy <= 2 ? 'plan the move out' : undefined} />
          </>
        )}
      </View>
      <TakeBar eatenLb={f.eatenLb} targetTakeLb={f.targetTakeLb} />
      {queuedMoves > 0 ? (
        <Text variant="caption" tone="muted" testID="figures-include-queued">
          Includes {queuedMoves} {queuedMoves === 1 ? 'move' : 'moves'} still waiting on this phone; the server confirms the figures once they are sent.
        </Text>
      ) : null}
      {problem ? <Notice tone="caution">{problem}</Notice> : null}
      {(f.alerts ?? f.warnings.map((text) => ({ key: text, tone: 'caution' as const, text }))).map((a) => (
        <Notice key={a.key} tone={a.tone}>
          {a.text}
        </Notice>
      ))}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  take: { gap: space.xs },
  takeLegend: { flexDirection: 'row', justifyContent: 'space-between', flexWrap: 'wrap', gap: space.sm, alignItems: 'baseline' },
  bar: { height: 14, borderRadius: radius.pill, overflow: 'hidden', backgroundColor: colors.surfaceSunk, borderWidth: 1, borderColor: colors.line },
  fill: { height: '100%' },
  mark: { position: 'absolute', top: -1, bottom: -1, width: 3, marginLeft: -1.5, backgroundColor: colors.ink },
});
