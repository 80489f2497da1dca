import { useState } from 'react';
import { StyleSheet } from 'react-native';
import { Formik, useField } from 'formik';
import { Button, Card, Checkbox, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';
import { ApiError } from '@/hooks/api/client';
import { useSignContract } from '@/hooks/api/contracts';
import { signContractSchema, type SignContractInput } from '@/lib/schemas/contract';
import { shortHash } from './terms-fingerprint';

/** The form starts unticked; the schema accepts only a tick. */
type SignValues = Omit<SignContractInput, 'cautionsAcknowledged'> & { cautionsAcknowledged: boolean };

function CautionsTick() {
  const [field, meta, helpers] = useField<boolean>('cautionsAcknowledged');
  return (
    <Checkbox
      label="I have read the cautions shown with these terms"
      checked={field.value === true}
      onChange={(on) => {
        helpers.setTouched(true, false);
        void helpers.setValue(on);
      }}
      error={meta.touched ? meta.error : undefined}
      testID="cautions-acknowledged"
    />
  );
}

/**
 * Signing: the full name typed, the cautions ticked as read, and the fingerprint of the terms on screen
 * sent along, so the server refuses (409) if the terms changed while the signer was reading them.
 */
export function SignPanel({ contractId, termsHash, signerName, amended, onSigned }: { contractId: string; termsHash: string; signerName: string; amended?: boolean; onSigned?: () => void }) {
  const sign = useSignContract(contractId);
  const [formError, setFormError] = useState<string | null>(null);
  const [stale, setStale] = useState(false);
  return (
    <Card style={styles.card} aria-label="Sign the contract">
      <Text variant="heading">{amended ? 'Sign the changed terms' : 'Sign the contract'}</Text>
      <Text variant="caption" tone="muted">
        You sign the {amended ? 'changed terms' : 'terms'} with fingerprint {shortHash(termsHash)}. Typing your full name here is your signature; both parties’ signatures, names and times go on
        the record.
      </Text>
      <Formik<SignValues>
        initialValues={{ typedName: '', cautionsAcknowledged: false, termsHash }}
        validationSchema={signContractSchema}
        enableReinitialize
        onSubmit={async (values, helpers) => {
          setFormError(null);
          setStale(false);
          try {
            await sign.mutateAsync(values as SignContractInput);
            onSigned?.();
          } catch (err) {
            if (err instanceof ApiError && err.status === 409) setStale(true);
            setFormError(applyServerErrors(err, helpers));
          }
        }}
      >
        {({ handleSubmit, isSubmitting }) => (
          <>
            <FormTextField name="typedName" label="Your full name" placeholder={signerName} autoCapitalize="words" autoComplete="name" hint={`As on your account: ${signerName}`} />
            <CautionsTick />
            {stale ? (
              <Notice tone="caution" title="The terms changed">
                The terms were changed while you had them open. The new terms are on screen now: read them and the cautions again before you sign.
              </Notice>
            ) : (
              <FormError message={formError} />
            )}
            <Button title={amended ? 'Sign the changed terms' : 'Sign the contract'} large loading={isSubmitting} onPress={() => handleSubmit()} />
          </>
        )}
      </Formik>
    </Card>
  );
}

const styles = StyleSheet.create({ card: { gap: space.md } });
