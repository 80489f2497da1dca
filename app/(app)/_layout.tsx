import { Redirect, Stack } from 'expo-router';
import { ErrorState } from '@/components/ui';
import { colors } from '@/components/ui/theme';
import { SignedInFrame } from '@/components/shell/signed-in-frame';
import { useSession } from '@/hooks/auth/session';
import { useLogQueueSender } from '@/hooks/offline/use-log-queue';

// The client-side guard is for comfort; every API route re-checks the account and its role.
// While the session restores — and always in the HTML rendered at build time, where there is no storage and no
// session — the area shows its frame, so a cold load or a reload of /blocks/42 paints at once.
export default function SignedInLayout() {
  const { status, retry } = useSession();
  useLogQueueSender();
  if (status === 'loading') return <SignedInFrame label="Opening your Fieldfold…" />;
  if (status === 'signed-out') return <Redirect href="/sign-in" />;
  if (status === 'unreachable') {
    return <ErrorState message="Fieldfold could not be reached and this device has not kept your account yet. Check the connection and try again: you are still signed in." onRetry={retry} />;
  }
  return <Stack screenOptions={{ headerShown: false, contentStyle: { backgroundColor: colors.paper } }} />;
}
