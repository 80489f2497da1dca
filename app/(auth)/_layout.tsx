import { Redirect, Stack } from 'expo-router';
import { useSession } from '@/hooks/auth/session';

// The forms are in the page's HTML (rendered at build time, when no session can be known) and show while the
// session restores; someone who turns out to be signed in goes on to their home.
export default function AuthLayout() {
  const { status } = useSession();
  if (status === 'signed-in') return <Redirect href="/" />;
  return <Stack screenOptions={{ headerShown: false }} />;
}
