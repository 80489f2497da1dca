import { ApiError } from '@/hooks/api/client';
import type { DeviceStore } from './device-store-types';
import { deviceStore } from './device-store';

// The last copy of what a screen showed, kept on the device so that after one visit the contract and its
// log still open with the phone in airplane mode (the service worker serves the app itself). Copies belong
// to the signed-in account and are forgotten when it signs out.

export interface WithCopy<T> {
  data: T;
  /** When the copy shown was saved, if the network failed and the copy was used; null when fresh. */
  savedAt: string | null;
}

let owner: string | null = null;

/** The session sets whose copies are read and written (null when signed out: nothing is kept). */
export function setDeviceCopyOwner(accountId: string | null) {
  owner = accountId;
}

const PREFIX = 'copy/';

/**
 * How long a request may take before a kept copy is shown instead (the request goes on and keeps its answer
 * for next time). One bar of signal in a truck can hold a request open far longer than a grazier will wait.
 */
export const SLOW_NETWORK_MS = 8_000;

export function createDeviceCopies(store: DeviceStore, now: () => number = Date.now, slowMs = SLOW_NETWORK_MS) {
  return {
    /**
     * Fetches and keeps a copy. With no network at all — or none within `slowMs` — answers with the kept
     * copy instead. Server answers (a 404, a 403) are never papered over with an old copy.
     */
    async fetch<T>(name: string, fetcher: () => Promise<T>): Promise<WithCopy<T>> {
      const who = owner;
      const key = `${PREFIX}${who}/${name}`;
      const kept = () => (who ? store.get<{ data: T; savedAt: string }>(key) : Promise.resolve(undefined));
      const network = fetcher().then(async (data): Promise<WithCopy<T>> => {
        if (who) await store.set(key, { data, savedAt: new Date(now()).toISOString() });
        return { data, savedAt: null };
      });
      let timer: ReturnType<typeof setTimeout> | undefined;
      const slow = new Promise<'slow'>((resolve) => {
        timer = setTimeout(() => resolve('slow'), slowMs);
      });
      try {
        const first = await Promise.race([network, slow]);
        if (first !== 'slow') return first;
        const copy = await kept();
        if (copy) {
          network.catch(() => undefined); // still running; its answer is kept for the next read
          return copy;
        }
        return await network;
      } catch (err) {
        if (err instanceof ApiError && err.status === 0) {
          const copy = await kept();
          if (copy) return copy;
        }
        throw err;
      } finally {
        clearTimeout(timer);
      }
    },

    async forget(accountId: string) {
      for (const k of await store.keys(`${PREFIX}${accountId}/`)) await store.del(k);
    },
  };
}

export const deviceCopies = createDeviceCopies(deviceStore);
