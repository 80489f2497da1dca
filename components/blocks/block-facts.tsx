import { StyleSheet, View } from 'react-native';
import type { BlockView } from '@/lib/schemas/block';
import { sprayRestrictionEnds } from '@/lib/grazing/safety';
import { formatDay, formatDayRange, formatNumber } from '@/lib/format';
import { Card, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

function Fact({ label, value, detail }: { label: string; value: string; detail?: string }) {
  return (
    <View style={styles.fact}>
      <Text variant="caption" tone="muted">
        {label}
      </Text>
      <Text variant="bodyStrong">{value}</Text>
      {detail ? (
        <Text variant="caption" tone="muted">
          {detail}
        </Text>
      ) : null}
    </View>
  );
}

const FORAGE_BASIS = { direct: 'entered by the grower', samples: 'from clipped samples', height: 'from stand height' } as const;

/** The facts of a block both sides read the same way: size, forage, dates, site. */
export function BlockFacts({ block }: { block: BlockView }) {
  return (
    <Card>
      <Text variant="heading">The block</Text>
      <View style={styles.grid}>
        <Fact label="Size" value={`${formatNumber(block.acres, 2)} acres`} detail={`${block.crop}${block.placeName ? ` · ${block.placeName}` : ''}`} />
        <Fact label="Forage" value={`${formatNumber(block.lbDmPerAcre)} lb DM/ac`} detail={FORAGE_BASIS[block.forageMethod]} />
        <Fact
          label="Target take"
          value={`${formatNumber(block.targetUtilizationPct)} %`}
          detail={block.residualHeightIn != null ? `leave at least ${formatNumber(block.residualHeightIn, 1)} in of residual` : undefined}
        />
        <Fact label="Grazing window" value={formatDayRange(block.windowStart, block.windowEnd)} detail={`grazeable ${formatDayRange(block.grazeFrom, block.grazeUntil)}`} />
        <Fact label="Animals out by" value={formatDay(block.outBy)} detail={block.harvestDate ? `harvest from ${formatDay(block.harvestDate)}` : 'before harvest'} />
        <Fact label="Earliest safe date" value={block.earliestSafeDate ? formatDay(block.earliestSafeDate) : 'no sprays recorded'} detail="from spray labels' grazing restrictions" />
        <Fact label="Water on site" value={block.waterOnSite ? 'Yes' : 'No — haul water'} />
        <Fact label="Perimeter fence" value={block.perimeterFence} detail={block.truckAccess ? 'truck and trailer access' : 'no truck access'} />
        <Fact label="Species allowed" value={block.speciesAllowed.join(' and ')} detail={block.youngPlantings ? 'young plantings on the block' : undefined} />
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
  fact: { flexGrow: 1, flexBasis: 160, padding: space.md, backgroundColor: colors.paper, borderRadius: radius.md, gap: 2 },
  sprays: { gap: space.xs, marginTop: space.xs },
  notes: { marginTop: space.xs },
});
