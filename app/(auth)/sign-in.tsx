import { Stack } from 'expo-router';
import { AuthFrame } from '@/components/shell/auth-frame';
import { SignInForm } from '@/components/shell/sign-in-form';

export default function SignInScreen() {
  return (
    <>
      <Stack.Screen options={{ title: 'Sign in · Fieldfold' }} />
      <AuthFrame title="Sign in">
        <SignInForm />
      </AuthFrame>
    </>
  );
}
