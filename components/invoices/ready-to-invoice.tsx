import { useState } from 'react';
import { useRouter } from 'expo-router';
import { StyleSheet, View } from 'react-native';
import type { ContractView } from '@/lib/schemas/contract';
import { DEFAULT_PAYMENT_TERMS_DAYS, PAYMENT_TERMS_DAYS, paymentTermsLabel, type PaymentTermsDays } from '@/lib/schemas/invoice';
import { invoiceCharge } from '@/lib/invoices';
import { formatCents } from '@/lib/money';
import { formatDayRange, formatNumber } from '@/lib/format';
import { formatRate } from '@/lib/terms';
import { useContracts } from '@/hooks/api/contracts';
import { useCreateInvoice } from '@/hooks/api/invoices';
import { ApiError } from '@/hooks/api/client';
import { useSession } from '@/hooks/auth/session';
import { Button, Card, Segmented, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

const TERMS_OPTIONS = PAYMENT_TERMS_DAYS.map((d) => ({ value: String(d) as `${PaymentTermsDays}`, label: d === 0 ? 'On receipt' : `${d} days` }));

/** What the invoice will bill, when the contract's view carries the agreed head-days (or needs none). */
function preview(c: ContractView): string | null {
  try {
    return formatCents(invoiceCharge({ basis: c.basis, rate: c.rate, agreedHeadDays: c.agreedHeadDays ?? null, acres: c.acres }).totalCents);
  } catch {
    return null;
  }
}

function ReadyCard({ contract: c }: { contract: ContractView }) {
  const router = useRouter();
  const create = useCreateInvoice();
  const [terms, setTerms] = useState<`${PaymentTermsDays}`>(String(DEFAULT_PAYMENT_TERMS_DAYS) as `${PaymentTermsDays}`);
  const total = preview(c);
  return (
    <Card testID={`ready-${c.id}`}>
      <Text variant="bodyStrong">{c.block.name}</Text>
      <Text variant="caption" tone="muted">
        Grower: {c.grower.businessName ?? c.grower.name} · {formatDayRange(c.startDate, c.endDate)} · {formatRate(c.basis, c.rate)}
      </Text>
      <Text>
        {c.agreedHeadDays != null ? `${formatNumber(c.agreedHeadDays, 4)} head-days agreed at sign-off` : 'Head-days agreed at sign-off'}
        {total ? ` · invoice total ${total}` : ''}
      </Text>
      <Segmented label="Payment terms" value={terms} options={TERMS_OPTIONS} onChange={setTerms} />
      <Text variant="caption" tone="muted">
        {paymentTermsLabel(Number(terms))}. The lines and total are computed by Fieldfold from the contract and the agreed head-days; each contract is invoiced once.
      </Text>
      {create.error ? (
        <Text variant="caption" tone="danger" role="alert">
          {create.error instanceof ApiError ? create.error.message : 'The invoice was not created.'}
        </Text>
      ) : null}
      <Button
        title="Create invoice"
        loading={create.isPending}
        testID={`create-invoice-${c.id}`}
        onPress={() => create.mutate({ contractId: c.id, paymentTermsDays: Number(terms) as PaymentTermsDays }, { onSuccess: (inv) => router.push(`/invoices/${inv.id}`) })}
      />
    </Card>
  );
}

/** The grazier's contracts whose head-days are agreed and not yet invoiced. */
export function ReadyToInvoice() {
  const contracts = useContracts();
  const { user } = useSession();
  const ready = contracts.items.filter((c) => c.status === 'agreed' && c.grazier.id === user?.id);
  if (!ready.length) return null;
  return (
    <View style={styles.col}>
      <Text variant="heading">Ready to invoice</Text>
      {ready.map((c) => (
        <ReadyCard key={c.id} contract={c} />
      ))}
    </View>
  );
}

const styles = StyleSheet.create({ col: { gap: space.md } });
