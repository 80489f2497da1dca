import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { Formik } from 'formik';
import { Button, Card, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { useCancelContract } from '@/hooks/api/contracts';
import { cancelContractSchema, type CancelContractInput } from '@/lib/schemas/contract';

/** Either party may cancel before the animals arrive, saying why; the other party is told. */
export function CancelContract({ contractId }: { contractId: string }) {
  const cancel = useCancelContract(contractId);
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  if (!open) return <Button title="Cancel this contract…" variant="quiet" onPress={() => setOpen(true)} />;
  return (
    <Card style={styles.card} aria-label="Cancel the contract">
      <Text variant="heading">Cancel the contract</Text>
      <Notice tone="caution">Cancelling is possible only before the animals arrive. It cannot be undone; the reason is kept with the contract and sent to the other party.</Notice>
      <Formik<CancelContractInput>
        initialValues={{ reason: '' }}
        validationSchema={cancelContractSchema}
        onSubmit={async (values, helpers) => {
          setFormError(null);
          try {
            await cancel.mutateAsync({ reason: values.reason.trim() });
            setOpen(false);
          } catch (err) {
            setFormError(applyServerErrors(err, helpers));
          }
        }}
      >
        {({ handleSubmit, isSubmitting }) => (
          <>
            <FormTextField name="reason" label="Reason" multiline numberOfLines={3} placeholder="e.g. The block flooded; no grazing this winter." />
            <FormError message={formError} />
            <View style={styles.row}>
              <Button title="Cancel the contract" variant="danger" large loading={isSubmitting} onPress={() => handleSubmit()} />
              <Button title="Keep it" variant="secondary" large onPress={() => setOpen(false)} disabled={isSubmitting} />
            </View>
          </>
        )}
      </Formik>
    </Card>
  );
}

const styles = StyleSheet.create({
  card: { gap: space.md },
  row: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
