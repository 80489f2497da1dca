import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import type { ContractDetailView } from '@/hooks/api/contracts';
import { formatCents } from '@/lib/money';
import { formatDayRange, formatNumber } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatRate } from '@/components/bids/bid-terms';
import { ContractStatusBadge } from './contract-status';
import { nextStep, sideOf } from './next-step';

/** One contract in the list, from the viewer's side: the block, the other party, the stay, the estimate, and what comes next. */
export function ContractCard({ contract, viewerId }: { contract: ContractDetailView; viewerId: string | undefined }) {
  const iAmGrazier = contract.grazier.id === viewerId;
  const other = iAmGrazier ? contract.grower : contract.grazier;
  const next = nextStep(contract, sideOf(contract, viewerId));
  return (
    <Link href={`/contracts/${contract.id}`} asChild>
      <Pressable
        role="link"
        aria-label={`Contract for ${contract.block.name}`}
        // One flat style object: Link's asChild slot spreads the child's style, so arrays and functions are lost on the web.
        style={StyleSheet.flatten(styles.card)}
      >
        <View style={styles.head}>
          <Text variant="heading" style={styles.name}>
            {contract.block.name}
          </Text>
          <ContractStatusBadge status={contract.status} />
        </View>
        <Text variant="caption" tone="muted">
          {iAmGrazier ? 'Grower' : 'Grazier'}: {other.businessName ?? other.name}
        </Text>
        <Text>
          {formatDayRange(contract.startDate, contract.endDate)} · {formatNumber(contract.headCount)} {contract.animalClass}
        </Text>
        <Text variant="caption" tone="muted">
          {formatRate(contract.basis, contract.rate)} · estimated {formatCents(contract.normalised.estimatedTotalCents)} for{' '}
          {formatNumber(contract.normalised.headDays)} head-days
        </Text>
        <View style={StyleSheet.flatten([styles.next, next.mine && styles.nextMine])}>
          <Text variant="label" tone={next.mine ? 'caution' : 'muted'} testID={`next-step-${contract.id}`}>
            {next.mine ? 'Your move: ' : 'Next: '}
            {next.text}
          </Text>
        </View>
      </Pressable>
    </Link>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.lg, gap: space.xs },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.sm, flexWrap: 'wrap' },
  name: { flexShrink: 1 },
  next: { marginTop: space.xs, paddingTop: space.sm, borderTopWidth: 1, borderTopColor: colors.line },
  nextMine: { borderTopColor: colors.cautionLine },
});
