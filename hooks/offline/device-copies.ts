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

export function createDeviceCopies(store: DeviceStore, now: () => number = Date.now) {
  return {
    /**
     * Fetches and keeps a copy; when the network fails (no answer at all), returns the kept copy instead.
     * Server answers — a 404, a 403 — are never papered over with an old copy.
     */
    async fetch<T>(name: string, fetcher: () => Promise<T>): Promise<WithCopy<T>> {
      const who = owner;
      const key = `${PREFIX}${who}/${name}`;
      try {
        const data = await fetcher();
        if (who) await store.set(key, { data, savedAt: new Date(now()).toISOString() });
        return { data, savedAt: null };
      } catch (err) {
        if (who && err instanceof ApiError && err.status === 0) {
          const copy = await store.get<{ data: T; savedAt: string }>(key);
          if (copy) return copy;
        }
        throw err;
      }
    },

    async forget(accountId: string) {
      for (const k of await store.keys(`${PREFIX}${accountId}/`)) await store.del(k);
    },
  };
}

export const deviceCopies = createDeviceCopies(deviceStore);
