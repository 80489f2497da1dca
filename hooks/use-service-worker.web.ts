import { useEffect } from 'react';
import { Workbox } from 'workbox-window';

// The offline app shell (scripts/web/service-worker.ts writes /sw.js at build time). Production builds only: the
// Expo dev server has no sw.js, and a worker caching development bundles would serve stale code.
// workbox-window waits for the page's load event before registering, so precaching never competes with the first screen.
export function useServiceWorker() {
  useEffect(() => {
    if (process.env.NODE_ENV !== 'production' || !('serviceWorker' in navigator)) return;
    const wb = new Workbox('/sw.js', { scope: '/' });
    wb.register().catch((err: unknown) => console.warn('[fieldfold] service worker not registered', err));
  }, []);
}
