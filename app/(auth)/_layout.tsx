import { Redirect, Stack } from 'expo-router';
import { LoadingState } from '@/components/ui';
import { useSession } from '@/hooks/auth/session';

export default function AuthLayout() {
  const { status } = useSession();
  if (status === 'loading') return <LoadingState />;
  if (status === 'signed-in') return <Redirect href="/" />;
  return <Stack screenOptions={{ headerShown: false }} />;
}
