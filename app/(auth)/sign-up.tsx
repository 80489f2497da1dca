import { Stack } from 'expo-router';
import { AuthFrame } from '@/components/shell/auth-frame';
import { SignUpForm } from '@/components/shell/sign-up-form';

export default function SignUpScreen() {
  return (
    <>
      <Stack.Screen options={{ title: 'Create account · Fieldfold' }} />
      <AuthFrame title="Create your account">
        <SignUpForm />
      </AuthFrame>
    </>
  );
}
