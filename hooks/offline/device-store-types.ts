// What the offline features need from the phone's storage: a few keyed records that survive a reload.
// Keys are plain text with '/' between their parts, so one account's or one contract's records are found
// by prefix.

export interface DeviceStore {
  /** Where records live: 'indexeddb' survives a reload; 'memory' lasts until the app closes. */
  readonly kind: 'indexeddb' | 'memory';
  get<T>(key: string): Promise<T | undefined>;
  set<T>(key: string, value: T): Promise<void>;
  del(key: string): Promise<void>;
  /** Every key that starts with `prefix`. */
  keys(prefix: string): Promise<string[]>;
}

/** A store in a Map: the native fallback, the stand-in when a browser refuses IndexedDB, and the tests' fake. */
export function createMemoryStore(): DeviceStore {
  // Kept as JSON text: a caller that edits what it read must not change what is stored, as with IndexedDB
  // (and Hermes has no structuredClone). Every record kept here is plain JSON.
  const map = new Map<string, string>();
  return {
    kind: 'memory',
    get: async <T>(key: string) => {
      const text = map.get(key);
      return text === undefined ? undefined : (JSON.parse(text) as T);
    },
    set: async (key, value) => {
      map.set(key, JSON.stringify(value));
    },
    del: async (key) => {
      map.delete(key);
    },
    keys: async (prefix) => [...map.keys()].filter((k) => k.startsWith(prefix)),
  };
}
