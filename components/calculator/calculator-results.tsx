import { StyleSheet, View } from 'react-native';
import type { CalculatorResult } from '@/lib/grazing/calculator';
import { AU_CONVENTION } from '@/lib/grazing/capacity';
import { formatNumber, formatWholeDays } from '@/lib/format';
import { Card, Figure, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { UtilisationBar } from './utilisation-bar';

export function CalculatorResults({ result, headCount, utilizationPct }: { result: CalculatorResult; headCount: number | null; utilizationPct: number | null }) {
  const { forage, capacity, daysForHerd } = result;
  return (
    <Card style={styles.card}>
      <Text variant="heading">What the block carries</Text>
      {!forage || !capacity ? (
        <Text tone="muted" testID="calc-incomplete">
          Fill in the fields marked in red to see the figures.
        </Text>
      ) : (
        <>
          <View style={styles.grid}>
            <Figure label="Forage" value={formatNumber(forage.lbDmPerAcre)} detail={`lb DM/ac (${formatNumber(forage.kgDmPerHa)} kg/ha) · ${forage.note}`} testID="calc-lb-per-acre" />
            <Figure label="Standing" value={formatNumber(capacity.standingLb)} detail="lb DM on the block" testID="calc-standing" />
            <Figure label="Allowable take" value={formatNumber(capacity.allowableLb)} detail="lb DM" testID="calc-allowable" />
            <Figure label="Intake" value={formatNumber(capacity.dailyIntakeLbPerHead, 2)} detail="lb DM per head per day" testID="calc-intake" />
            <Figure label="Capacity" value={formatNumber(Math.floor(capacity.headDays))} detail="head-days" testID="calc-head-days" strong />
            <Figure
              label={headCount ? `Days for ${formatNumber(headCount)} head` : 'Days for your flock'}
              value={daysForHerd == null ? '—' : formatWholeDays(daysForHerd)}
              detail={daysForHerd == null ? 'enter a head count' : 'whole days, rounded down'}
              testID="calc-days"
              strong
            />
            <Figure label="Animal-unit days" value={formatNumber(capacity.animalUnitDays, 1)} detail="AUD" testID="calc-aud" />
            <Figure label="Animal-unit months" value={formatNumber(capacity.aum, 2)} detail="AUM" testID="calc-aum" />
          </View>
          {utilizationPct != null ? <UtilisationBar takenPct={utilizationPct} standingLb={capacity.standingLb} /> : null}
          <Text variant="caption" tone="muted">
            AUD and AUM use {AU_CONVENTION.lbDmPerAuDay} lb DM per animal-unit day and a {AU_CONVENTION.daysPerAum}-day month (
            {formatNumber(AU_CONVENTION.lbDmPerAuDay * AU_CONVENTION.daysPerAum)} lb per AUM): Society for Range Management glossary, 1998, and the
            NRCS National Range and Pasture Handbook. Other agencies use 750–915 lb per AUM, so compare like with like.
          </Text>
        </>
      )}
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  summary: { backgroundColor: colors.coverDeep, borderRadius: radius.md, paddingHorizontal: space.lg, paddingVertical: space.md },
});

/** On a phone the full results sit below the inputs; this line keeps the answer in view at the top. */
export function CalculatorSummary({ result, headCount }: { result: CalculatorResult; headCount: number | null }) {
  if (!result.capacity) return null;
  return (
    <View style={styles.summary} aria-live="polite">
      <Text variant="bodyStrong" tone="onCover">
        {formatNumber(Math.floor(result.capacity.headDays))} head-days
        {result.daysForHerd != null && headCount ? ` · ${formatWholeDays(result.daysForHerd)} for ${formatNumber(headCount)} head` : ''}
      </Text>
    </View>
  );
}
