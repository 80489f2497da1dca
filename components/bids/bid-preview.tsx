import { StyleSheet, View } from 'react-native';
import type { BlockView } from '@/lib/schemas/block';
import { intakeForFlock } from '@/lib/grazing/flock-intake';
import { formatCents } from '@/lib/money';
import { formatDay, formatNumber, formatWholeDays } from '@/lib/format';
import { Card, Figure, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { previewBid, type BidFormValues } from './bid-form-values';
import { UtilisationMeter } from './utilisation-meter';

/**
 * What the bid comes to, as the grazier types: the stay, the estimated total and what it costs per acre and
 * per head-day (the grower compares bids on these), and how much forage it eats against the grower's target.
 */
export function BidPreview({ values, block }: { values: BidFormValues; block: BlockView }) {
  const preview = previewBid(values, block);
  return (
    <Card style={styles.card} aria-live="polite">
      <Text variant="heading">What this bid comes to</Text>
      {!preview ? (
        <Text tone="muted" testID="preview-incomplete">
          Fill in the rate, head count, body weight and both dates to see the estimate.
        </Text>
      ) : (
        <Figures preview={preview} values={values} block={block} />
      )}
    </Card>
  );
}

/** On a phone the full preview sits below the form; this line keeps the answer in view beside the dates. */
export function BidSummaryLine({ values, block }: { values: BidFormValues; block: BlockView }) {
  const preview = previewBid(values, block);
  if (!preview) return null;
  const n = preview.normalised;
  const take = Number.isFinite(n.predictedUtilizationPct) ? `${formatNumber(n.predictedUtilizationPct)} %` : 'more than stands';
  return (
    <View style={[styles.line, n.overgrazes && styles.lineOver]} aria-live="polite" testID="preview-line">
      <Text variant="bodyStrong" tone="onCover">
        {formatWholeDays(n.days)} · {formatNumber(n.headDays)} head-days · {formatCents(n.estimatedTotalCents)}
      </Text>
      <Text variant="caption" tone="onCover">
        Takes {take} of the forage (target {formatNumber(n.targetUtilizationPct)} %){n.overgrazes ? ' — overgrazes' : ''}
      </Text>
    </View>
  );
}

function Figures({ preview, values, block }: { preview: NonNullable<ReturnType<typeof previewBid>>; values: BidFormValues; block: BlockView }) {
  const n = preview.normalised;
  const intake = intakeForFlock(values.species, values.animalClass);
  const head = formatNumber(values.headCount ?? 0);
  return (
    <>
      <View style={styles.grid}>
        <Figure label="Estimated total" value={formatCents(n.estimatedTotalCents)} testID="preview-total" strong style={styles.wideFigure} />
        <Figure label="Stay" value={formatWholeDays(n.days)} testID="preview-days" />
        <Figure label="Head-days" value={formatNumber(n.headDays)} testID="preview-head-days" />
        <Figure label="Per acre" value={formatCents(n.costPerAcreCents)} testID="preview-per-acre" />
        <Figure label="Per head-day" value={`$${n.costPerHeadDayRate}`} testID="preview-per-head-day" />
      </View>
      <UtilisationMeter predictedPct={n.predictedUtilizationPct} targetPct={n.targetUtilizationPct} />
      {n.overgrazes ? (
        <Notice tone="danger" title="This stay would overgraze the block">
          <Text variant="caption" testID="overgraze-warning">
            {head} head for {formatWholeDays(n.days)} would eat more than the grower's target of {formatNumber(n.targetUtilizationPct)} % of the standing
            forage.
            {preview.withinTarget && preview.withinTarget.days >= 1
              ? ` Within the target they have about ${formatWholeDays(preview.withinTarget.days)}: leave by ${formatDay(preview.withinTarget.endDate)}, or bring fewer head.`
              : ' Bring fewer head or shorten the stay.'}{' '}
            Growers see this beside every bid.
          </Text>
        </Notice>
      ) : (
        <Notice tone="ok">
          {`Within the grower's target take of ${formatNumber(n.targetUtilizationPct)} %. Still move on the residual you see on the ground, not the calendar.`}
        </Notice>
      )}
      <Text variant="caption" tone="muted">
        Assumes {formatNumber(n.intakePctBodyWeight, 1)} % of body weight eaten a day ({intake.basis}; {intake.source}) on {formatNumber(block.lbDmPerAcre)} lb
        DM/ac over {formatNumber(block.acres, 2)} acres. The total is an estimate: the invoice uses the head-days both sides sign off.
      </Text>
    </>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  wideFigure: { flexBasis: '100%' },
  line: { backgroundColor: colors.coverDeep, borderRadius: radius.md, paddingHorizontal: space.lg, paddingVertical: space.md, gap: 2 },
  lineOver: { backgroundColor: colors.danger },
});
