import { Stack } from 'expo-router';
import { AuthFrame } from '@/components/shell/auth-frame';
import { ForgotPasswordForm } from '@/components/shell/forgot-password-form';

export default function ForgotPasswordScreen() {
  return (
    <>
      <Stack.Screen options={{ title: 'Forgotten password · Fieldfold' }} />
      <AuthFrame title="Forgotten password">
        <ForgotPasswordForm />
      </AuthFrame>
    </>
  );
}
