// The route table of Expo Router's static export, read from the HTML files it wrote: `sign-in.html` is /sign-in,
// `blocks/[blockId].html` is /blocks/<anything>, `blocks/[blockId]/bid.html` is /blocks/<anything>/bid,
// `[...rest].html` is any depth. The server answers a request with the matching file, and the service worker
// (scripts/web/service-worker.ts) answers an offline navigation with the same file from its precache, so both read
// this one table. Pure: file names in, patterns out (no fs, no express).

export interface WebRoute {
  /** The exported file, relative to the web root, with forward slashes: `blocks/[blockId].html`. */
  file: string;
  /** Anchored regular expression source matched against a URL path without its trailing slash. */
  pattern: string;
  /** True when a segment is a parameter: the file is a frame that the client fills in. */
  dynamic: boolean;
}

export interface WebRouteTable {
  routes: WebRoute[];
  /** `+not-found.html`, answered with 404 for every path no route matches. */
  notFound: string | null;
}

type Segment = { kind: 'static'; text: string } | { kind: 'param' } | { kind: 'rest' };

const escapeRegExp = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

function segmentsOf(file: string): Segment[] | null {
  const parts = file.replace(/\.html$/, '').split('/');
  if (parts[parts.length - 1] === 'index') parts.pop();
  const segments: Segment[] = [];
  for (const part of parts) {
    // Groups `(app)` never appear in a URL: the export also writes each screen under its group's folder,
    // a duplicate of the file outside it. `_sitemap` and `+not-found`/`+html` are the router's own files.
    if (/^\(.+\)$/.test(part) || part.startsWith('_') || part.startsWith('+')) return null;
    const rest = /^\[\.\.\.[^\]]+\]$/.test(part);
    const param = /^\[[^\]]+\]$/.test(part);
    segments.push(rest ? { kind: 'rest' } : param ? { kind: 'param' } : { kind: 'static', text: part });
  }
  return segments;
}

// Static segments win over parameters, parameters over catch-alls, position by position:
// /blocks/new must be blocks/new.html, not blocks/[blockId].html.
const RANK = { static: 0, param: 1, rest: 2 } as const;
function compareSegments(a: Segment[], b: Segment[]): number {
  for (let i = 0; i < Math.max(a.length, b.length); i++) {
    if (!a[i] || !b[i]) return a[i] ? 1 : -1;
    const d = RANK[a[i].kind] - RANK[b[i].kind];
    if (d !== 0) return d;
  }
  return 0;
}

export function webRouteTable(htmlFiles: string[]): WebRouteTable {
  const entries: Array<{ file: string; segments: Segment[] }> = [];
  for (const raw of htmlFiles) {
    const file = raw.replace(/\\/g, '/').replace(/^\/+/, '');
    if (!file.endsWith('.html')) continue;
    const segments = segmentsOf(file);
    if (segments) entries.push({ file, segments });
  }
  entries.sort((a, b) => compareSegments(a.segments, b.segments) || a.file.localeCompare(b.file));
  const routes = entries.map(({ file, segments }) => {
    const body = segments.map((s) => (s.kind === 'static' ? `/${escapeRegExp(s.text)}` : s.kind === 'param' ? '/[^/]+' : '/.+')).join('');
    return { file, pattern: `^${body || '/'}$`, dynamic: segments.some((s) => s.kind !== 'static') };
  });
  const notFound = htmlFiles.map((f) => f.replace(/\\/g, '/').replace(/^\/+/, '')).find((f) => f === '+not-found.html') ?? null;
  return { routes, notFound };
}

/** The exported file that answers `pathname` (`/blocks/42/` and `/blocks/42` alike), or null. */
export function matchWebRoute(table: WebRouteTable, pathname: string): string | null {
  const path = pathname.length > 1 ? pathname.replace(/\/+$/, '') : pathname;
  for (const route of table.routes) if (compiled(route.pattern).test(path)) return route.file;
  return null;
}

const regexps = new Map<string, RegExp>();
function compiled(pattern: string): RegExp {
  let re = regexps.get(pattern);
  if (!re) regexps.set(pattern, (re = new RegExp(pattern)));
  return re;
}
