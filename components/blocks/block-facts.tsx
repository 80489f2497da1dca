import { StyleSheet, View } from 'react-native';
import type { BlockView } from '@/lib/schemas/block';
import { sprayRestrictionEnds } from '@/lib/grazing/safety';
import { formatDay, formatDayRange, formatNumber } from '@/lib/format';
import { Card, Figure, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

const FORAGE_BASIS = { direct: 'entered by the grower', samples: 'from clipped samples', height: 'from stand height' } as const;

/** The facts of a block both sides read the same way: size, forage, dates, site. */
export function BlockFacts({ block }: { block: BlockView }) {
  return (
    <Card>
      <Text variant="heading">The block</Text>
      <View style={styles.grid}>
        <Figure label="Size" value={`${formatNumber(block.acres, 2)} acres`} detail={`${block.crop}${block.placeName ? ` · ${block.placeName}` : ''}`} />
        <Figure label="Forage" value={`${formatNumber(block.lbDmPerAcre)} lb DM/ac`} detail={FORAGE_BASIS[block.forageMethod]} />
        <Figure
          label="Target take"
          value={`${formatNumber(block.targetUtilizationPct)} %`}
          detail={block.residualHeightIn != null ? `leave at least ${formatNumber(block.residualHeightIn, 1)} in of residual` : undefined}
        />
        <Figure label="Grazing window" value={formatDayRange(block.windowStart, block.windowEnd)} detail={`grazeable ${formatDayRange(block.grazeFrom, block.grazeUntil)}`} />
        <Figure label="Animals out by" value={formatDay(block.outBy)} detail={block.harvestDate ? `harvest from ${formatDay(block.harvestDate)}` : 'before harvest'} />
        <Figure label="Earliest safe date" value={block.earliestSafeDate ? formatDay(block.earliestSafeDate) : 'no sprays recorded'} detail="from spray labels' grazing restrictions" />
        <Figure label="Water on site" value={block.waterOnSite ? 'Yes' : 'No — haul water'} />
        <Figure label="Perimeter fence" value={block.perimeterFence} detail={block.truckAccess ? 'truck and trailer access' : 'no truck access'} />
        <Figure label="Species allowed" value={block.speciesAllowed.join(' and ')} detail={block.youngPlantings ? 'young plantings on the block' : undefined} />
      </View>
      {block.sprayRecords.length ? (
        <View style={styles.sprays}>
          <Text variant="label">Spray records</Text>
          {block.sprayRecords.map((r, i) => (
            <Text key={i} variant="caption">
              {r.product}
              {r.containsCopper ? ' (copper)' : ''} — applied {formatDay(r.appliedOn)}, label restriction {r.grazingRestrictionDays} days → graze from{' '}
              {formatDay(sprayRestrictionEnds(r))}
            </Text>
          ))}
        </View>
      ) : null}
      {block.notes ? (
        <Text tone="muted" style={styles.notes}>
          {block.notes}
        </Text>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  sprays: { gap: space.xs, marginTop: space.xs },
  notes: { marginTop: space.xs },
});
