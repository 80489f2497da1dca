import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';
import { Formik, useField } from 'formik';
import { Link } from 'expo-router';
import { PASSWORD_MIN_LENGTH, registerSchema, type RegisterInput } from '@/lib/schemas/account';
import type { SignupRole } from '@/lib/roles';
import { registerAccount } from '@/hooks/api/account';
import { useSession } from '@/hooks/auth/session';
import { Button, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { FormTextField } from '@/components/form/form-text-field';
import { applyServerErrors, FormError } from '@/components/form/form-error';

const ROLE_CHOICES: Array<{ role: SignupRole; title: string; line: string }> = [
  { role: 'grower', title: 'I have land to graze', line: 'Post orchard, vineyard or cover-crop blocks and compare bids.' },
  { role: 'grazier', title: 'I run a flock', line: 'Find blocks near you, bid head-days, keep the grazing log.' },
];

function RoleChoice() {
  const [field, meta, helpers] = useField<SignupRole[]>('roles');
  const toggle = (role: SignupRole) => {
    const next = field.value.includes(role) ? field.value.filter((r) => r !== role) : [...field.value, role];
    helpers.setValue(next);
    helpers.setTouched(true, false);
  };
  return (
    <View style={{ gap: space.sm }} role="group" aria-label="Your role">
      <Text variant="label">How will you use Fieldfold? (choose one or both)</Text>
      {ROLE_CHOICES.map((c) => {
        const on = field.value.includes(c.role);
        return (
          <Pressable
            key={c.role}
            role="checkbox"
            aria-checked={on}
            aria-label={c.title}
            onPress={() => toggle(c.role)}
            style={[styles.choice, on && styles.choiceOn]}
          >
            <View style={[styles.tick, on && styles.tickOn]}>{on ? <Text tone="onCover" variant="label">✓</Text> : null}</View>
            <View style={{ flex: 1 }}>
              <Text variant="bodyStrong">{c.title}</Text>
              <Text variant="caption" tone="muted">
                {c.line}
              </Text>
            </View>
          </Pressable>
        );
      })}
      {meta.touched && meta.error ? (
        <Text variant="caption" tone="danger" role="alert">
          {typeof meta.error === 'string' ? meta.error : 'Choose grower, grazier or both'}
        </Text>
      ) : null}
    </View>
  );
}

export function SignUpForm() {
  const { signIn } = useSession();
  const [formError, setFormError] = useState<string | null>(null);
  return (
    <Formik<RegisterInput>
      initialValues={{ name: '', email: '', password: '', roles: [] }}
      validationSchema={registerSchema}
      onSubmit={async (values, helpers) => {
        setFormError(null);
        try {
          await signIn(await registerAccount({ ...values, email: values.email.trim().toLowerCase(), name: values.name.trim() }));
        } catch (err) {
          setFormError(applyServerErrors(err, helpers));
        }
      }}
    >
      {({ handleSubmit, isSubmitting }) => (
        <View style={{ gap: space.lg }}>
          <FormError message={formError} />
          <FormTextField name="name" label="Your name" autoComplete="name" />
          <FormTextField name="email" label="Email" autoComplete="email" inputMode="email" autoCapitalize="none" />
          <FormTextField name="password" label="Password" secureTextEntry autoComplete="new-password" hint={`At least ${PASSWORD_MIN_LENGTH} characters.`} />
          <RoleChoice />
          <Button title="Create account" onPress={() => handleSubmit()} loading={isSubmitting} />
          <Text tone="muted">
            Already have an account?{' '}
            <Link href="/sign-in">
              <Text tone="cover" variant="bodyStrong">
                Sign in
              </Text>
            </Link>
          </Text>
        </View>
      )}
    </Formik>
  );
}

const styles = StyleSheet.create({
  choice: { flexDirection: 'row', gap: space.md, alignItems: 'center', padding: space.md, borderWidth: 1, borderColor: colors.lineStrong, borderRadius: radius.md, backgroundColor: colors.surface },
  choiceOn: { borderColor: colors.cover, backgroundColor: colors.coverWash },
  tick: { width: 24, height: 24, borderRadius: radius.sm, borderWidth: 1.5, borderColor: colors.lineStrong, alignItems: 'center', justifyContent: 'center' },
  tickOn: { backgroundColor: colors.cover, borderColor: colors.cover },
});
