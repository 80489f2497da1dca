import { Link } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { ContractView } from '@/lib/schemas/contract';
import type { PartyView } from '@/lib/schemas/block';
import { formatCents } from '@/lib/money';
import { formatDay, formatDayRange, formatNumber, formatWholeDays } from '@/lib/format';
import { useLayout } from '@/hooks/use-layout';
import { Card, Figure, Notice, Text } from '@/components/ui';
import type { FigureProps } from '@/components/ui/figure';
import { space } from '@/components/ui/theme';
import { formatRate } from '@/components/bids/bid-terms';
import { UtilisationMeter } from '@/components/bids/utilisation-meter';
import { ContractStatusBadge } from './contract-status';

/** One agreed term: the shared Figure tile, three abreast on a wide screen, two on a phone, or one per row. */
function Term({ wide, stacked, ...figure }: FigureProps & { wide?: boolean; stacked?: boolean }) {
  return <Figure {...figure} style={[styles.term, wide && styles.termWide, stacked && styles.termStacked]} />;
}

function partyName(p: PartyView): string {
  return p.businessName ? `${p.businessName} (${p.name})` : p.name;
}

/**
 * The terms both parties agreed when the grower awarded the bid, read-only: copied at award time, so later
 * edits to the block or the bid never change them. Signing, the grazing log and sign-off come later.
 */
export function ContractDetail({ contract, viewerId }: { contract: ContractView; viewerId: string | undefined }) {
  const { isWide } = useLayout();
  const n = contract.normalised;
  const you = (id: string) => (id === viewerId ? ' — you' : '');

  const terms = (
    <Card style={styles.card}>
      <Text variant="heading">Agreed terms</Text>
      <View style={styles.grid}>
        <Term wide={isWide} label="Animals in" value={formatDay(contract.startDate)} testID="contract-start" />
        <Term wide={isWide} label="Animals out" value={formatDay(contract.endDate)} detail={formatWholeDays(n.days)} testID="contract-end" />
        <Term wide={isWide} label="Out by (before harvest)" value={formatDay(contract.outBy)} detail="a term of this contract" />
        <Term wide={isWide} label="Flock" value={`${formatNumber(contract.headCount)} head`} detail={`${contract.animalClass} (${contract.species}), about ${formatNumber(contract.bodyWeightLb)} lb`} />
        <Term wide={isWide} label="Price" value={formatRate(contract.basis, contract.rate)} testID="contract-rate" />
        <Term wide={isWide} label="Services included" value={contract.services.length ? contract.services.join(', ') : 'None listed'} />
      </View>
    </Card>
  );

  const estimate = (
    <Card style={styles.card}>
      <Text variant="heading">Estimate</Text>
      <View style={styles.grid}>
        <Term label="Estimated total" value={formatCents(n.estimatedTotalCents)} testID="contract-total" />
        <Term label="Head-days" value={formatNumber(n.headDays)} detail={`${formatNumber(contract.headCount)} head × ${formatWholeDays(n.days)}`} />
        <Term label="Per acre" value={formatCents(n.costPerAcreCents)} />
        <Term label="Per head-day" value={`$${n.costPerHeadDayRate}`} />
      </View>
      <UtilisationMeter predictedPct={n.predictedUtilizationPct} targetPct={n.targetUtilizationPct} />
      <Text variant="caption" tone="muted">
        From the block as it stood at the award: {formatNumber(contract.acres, 2)} acres, {formatNumber(contract.lbDmPerAcre)} lb DM/ac, target take{' '}
        {formatNumber(contract.targetUtilizationPct)} %. The invoice will use the head-days both sides sign off from the grazing log, not this estimate.
      </Text>
    </Card>
  );

  const parties = (
    <Card style={styles.card}>
      <Text variant="heading">Parties</Text>
      <View style={styles.parties}>
        <Term stacked label="Grower" value={`${partyName(contract.grower)}${you(contract.grower.id)}`} />
        <Term stacked label="Grazier" value={`${partyName(contract.grazier)}${you(contract.grazier.id)}`} />
      </View>
      <Link href={`/blocks/${contract.blockId}`}>
        <Text tone="cover" variant="bodyStrong">
          Open the block →
        </Text>
      </Link>
    </Card>
  );

  const status = (
    <View style={styles.col}>
      <ContractStatusBadge status={contract.status} />
      {contract.status === 'to-sign' ? (
        <Notice tone="info" title="What happens next">
          <Text variant="caption">
            The grower awarded this bid and these are the terms to be signed. Signing in Fieldfold comes in the next release; until both of you have signed,
            agree any change with each other before animals move.
          </Text>
        </Notice>
      ) : null}
    </View>
  );

  return (
    <View style={styles.col}>
      {status}
      {isWide ? (
        <View style={styles.wide}>
          <View style={styles.main}>
            {terms}
            {estimate}
          </View>
          <View style={styles.side}>{parties}</View>
        </View>
      ) : (
        <>
          {terms}
          {estimate}
          {parties}
        </>
      )}
      <Text variant="caption" tone="muted">
        Period {formatDayRange(contract.startDate, contract.endDate)} · days counted at the block ({contract.timeZone}).
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  card: { gap: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  // Two terms a row on a phone, three beside the side column on a wide screen.
  term: { flexBasis: '45%' },
  termWide: { flexBasis: '30%' },
  termStacked: { flexBasis: 'auto', flexGrow: 0 },
  parties: { gap: space.sm },
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 2, minWidth: 0, gap: space.lg },
  side: { flex: 1, minWidth: 280, gap: space.md },
});
