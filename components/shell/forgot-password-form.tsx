import { useState } from 'react';
import { View } from 'react-native';
import { Formik } from 'formik';
import { Link } from 'expo-router';
import { passwordResetRequestSchema, type PasswordResetRequest } from '@/lib/schemas/account';
import { requestPasswordReset } from '@/hooks/api/account';
import { Button, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';

/** Asks for a reset link. The answer is the same whether or not the email has an account, so it is shown as sent. */
export function ForgotPasswordForm() {
  const [formError, setFormError] = useState<string | null>(null);
  const [sent, setSent] = useState<string | null>(null);
  return (
    <Formik<PasswordResetRequest>
      initialValues={{ email: '' }}
      validationSchema={passwordResetRequestSchema}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          setSent((await requestPasswordReset({ email: values.email.trim().toLowerCase() })).message);
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      {({ handleSubmit, isSubmitting }) => (
        <View style={{ gap: space.lg }}>
          <Text tone="muted">Give the email you sign in with. We mail a link that sets a new password; it works once, for 30 minutes.</Text>
          <FormError message={formError} />
          {sent ? (
            <Notice tone="ok" title="Check your mail">
              {sent}
            </Notice>
          ) : null}
          <FormTextField name="email" label="Email" autoComplete="email" inputMode="email" autoCapitalize="none" textContentType="emailAddress" onSubmitEditing={() => handleSubmit()} />
          <Button title={sent ? 'Send the link again' : 'Mail me a link'} onPress={() => handleSubmit()} loading={isSubmitting} />
          <Link href="/sign-in">
            <Text tone="cover">← Back to sign in</Text>
          </Link>
        </View>
      )}
    </Formik>
  );
}
