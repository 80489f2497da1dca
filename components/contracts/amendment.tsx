import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Formik } from 'formik';
import { Button, Card, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormDateField } from '@/components/form/form-date-field';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { useCloseAmendment, useProposeAmendment } from '@/hooks/api/contracts';
import { formatDay, formatNumber } from '@/lib/format';
import { formatMoment } from '@/lib/local-time';
import { amendmentSchema, type AmendmentInput, type AmendmentView, type ContractView } from '@/lib/schemas/contract';
import { formatRate, RATE_UNIT } from '@/lib/terms';

// The terms an amendment may change, in the order the form asks for them, with how each is shown.
const AMENDABLE = ['headCount', 'startDate', 'endDate', 'outBy', 'rate'] as const;
type Amendable = (typeof AMENDABLE)[number];

/**
 * A proposed change of terms: each term from → to, why, who asked, who has signed the new version. The
 * proposer may withdraw it and the other party decline it; once both sign, it replaces the terms.
 */
export function PendingAmendment({ contract, amendment, side }: { contract: ContractView; amendment: AmendmentView; side: 'grower' | 'grazier' | null }) {
  const mine = side === amendment.proposedBy;
  const close = useCloseAmendment(contract.id, amendment.id, mine ? 'withdraw' : 'decline');
  const signed = (party: 'grower' | 'grazier') => amendment.signatures.find((s) => s.party === party);
  return (
    <Notice tone="caution" title={`Change of terms proposed (version ${amendment.version})`}>
      <View style={styles.changes} testID="pending-amendment">
        {amendment.changes.map((c) => (
          <Text key={c.field} variant="caption">
            {c.label}: {c.from} → <Text variant="label">{c.to}</Text>
          </Text>
        ))}
        <Text variant="caption">“{amendment.reason}”</Text>
        <Text variant="caption" tone="muted">
          Proposed by {amendment.proposedByName}, {formatMoment(amendment.createdAt, contract.timeZone)}. Until both of you sign it, the signed terms stand.
        </Text>
        {(['grower', 'grazier'] as const).map((p) => {
          const s = signed(p);
          return (
            <Text key={p} variant="caption" tone={s ? 'ok' : 'caution'}>
              {p === 'grower' ? 'Grower' : 'Grazier'}: {s ? `✓ signed as “${s.typedName}”, ${formatMoment(s.signedAt, contract.timeZone)}` : 'not signed yet'}
            </Text>
          );
        })}
        {side ? (
          <View style={styles.row}>
            <Button
              title={mine ? 'Withdraw the change' : 'Decline the change'}
              variant="secondary"
              compact
              loading={close.isPending}
              onPress={() => close.mutate({})}
            />
          </View>
        ) : null}
        {close.error ? (
          <Text variant="caption" tone="danger" role="alert">
            {close.error.message}
          </Text>
        ) : null}
      </View>
    </Notice>
  );
}

type Values = { headCount: number | null; startDate: string; endDate: string; outBy: string; rate: string; reason: string };

/** The body sent: only the terms that differ from the contract's, and the reason. */
export function amendmentBody(c: Pick<ContractView, Amendable>, v: Values): AmendmentInput {
  const body: Record<string, unknown> = { reason: v.reason.trim() };
  for (const f of AMENDABLE) {
    const value = f === 'headCount' ? v.headCount : v[f].trim();
    if (value !== null && value !== '' && value !== c[f]) body[f] = value;
  }
  return body as AmendmentInput;
}

/** Propose changed terms (head count, dates, rate, out-by) with a reason; signatures clear and both re-sign. */
export function AmendmentForm({ contract }: { contract: ContractView }) {
  const propose = useProposeAmendment(contract.id);
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  if (!open) return <Button title="Propose a change to the terms…" variant="secondary" onPress={() => setOpen(true)} />;
  const initial: Values = { headCount: contract.headCount, startDate: contract.startDate, endDate: contract.endDate, outBy: contract.outBy, rate: contract.rate, reason: '' };
  return (
    <Card style={styles.card} aria-label="Propose a change to the terms">
      <Text variant="heading">Propose a change</Text>
      <Text variant="caption" tone="muted">
        Change what needs changing and say why. Both signatures are cleared and both of you sign the new terms; until then the signed terms stand.
      </Text>
      <Formik<Values>
        initialValues={initial}
        // The shared schema checks every field as typed; these two checks are about the form as a whole.
        // (Formik merges both, and these messages win for the same field.)
        validationSchema={amendmentSchema}
        validate={(v) => {
          if (v.headCount == null) return { headCount: `Give a head count (it is ${formatNumber(contract.headCount)} now)` };
          if (v.reason.trim() && Object.keys(amendmentBody(contract, v)).length === 1) return { reason: 'Change at least one term: as typed, the terms stay the same' };
          return {};
        }}
        onSubmit={async (v, helpers) => {
          setFormError(null);
          try {
            await propose.mutateAsync(amendmentBody(contract, v));
            setOpen(false);
          } catch (err) {
            setFormError(applyServerErrors(err, helpers));
          }
        }}
      >
        {({ handleSubmit, isSubmitting }) => (
          <>
            <FormTextField name="headCount" label="Head count" numeric unit="head" hint={`Now ${formatNumber(contract.headCount)}`} />
            <FormDateField name="startDate" label="Animals in" hint={`Now ${formatDay(contract.startDate)}`} />
            <FormDateField name="endDate" label="Animals out" hint={`Now ${formatDay(contract.endDate)}`} />
            <FormDateField name="outBy" label="Out by (before harvest)" hint={`Now ${formatDay(contract.outBy)}`} />
            <FormTextField name="rate" label="Rate" unit={RATE_UNIT[contract.basis]} inputMode="decimal" hint={`Now ${formatRate(contract.basis, contract.rate)}`} />
            <FormTextField name="reason" label="Why the terms change" multiline numberOfLines={3} />
            <FormError message={formError} />
            <View style={styles.row}>
              <Button title="Propose the change" large loading={isSubmitting} onPress={() => handleSubmit()} />
              <Button title="Cancel" variant="secondary" large onPress={() => setOpen(false)} disabled={isSubmitting} />
            </View>
          </>
        )}
      </Formik>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  changes: { gap: 2 },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
