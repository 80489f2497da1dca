import { useState } from 'react';
import { View } from 'react-native';
import { Formik } from 'formik';
import { Link } from 'expo-router';
import { passwordResetConfirmSchema, PASSWORD_MIN_LENGTH, type PasswordResetConfirm } from '@/lib/schemas/account';
import { confirmPasswordReset } from '@/hooks/api/account';
import { ApiError } from '@/hooks/api/client';
import { Button, Notice, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';

/** Sets a new password with the token from the mailed link (the screen reads it from the URL). */
export function ResetPasswordForm({ token }: { token: string }) {
  const [formError, setFormError] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  if (done) {
    return (
      <View style={{ gap: space.lg }}>
        <Notice tone="ok" title="Password set">
          Every device that was signed in has been signed out. Sign in with the new password.
        </Notice>
        <Link href="/sign-in">
          <Text tone="cover" variant="bodyStrong">
            Sign in →
          </Text>
        </Link>
      </View>
    );
  }
  return (
    <Formik<PasswordResetConfirm>
      initialValues={{ token, password: '' }}
      enableReinitialize
      validationSchema={passwordResetConfirmSchema}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          await confirmPasswordReset(values);
          setDone(true);
        } catch (err) {
          const message = applyServerErrors(err, helpers);
          // A problem with the link shows once, in its own notice below.
          if (!(err instanceof ApiError && err.fields.token)) setFormError(message);
        }
      }}
    >
      {({ handleSubmit, isSubmitting, errors, submitCount }) => (
        <View style={{ gap: space.lg }}>
          <FormError message={formError} />
          {/* The token has no input: a problem with it (used, expired, not from our mail) shows here. */}
          {errors.token && submitCount > 0 ? (
            <Notice tone="danger" title="This link does not work">
              {errors.token}
            </Notice>
          ) : null}
          <FormTextField
            name="password"
            label="New password"
            secureTextEntry
            autoComplete="new-password"
            hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
            onSubmitEditing={() => handleSubmit()}
          />
          <Button title="Set new password" onPress={() => handleSubmit()} loading={isSubmitting} />
          <Link href="/forgot-password">
            <Text tone="cover">Ask for a new link</Text>
          </Link>
        </View>
      )}
    </Formik>
  );
}
