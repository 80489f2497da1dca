import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import type { InvoiceView } from '@/lib/schemas/invoice';
import { TEST_PAYMENT_METHODS, type TestPaymentMethodId } from '@/lib/payments';
import { formatCents } from '@/lib/money';
import { formatDay } from '@/lib/format';
import { usePayInvoice } from '@/hooks/api/invoices';
import { ApiError } from '@/hooks/api/client';
import { Button, Card, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';

/**
 * The grower's pay action. Fieldfold runs against the payments service's test mode, so the choices are its test
 * payment methods, labelled as such: no card number is typed here or ever sent to Fieldfold's server.
 */
export function PayPanel({ invoice }: { invoice: InvoiceView }) {
  const pay = usePayInvoice(invoice.id);
  const [method, setMethod] = useState<TestPaymentMethodId>('pm_card_visa');
  const declined = pay.error instanceof ApiError && pay.error.status === 402;
  const failure = pay.error ? (pay.error instanceof ApiError ? pay.error.message : 'The payment did not go through. Nothing was charged; try again.') : null;
  const earlier = !pay.error && !pay.isPending ? invoice.payment.lastFailure : null;
  const busy = pay.isPending || invoice.payment.inProgress;

  return (
    <Card style={styles.card} testID="pay-panel">
      <Text variant="heading">Pay {formatCents(invoice.totalCents)}</Text>
      <Text variant="caption" tone="muted">
        Due {formatDay(invoice.dueDate)}. Payments go through the payments service in test mode: choose one of its test cards.
      </Text>
      <View role="radiogroup" aria-label="Test payment method" style={styles.methods}>
        {TEST_PAYMENT_METHODS.map((m) => {
          const on = m.id === method;
          return (
            <Pressable
              key={m.id}
              role="radio"
              aria-checked={on}
              aria-label={m.label}
              disabled={busy}
              onPress={() => setMethod(m.id)}
              style={[styles.method, on && styles.methodOn]}
              testID={`method-${m.id}`}
            >
              <View style={[styles.dot, on && styles.dotOn]} />
              <View style={styles.methodText}>
                <Text variant="label">{m.label}</Text>
                <Text variant="caption" tone="muted">
                  {m.detail}
                </Text>
              </View>
              <View style={styles.tag}>
                <Text variant="caption" tone="caution">
                  Test
                </Text>
              </View>
            </Pressable>
          );
        })}
      </View>
      {busy ? (
        <View role="status" aria-live="polite">
          <Text variant="caption" tone="muted">
            Paying… waiting for the payments service. Keep this page open; paying twice is not possible.
          </Text>
        </View>
      ) : null}
      {failure ? (
        <Notice tone="danger" title={declined ? 'Payment declined' : 'Payment not completed'}>
          <Text variant="caption" testID="pay-error">
            {failure}
          </Text>
        </Notice>
      ) : null}
      {earlier ? (
        <Notice tone="caution" title="The last attempt was declined">
          <Text variant="caption">{earlier.message}</Text>
        </Notice>
      ) : null}
      <Button title={`Pay ${formatCents(invoice.totalCents)}`} loading={busy} onPress={() => pay.mutate(method)} testID="pay-button" />
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  methods: { gap: space.sm },
  method: { flexDirection: 'row', alignItems: 'center', gap: space.md, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.lineStrong, backgroundColor: colors.surface },
  methodOn: { borderColor: colors.cover, backgroundColor: colors.coverWash },
  dot: { width: 18, height: 18, borderRadius: 9, borderWidth: 2, borderColor: colors.lineStrong, backgroundColor: colors.surface },
  dotOn: { borderColor: colors.cover, backgroundColor: colors.cover },
  methodText: { flex: 1, gap: 2 },
  tag: { paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill, backgroundColor: colors.cautionWash },
});
