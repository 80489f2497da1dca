import { createMemoryStore } from './device-store-types';

// Native builds keep offline records in memory until a storage module is added (Fieldfold ships on the web
// first; see device-store.web.ts). Entries queued offline are still sent with their client ids once the
// connection returns, as long as the app stays open.
export const deviceStore = createMemoryStore();
