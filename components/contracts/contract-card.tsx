import { Link } from 'expo-router';
import { Pressable, StyleSheet, View } from 'react-native';
import type { ContractView } from '@/lib/schemas/contract';
import { formatCents } from '@/lib/money';
import { formatDayRange, formatNumber } from '@/lib/format';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { formatRate } from '@/components/bids/bid-terms';
import { ContractStatusBadge } from './contract-status';

/** One contract in the list, from the viewer's side: the block, the other party, the stay and the estimate. */
export function ContractCard({ contract, viewerId }: { contract: ContractView; viewerId: string | undefined }) {
  const iAmGrazier = contract.grazier.id === viewerId;
  const other = iAmGrazier ? contract.grower : contract.grazier;
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
      </Pressable>
    </Link>
  );
}

const styles = StyleSheet.create({
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line, padding: space.lg, gap: space.xs },
  head: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-start', gap: space.sm, flexWrap: 'wrap' },
  name: { flexShrink: 1 },
});
