import { Redirect, Stack } from 'expo-router';
import { ErrorState, LoadingState } from '@/components/ui';
import { colors } from '@/components/ui/theme';
import { useSession } from '@/hooks/auth/session';
import { useLogQueueSender } from '@/hooks/offline/use-log-queue';

// The client-side guard is for comfort; every API route re-checks the account and its role.
export default function SignedInLayout() {
  const { status, retry } = useSession();
  useLogQueueSender();
  if (status === 'loading') return <LoadingState label="Opening your Fieldfold…" />;
  if (status === 'signed-out') return <Redirect href="/sign-in" />;
  if (status === 'unreachable') {
    return <ErrorState message="Fieldfold could not be reached and this device has not kept your account yet. Check the connection and try again: you are still signed in." onRetry={retry} />;
  }
  return <Stack screenOptions={{ headerShown: false, contentStyle: { backgroundColor: colors.paper } }} />;
}
