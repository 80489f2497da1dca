import { useState } from 'react';
import { View } from 'react-native';
import { Formik } from 'formik';
import { Link } from 'expo-router';
import { loginSchema, type LoginInput } from '@/lib/schemas/account';
import { loginAccount } from '@/hooks/api/account';
import { useSession } from '@/hooks/auth/session';
import { Button, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';

export function SignInForm() {
  const { signIn } = useSession();
  const [formError, setFormError] = useState<string | null>(null);
  return (
    <Formik<LoginInput>
      initialValues={{ email: '', password: '' }}
      validationSchema={loginSchema}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          await signIn(await loginAccount({ email: values.email.trim().toLowerCase(), password: values.password }));
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      {({ handleSubmit, isSubmitting }) => (
        <View style={{ gap: space.lg }}>
          <FormError message={formError} />
          <FormTextField name="email" label="Email" autoComplete="email" inputMode="email" autoCapitalize="none" textContentType="emailAddress" />
          <FormTextField name="password" label="Password" secureTextEntry autoComplete="current-password" onSubmitEditing={() => handleSubmit()} />
          <Button title="Sign in" onPress={() => handleSubmit()} loading={isSubmitting} />
          <Link href="/forgot-password">
            <Text tone="cover">Forgotten password?</Text>
          </Link>
          <Text tone="muted">
            New to Fieldfold?{' '}
            <Link href="/sign-up">
              <Text tone="cover" variant="bodyStrong">
                Create an account
              </Text>
            </Link>
          </Text>
          <Link href="/calculator">
            <Text tone="cover">Try the forage calculator without an account →</Text>
          </Link>
        </View>
      )}
    </Formik>
  );
}
