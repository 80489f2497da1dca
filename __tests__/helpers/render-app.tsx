import type { ReactElement } from 'react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { act, render } from '@testing-library/react-native';
import { SafeAreaProvider } from 'react-native-safe-area-context';
import { SessionProvider } from '@/hooks/auth/session';

/** Renders a component inside the app's providers, with a query client that neither retries nor leaves GC timers behind. */
export async function renderWithProviders(ui: ReactElement) {
  // gcTime Infinity: no clean-up timers (a finished mutation otherwise keeps one for 5 minutes and holds jest open).
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false, gcTime: Infinity }, mutations: { gcTime: Infinity } } });
  const utils = render(
    <SafeAreaProvider initialMetrics={{ frame: { x: 0, y: 0, width: 390, height: 844 }, insets: { top: 0, left: 0, right: 0, bottom: 0 } }}>
      <QueryClientProvider client={queryClient}>
        <SessionProvider>{ui}</SessionProvider>
      </QueryClientProvider>
    </SafeAreaProvider>,
  );
  // Let the session provider finish restoring its token before the test acts.
  await act(async () => {});
  return { ...utils, queryClient };
}
