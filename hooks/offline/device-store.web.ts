import { createStore, del, get, keys, set } from 'idb-keyval';
import { createMemoryStore, type DeviceStore } from './device-store-types';

// On the web, offline records live in IndexedDB (through idb-keyval) so a reload in airplane mode still has
// the queued log entries and the last copy of each contract and log. A browser that refuses IndexedDB
// (some private windows) gets the in-memory store instead: the app still works while the tab stays open.
function indexedDbStore(): DeviceStore | null {
  if (typeof indexedDB === 'undefined') return null;
  const db = createStore('fieldfold-offline', 'records');
  return {
    kind: 'indexeddb',
    get: (key) => get(key, db),
    set: (key, value) => set(key, value, db),
    del: (key) => del(key, db),
    keys: async (prefix) => (await keys<IDBValidKey>(db)).filter((k): k is string => typeof k === 'string' && k.startsWith(prefix)),
  };
}

function withFallback(primary: DeviceStore | null): DeviceStore {
  const memory = createMemoryStore();
  if (!primary) return memory;
  let failed = false;
  // The first refusal (IndexedDB disabled, quota) switches to memory for the rest of the session.
  async function attempt<R>(run: (s: DeviceStore) => Promise<R>): Promise<R> {
    if (!failed) {
      try {
        return await run(primary!);
      } catch {
        failed = true;
      }
    }
    return run(memory);
  }
  return {
    get kind() {
      return failed ? ('memory' as const) : ('indexeddb' as const);
    },
    get: <T>(key: string) => attempt((s) => s.get<T>(key)),
    set: <T>(key: string, value: T) => attempt((s) => s.set(key, value)),
    del: (key: string) => attempt((s) => s.del(key)),
    keys: (prefix: string) => attempt((s) => s.keys(prefix)),
  };
}

export const deviceStore = withFallback(indexedDbStore());
