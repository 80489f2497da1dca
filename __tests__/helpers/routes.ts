import type { Express } from 'express';

// Every route the built app answers, read from Express 5's own router stack (the `router` package 2.x): a layer
// with a `route` is an endpoint, a layer whose handle has a `stack` is a mounted router, and the layer's `rawPath`
// is the path it was mounted or declared at. Tests that must cover every route (the authorisation matrix, the
// hostile-input properties) compare their tables with this list, so a new route fails them until it has a row.

interface RouterLayer {
  route?: { path: unknown; methods: Record<string, boolean> };
  rawPath?: unknown;
  handle?: { stack?: RouterLayer[] };
}

/** `METHOD /path` for each endpoint, e.g. `POST /api/blocks/:id/publish`, sorted. */
export function listRoutes(app: Express): string[] {
  const out = new Set<string>();
  walk((app as unknown as { router: { stack: RouterLayer[] } }).router.stack, '', out);
  return [...out].sort();
}

function walk(stack: RouterLayer[], prefix: string, out: Set<string>): void {
  for (const layer of stack) {
    if (layer.route) {
      // A list of paths (a limiter put in front of several endpoints, server/app.ts) names each of them.
      for (const p of pathsOf(layer.route.path)) {
        const path = join(prefix, p);
        for (const [method, on] of Object.entries(layer.route.methods)) if (on && method !== '_all') out.add(`${method.toUpperCase()} ${path}`);
      }
    } else if (Array.isArray(layer.handle?.stack)) {
      for (const p of pathsOf(layer.rawPath)) walk(layer.handle.stack, join(prefix, p), out);
    }
  }
}

function pathsOf(raw: unknown): string[] {
  if (Array.isArray(raw)) return raw.flatMap(pathsOf);
  // A regexp could not be named in a table row; fail loudly so the helper learns it.
  if (typeof raw !== 'string') throw new Error(`listRoutes: cannot name a route or mount path of type ${Object.prototype.toString.call(raw)}`);
  return [raw];
}

function join(prefix: string, path: string): string {
  if (path === '/' || path === '') return prefix || '/';
  return `${prefix}${path.startsWith('/') ? '' : '/'}${path}`;
}
