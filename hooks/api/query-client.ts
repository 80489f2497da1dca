import { onlineManager, QueryClient } from '@tanstack/react-query';
import { ApiError } from './client';

// Named stale times so screens agree on how fresh a list must be.
export const staleTimes = { profile: 60_000, list: 15_000, detail: 10_000 } as const;

export function makeQueryClient() {
  // react-query starts out assuming a connection and learns otherwise only from an `offline` event, which a
  // page opened (or reloaded) in airplane mode never gets: start from what the browser knows.
  const nav = globalThis.navigator as { onLine?: boolean } | undefined;
  if (typeof nav?.onLine === 'boolean') onlineManager.setOnline(nav.onLine);
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: staleTimes.list,
        // 4xx answers will not change on retry; network hiccups might.
        retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
      },
    },
  });
}
