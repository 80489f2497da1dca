import * as Linking from 'expo-linking';
import { StyleSheet, View } from 'react-native';
import { paymentTermsLabel, type InvoiceView } from '@/lib/schemas/invoice';
import type { PartyView } from '@/lib/schemas/block';
import { formatCents } from '@/lib/money';
import { formatDay, formatDayRange, formatNumber } from '@/lib/format';
import { formatRate } from '@/lib/terms';
import { apiUrl } from '@/hooks/api/client';
import { useLayout } from '@/hooks/use-layout';
import { Button, Card, Figure, Notice, Text } from '@/components/ui';
import { colors, space } from '@/components/ui/theme';
import { InvoiceStatusBadge } from './invoice-status';
import { PayPanel } from './pay-panel';
import { ReceiptCard } from './receipt-card';

function partyName(p: PartyView): string {
  return p.businessName ? `${p.businessName} (${p.name})` : p.name;
}

function Lines({ invoice }: { invoice: InvoiceView }) {
  return (
    <Card style={styles.card}>
      <Text variant="heading">Lines</Text>
      <View role="table" aria-label="Invoice lines">
        {invoice.lines.map((l, i) => (
          <View key={i} role="row" style={styles.line}>
            <Text style={styles.lineText}>{l.description}</Text>
            <Text variant="bodyStrong">{formatCents(l.amountCents)}</Text>
          </View>
        ))}
        <View role="row" style={[styles.line, styles.totalLine]}>
          <Text variant="bodyStrong" style={styles.lineText}>
            Total due (USD)
          </Text>
          <Text variant="figure" testID="invoice-total">
            {formatCents(invoice.totalCents)}
          </Text>
        </View>
      </View>
      {invoice.servicesIncluded.length ? (
        <Text variant="caption" tone="muted">
          Included in the price: {invoice.servicesIncluded.join(', ')}.
        </Text>
      ) : null}
    </Card>
  );
}

function Facts({ invoice, wide }: { invoice: InvoiceView; wide: boolean }) {
  const cell = wide ? styles.factWide : styles.fact;
  return (
    <Card style={styles.card}>
      <Text variant="heading">Details</Text>
      <View style={styles.grid}>
        <Figure style={cell} label="Issued" value={formatDay(invoice.issueDate)} />
        <Figure style={cell} label="Due" value={formatDay(invoice.dueDate)} detail={paymentTermsLabel(invoice.paymentTermsDays)} testID="invoice-due" />
        <Figure style={cell} label="Price" value={formatRate(invoice.basis, invoice.rate)} />
        {invoice.agreedHeadDays !== null ? <Figure style={cell} label="Head-days agreed" value={formatNumber(invoice.agreedHeadDays, 4)} detail="signed off by both" /> : null}
        <Figure style={cell} label="Stay" value={formatDayRange(invoice.stay.startDate, invoice.stay.endDate)} detail={`${formatNumber(invoice.stay.headCount)} ${invoice.stay.animalClass}`} />
      </View>
      <View style={styles.parties}>
        <Text>
          <Text variant="label">From: </Text>
          {partyName(invoice.grazier)}
        </Text>
        <Text>
          <Text variant="label">To: </Text>
          {partyName(invoice.grower)}
        </Text>
        <Text variant="caption" tone="muted">
          Block: {invoice.block.name}
          {invoice.block.placeName ? `, ${invoice.block.placeName}` : ''}
        </Text>
      </View>
      <Button
        title="Download PDF"
        variant="secondary"
        compact
        onPress={() => void Linking.openURL(apiUrl(invoice.pdf.url.replace(/^\/api/, '')))}
        testID="invoice-pdf"
      />
    </Card>
  );
}

/** What the invoice says, and what the viewer can do with it: pay (the grower), or follow it (the grazier). */
export function InvoiceDetail({ invoice }: { invoice: InvoiceView }) {
  const { isWide } = useLayout();
  const payable = invoice.viewerSide === 'payable' && invoice.payment.ready;
  const status = (
    <View style={styles.status}>
      <InvoiceStatusBadge status={invoice.displayStatus} testID="invoice-status" />
      {invoice.status === 'draft' ? (
        <Notice tone="info" title="Being issued">
          <Text variant="caption">Fieldfold is creating this invoice with the payments service. It can be paid as soon as that is done; this page updates by itself.</Text>
        </Notice>
      ) : null}
      {invoice.viewerSide === 'receivable' && (invoice.displayStatus === 'sent' || invoice.displayStatus === 'overdue') ? (
        <Text tone="muted">
          Sent to {invoice.grower.businessName ?? invoice.grower.name}; {invoice.displayStatus === 'overdue' ? 'overdue since' : 'due'} {formatDay(invoice.dueDate)}.
        </Text>
      ) : null}
      {invoice.status === 'void' ? <Notice tone="info">This invoice was voided and is not payable.</Notice> : null}
    </View>
  );
  const action = invoice.receipt ? <ReceiptCard invoice={invoice} /> : payable ? <PayPanel invoice={invoice} /> : null;
  if (isWide) {
    return (
      <View style={styles.col}>
        {status}
        <View style={styles.wide}>
          <View style={styles.main}>
            <Lines invoice={invoice} />
            <Facts invoice={invoice} wide />
          </View>
          <View style={styles.side}>{action}</View>
        </View>
      </View>
    );
  }
  return (
    <View style={styles.col}>
      {status}
      {action}
      <Lines invoice={invoice} />
      <Facts invoice={invoice} wide={false} />
    </View>
  );
}

const styles = StyleSheet.create({
  col: { gap: space.lg },
  status: { gap: space.sm },
  card: { gap: space.md },
  line: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'baseline', gap: space.md, paddingVertical: space.sm, borderBottomWidth: 1, borderBottomColor: colors.line },
  lineText: { flex: 1 },
  totalLine: { borderBottomWidth: 0, paddingTop: space.md },
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  fact: { flexBasis: '45%' },
  factWide: { flexBasis: '30%' },
  parties: { gap: space.xs },
  wide: { flexDirection: 'row', alignItems: 'flex-start', gap: space.xl },
  main: { flex: 3, minWidth: 0, gap: space.lg },
  side: { flex: 2, minWidth: 320, gap: space.md },
});
