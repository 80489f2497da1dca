import { Stack, useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '@/components/shell/auth-frame';
import { ResetPasswordForm } from '@/components/shell/reset-password-form';

// Opened from the mailed link: /reset-password?token=…
export default function ResetPasswordScreen() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  return (
    <>
      <Stack.Screen options={{ title: 'Set a new password · Fieldfold' }} />
      <AuthFrame title="Set a new password">
        <ResetPasswordForm token={typeof token === 'string' ? token : ''} />
      </AuthFrame>
    </>
  );
}
