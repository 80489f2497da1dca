import { Redirect, Stack } from 'expo-router';
import { LoadingState } from '@/components/ui';
import { colors } from '@/components/ui/theme';
import { useSession } from '@/hooks/auth/session';

// The client-side guard is for comfort; every API route re-checks the account and its role.
export default function SignedInLayout() {
  const { status } = useSession();
  if (status === 'loading') return <LoadingState label="Opening your Fieldfold…" />;
  if (status === 'signed-out') return <Redirect href="/sign-in" />;
  return <Stack screenOptions={{ headerShown: false, contentStyle: { backgroundColor: colors.paper } }} />;
}
