import { useEffect } from 'react';

// The offline app shell (scripts/web/service-worker.ts writes /sw.js at build time). Production builds only: the
// Expo dev server has no sw.js, and a worker caching development bundles would serve stale code.
// workbox-window is fetched on its own after the page is up (a dynamic import, its own chunk) and waits for the
// load event before registering, so neither it nor the precaching competes with the first screen.
export function useServiceWorker() {
  useEffect(() => {
    if (process.env.NODE_ENV !== 'production' || !('serviceWorker' in navigator)) return;
    import('workbox-window')
      .then(({ Workbox }) => new Workbox('/sw.js', { scope: '/' }).register())
      .catch((err: unknown) => console.warn('[fieldfold] service worker not registered', err));
  }, []);
}
