import cors from 'cors';
import helmet from 'helmet';
import type { RequestHandler } from 'express';

export interface SecurityHeaderOptions {
  /**
   * `'sha256-…'` sources of the inline scripts the exported pages carry (webAppInlineScriptHashes): the export
   * has one, `globalThis.__EXPO_ROUTER_HYDRATE__=true;`, that tells Expo Router to hydrate the static HTML.
   */
  inlineScriptHashes: string[];
  /** PUBLIC_URL is https: ask browsers to upgrade any http subresource (never on plain-http localhost). */
  https: boolean;
  /** The Expo dev server's origin when it runs apart from the API (CORS_ORIGIN); null in production. */
  corsOrigin: string | null;
}

/**
 * helmet's headers with Fieldfold's content-security policy, on every answer (pages and API alike).
 *
 * - Scripts: this origin's files plus the hashed inline scripts; no 'unsafe-inline', no 'unsafe-eval'.
 * - Styles need 'unsafe-inline': React Native Web renders every style as a `style="…"` attribute or as rules in
 *   `<style>` elements it writes at build time and at run time (about a dozen attributes and four style
 *   elements per page, changing with every screen), and the @font-face rules sit inline in +html.tsx. Hashing
 *   them would need a hash per rendered element; inline styles cannot run code, so the risk left is CSS-only.
 * - Fonts: self-hosted WOFF2 subsets only (scripts/web/fonts.ts); no font CDN.
 * - Images: this origin (block and log photos behind their signed links), and data: and blob: for images a page
 *   holds itself rather than fetches.
 * - connect-src 'self': the app talks to its own API only (same origin in production).
 */
export function securityHeaders(options: SecurityHeaderOptions): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        'default-src': ["'self'"],
        'script-src': ["'self'", ...options.inlineScriptHashes],
        'style-src': ["'self'", "'unsafe-inline'"],
        'font-src': ["'self'"],
        'img-src': ["'self'", 'data:', 'blob:'],
        'connect-src': ["'self'"],
        'worker-src': ["'self'"],
        'manifest-src': ["'self'"],
        'object-src': ["'none'"],
        'base-uri': ["'self'"],
        'form-action': ["'self'"],
        'frame-ancestors': ["'none'"],
        'script-src-attr': ["'none'"],
        ...(options.https ? { 'upgrade-insecure-requests': [] } : {}),
      },
    },
    // Photos are <img>s of the app's own pages; only the Expo dev server (another origin) needs them cross-origin.
    crossOriginResourcePolicy: { policy: options.corsOrigin ? 'cross-origin' : 'same-origin' },
    referrerPolicy: { policy: 'no-referrer' },
    frameguard: { action: 'deny' },
    // Only over TLS does a browser keep it (it ignores the header on plain http).
    strictTransportSecurity: options.https ? { maxAge: 180 * 24 * 3600, includeSubDomains: true } : false,
  });
}

/**
 * CORS for the API when the Expo dev server runs on another origin (CORS_ORIGIN); that one origin only, with the
 * headers and methods the app's client sends. Without CORS_ORIGIN no CORS header is sent: app and API share one
 * origin and a browser refuses every cross-origin read.
 */
export function apiCors(origin: string): RequestHandler {
  return cors({
    origin,
    methods: ['GET', 'POST', 'PATCH', 'DELETE'],
    allowedHeaders: ['Authorization', 'Content-Type'],
    exposedHeaders: ['Retry-After', 'RateLimit', 'RateLimit-Policy'],
    maxAge: 600,
  });
}
