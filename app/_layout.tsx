import { useState } from 'react';
import { Stack } from 'expo-router';
import Head from 'expo-router/head';
import { StatusBar } from 'expo-status-bar';
import { QueryClientProvider } from '@tanstack/react-query';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { LoadingState } from '@/components/ui';
import { colors } from '@/components/ui/theme';
import { SessionProvider } from '@/hooks/auth/session';
import { makeQueryClient } from '@/hooks/api/query-client';
import { useAppFonts } from '@/hooks/use-app-fonts';
import { useServiceWorker } from '@/hooks/use-service-worker';

export { ErrorBoundary } from '@/components/shell/error-boundary';

export default function RootLayout() {
  const [queryClient] = useState(makeQueryClient);
  const [fontsLoaded, fontError] = useAppFonts();
  useServiceWorker();
  return (
    <SafeAreaProvider>
      <QueryClientProvider client={queryClient}>
        <SessionProvider>
          {/* Written into each page's HTML at build time (Expo Router leaves document titles to Head on the web). */}
          <Head>
            <title>Fieldfold</title>
          </Head>
          <StatusBar style="dark" />
          {fontsLoaded || fontError ? (
            <Stack screenOptions={{ headerShown: false, contentStyle: { backgroundColor: colors.paper } }}>
              <Stack.Screen name="(app)" />
              <Stack.Screen name="(auth)" />
              <Stack.Screen name="calculator" options={{ title: 'Forage calculator · Fieldfold' }} />
            </Stack>
          ) : (
            <LoadingState label="Opening Fieldfold…" />
          )}
        </SessionProvider>
      </QueryClientProvider>
    </SafeAreaProvider>
  );
}
