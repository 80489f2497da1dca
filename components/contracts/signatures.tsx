import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import type { PartyView } from '@/lib/schemas/block';
import type { ContractView, SignatureView } from '@/lib/schemas/contract';
import { formatMoment } from '@/lib/local-time';
import { currentSignature, type Side } from './next-step';
import { shortHash } from './terms-fingerprint';

function partyName(p: PartyView): string {
  return p.businessName ? `${p.businessName} (${p.name})` : p.name;
}

function Party({ side, party, contract, you }: { side: Side; party: PartyView; contract: ContractView; you: boolean }) {
  const current = currentSignature(contract, side);
  const earlier: SignatureView | undefined = current ? undefined : contract.signatures?.filter((s) => s.party === side).at(-1);
  return (
    <View style={styles.party} testID={`signature-${side}`}>
      <Text variant="caption" tone="muted">
        {side === 'grower' ? 'Grower' : 'Grazier'}
        {you ? ' — you' : ''}
      </Text>
      <Text variant="bodyStrong">{partyName(party)}</Text>
      {current ? (
        <Text variant="caption" tone="ok">
          ✓ Signed as “{current.typedName}”, {formatMoment(current.signedAt, contract.timeZone)} · terms {shortHash(current.termsHash)}
        </Text>
      ) : earlier ? (
        <Text variant="caption" tone="caution">
          Signed the earlier terms ({shortHash(earlier.termsHash)}); must sign again since they changed
        </Text>
      ) : (
        <Text variant="caption" tone="caution">
          Not signed yet
        </Text>
      )}
    </View>
  );
}

/** Each party with the state of their signature on the terms as they stand. */
export function Signatures({ contract, viewerId }: { contract: ContractView; viewerId: string | undefined }) {
  return (
    <View style={styles.list} aria-label="Signatures">
      <Party side="grower" party={contract.grower} contract={contract} you={contract.grower.id === viewerId} />
      <Party side="grazier" party={contract.grazier} contract={contract} you={contract.grazier.id === viewerId} />
    </View>
  );
}

const styles = StyleSheet.create({
  list: { gap: space.sm },
  party: { gap: 2, padding: space.md, borderRadius: radius.md, backgroundColor: colors.paper },
});
