import { Link, useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { ContractStatus } from '@/lib/schemas/contract';
import { formatCents } from '@/lib/money';
import { formatDay, formatDayRange, formatNumber, formatWholeDays } from '@/lib/format';
import { GENERAL_GRAZING_CAUTIONS } from '@/lib/grazing/general-cautions';
import { formatMoment } from '@/lib/local-time';
import { pendingAmendmentOf, signOffOf, type ContractDetailView } from '@/hooks/api/contracts';
import { useLayout } from '@/hooks/use-layout';
import { Button, Card, Figure, Notice, Text } from '@/components/ui';
import type { FigureProps } from '@/components/ui/figure';
import { space } from '@/components/ui/theme';
import { formatRate } from '@/components/bids/bid-terms';
import { UtilisationMeter } from '@/components/bids/utilisation-meter';
import { CautionFlag } from '@/components/market/caution-flag';
import { CautionList } from '@/components/safety/caution-list';
import { AmendmentForm, PendingAmendment } from './amendment';
import { CancelContract } from './cancel-contract';
import { ContractStatusBadge } from './contract-status';
import { LogPdfButton } from './log-pdf-button';
import { currentSignature, nextStep, sideOf } from './next-step';
import { SignPanel } from './sign-panel';
import { Signatures } from './signatures';
import { TermsFingerprint } from './terms-fingerprint';

/** Terms may change until the head-days are proposed; cancelling is only before animals arrive. */
const AMENDABLE: ReadonlySet<ContractStatus> = new Set(['to-sign', 'signed', 'grazing']);
const CANCELLABLE: ReadonlySet<ContractStatus> = new Set(['to-sign', 'signed']);
const HAS_LOG: ReadonlySet<ContractStatus> = new Set(['signed', 'grazing', 'sign-off', 'agreed', 'invoiced', 'paid', 'cancelled']);

/** One agreed term: the shared Figure tile, three abreast on a wide screen, two on a phone, or one per row. */
function Term({ wide, stacked, ...figure }: FigureProps & { wide?: boolean; stacked?: boolean }) {
  return <Figure {...figure} style={[styles.term, wide && styles.termWide, stacked && styles.termStacked]} />;
}

/**
 * One contract from the viewer's side: what they must do next, the terms (copied at award time, changed
 * only by an amendment both sign), the cautions, the terms' fingerprint and each party's signature, the
 * sign panel, and the way to the log, the sign-off and the PDF.
 */
export function ContractDetail({ contract, viewerId, viewerName }: { contract: ContractDetailView; viewerId: string | undefined; viewerName: string }) {
  const { isWide } = useLayout();
  const router = useRouter();
  const n = contract.normalised;
  // The server says what the viewer may do (`viewer`); the local rules stand in for a view without it.
  const facts = contract.viewer;
  const side = facts?.party ?? sideOf(contract, viewerId);
  const next = nextStep(contract, side);
  const amendment = pendingAmendmentOf(contract);
  const signOff = signOffOf(contract);
  const cautions = contract.cautions ?? GENERAL_GRAZING_CAUTIONS;
  // With a change of terms pending, what is signed is the amended version, under its own fingerprint.
  const signingHash = amendment?.termsHash ?? contract.termsHash;
  const mustSign = !!signingHash && (facts ? facts.mustSign : contract.status === 'to-sign' && !!side && !currentSignature(contract, side));
  const canAmend = facts ? facts.canAmend : !!side && AMENDABLE.has(contract.status) && !amendment;
  const canCancel = facts ? facts.canCancel : !!side && CANCELLABLE.has(contract.status);

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

  const signing = (
    <Card style={styles.card}>
      <Text variant="heading">Signatures</Text>
      {contract.termsHash ? <TermsFingerprint hash={contract.termsHash} version={contract.termsVersion} /> : null}
      <Signatures contract={contract} viewerId={viewerId} />
      <Link href={`/blocks/${contract.blockId}`}>
        <Text tone="cover" variant="bodyStrong">
          Open the block →
        </Text>
      </Link>
    </Card>
  );

  const signPanel = mustSign ? <SignPanel contractId={contract.id} termsHash={signingHash!} signerName={viewerName} amended={!!amendment} /> : null;

  const cautionCard = (
    <Card style={styles.card}>
      <CautionList cautions={cautions} title="Cautions with these terms" />
    </Card>
  );

  const records = HAS_LOG.has(contract.status) ? (
    <Card style={styles.card}>
      <Text variant="heading">Grazing log</Text>
      {signOff?.status === 'agreed' || contract.agreedHeadDays != null ? (
        <Figure
          strong
          label="Head-days agreed"
          value={formatNumber(contract.agreedHeadDays ?? signOff?.agreedHeadDays ?? 0, 4)}
          detail="locked; the invoice bills these"
          testID="contract-agreed-head-days"
          style={styles.figureInColumn}
        />
      ) : null}
      <Button title={side === 'grazier' && contract.status !== 'cancelled' ? 'Open the grazing log' : 'Read the grazing log'} large onPress={() => router.push(`/contracts/${contract.id}/log`)} />
      {['grazing', 'sign-off', 'agreed', 'invoiced', 'paid'].includes(contract.status) ? (
        <Button title="Sign-off: the head-days" variant="secondary" large onPress={() => router.push(`/contracts/${contract.id}/sign-off`)} />
      ) : null}
      <LogPdfButton contractId={contract.id} blockName={contract.block.name} large />
    </Card>
  ) : null;

  const changes =
    canAmend || canCancel ? (
      <View style={styles.col}>
        {canAmend ? <AmendmentForm contract={contract} /> : null}
        {canCancel ? <CancelContract contractId={contract.id} /> : null}
      </View>
    ) : null;

  // A spray restriction that ended before the stay began no longer limits it: it stays in the full list only.
  const spent = (key: string) => key === 'pesticide-restriction' && (contract.restrictions?.earliestSafeDate ?? '9999') <= contract.startDate;
  const leading = (contract.cautions ?? []).filter((c) => c.tone === 'danger' && !spent(c.key));
  const status = (
    <View style={styles.col}>
      <View style={styles.statusRow}>
        <ContractStatusBadge status={contract.status} />
        {leading.slice(0, 2).map((c) => (
          <CautionFlag key={c.key} caution={c} />
        ))}
      </View>
      <Notice tone={next.mine ? 'caution' : 'info'} title={next.mine ? 'Your next step' : 'Next'}>
        <Text variant="caption" testID="next-step">
          {next.text}
        </Text>
      </Notice>
      {amendment ? <PendingAmendment contract={contract} amendment={amendment} side={side} /> : null}
      {contract.cancellation ? (
        <Notice tone="info" title={`Cancelled by ${contract.cancellation.byName}, ${formatMoment(contract.cancellation.at, contract.timeZone)}`}>
          {`“${contract.cancellation.reason}”`}
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
            {cautionCard}
            {estimate}
          </View>
          <View style={styles.side}>
            {signing}
            {signPanel}
            {records}
            {changes}
          </View>
        </View>
      ) : mustSign ? (
        // A phone, signing: the terms, then the cautions, then the signatures and the panel.
        <>
          {terms}
          {cautionCard}
          {signing}
          {signPanel}
          {records}
          {estimate}
          {changes}
        </>
      ) : (
        // A phone in the truck: the log first, then the terms and the rest.
        <>
          {records}
          {terms}
          {signing}
          {cautionCard}
          {estimate}
          {changes}
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
  // Figure tiles grow along a row; stacked in a card's column they keep their own height.
  figureInColumn: { flexBasis: 'auto', flexGrow: 0 },
  statusRow: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 2, minWidth: 0, gap: space.lg },
  side: { flex: 1, minWidth: 280, gap: space.md },
});
