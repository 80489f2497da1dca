import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './client';

// Named stale times so screens agree on how fresh a list must be.
export const staleTimes = { profile: 60_000, list: 15_000, detail: 10_000 } as const;

export function makeQueryClient() {
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
