import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import compression from 'compression';
import express, { type RequestHandler, type Router } from 'express';
import expressStaticGzip from 'express-static-gzip';
import { matchWebRoute, webRouteTable, type WebRouteTable } from './web-routes';

// How the exported web app and the API reach a phone on a slow link:
// - files of the export were compressed at build time (scripts/web/precompress.ts writes .br and .gz siblings);
//   express-static-gzip picks the sibling the browser accepts, so nothing is compressed per request;
// - what is made per request (the API's JSON) is compressed by `compression`, brotli first when offered;
// - Metro names everything under _expo/static and assets/ by content hash: cached a year, immutable;
// - HTML, the service worker and the manifest keep their names across builds: always revalidated, and HTML and
//   the API are never stored by a shared cache (HTML because it names this build's scripts, the API because it
//   answers one signed-in person).

const HASHED_DIRS = ['_expo', 'assets'];
const PRECOMPRESSED: expressStaticGzip.ExpressStaticGzipOptions = { enableBrotli: true, orderPreference: ['br', 'gzip'], index: false };

/**
 * Put first: compresses dynamic responses and keeps every /api answer out of every cache, the browser's too
 * (a signed-in answer must not be read back from disk after sign-out). Set before any route runs, so errors,
 * 404s and 429s carry it as well; only a route that sends a file (a photo, a PDF) sets its own.
 */
export function compressAndCache(): RequestHandler[] {
  return [
    compression(),
    (req, res, next) => {
      if (req.path === '/api' || req.path.startsWith('/api/')) res.set('Cache-Control', 'no-store');
      next();
    },
  ];
}

/** Reads the export once at start: which HTML file answers which path (dynamic segments included). */
export function webApp(webDir: string): Router {
  const root = path.resolve(webDir);
  const table = webRouteTable(listFiles(root).filter((f) => f.endsWith('.html')));
  const router = express.Router();

  for (const dir of HASHED_DIRS) {
    router.use(`/${dir}`, expressStaticGzip(path.join(root, dir), { ...PRECOMPRESSED, serveStatic: { index: false, redirect: false, maxAge: '365d', immutable: true } }));
  }
  const revalidated = expressStaticGzip(root, {
    ...PRECOMPRESSED,
    serveStatic: {
      index: false,
      redirect: false,
      cacheControl: false,
      setHeaders: (res, file) => res.setHeader('Cache-Control', /\.html(\.br|\.gz)?$/.test(file) ? 'private, no-cache' : 'no-cache'),
    },
  });
  router.use(revalidated);
  router.use(routeHtml(table, revalidated));
  return router;
}

/** Answers a page request with its route's HTML: `/blocks/42` gets `blocks/[blockId].html`, unknown paths the 404 page. */
function routeHtml(table: WebRouteTable, serve: RequestHandler): RequestHandler {
  const spaIndex = table.routes.length === 1 && table.routes[0].file === 'index.html' ? 'index.html' : null;
  return (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || HASHED_DIRS.some((d) => req.path.startsWith(`/${d}/`)) || req.path.startsWith('/api/')) return next();
    let file = matchWebRoute(table, req.path);
    if (!file && table.notFound) {
      file = table.notFound;
      res.status(404);
    } else if (!file && spaIndex) {
      // A single-output export (one index.html, the router runs in the browser) answers every path with it.
      file = spaIndex;
    }
    if (!file) return next();
    const query = req.url.includes('?') ? req.url.slice(req.url.indexOf('?')) : '';
    req.url = `/${file.split('/').map(encodeURIComponent).join('/')}${query}`;
    serve(req, res, next);
  };
}

const INLINE_SCRIPT = /<script\b(?![^>]*\bsrc\s*=)[^>]*>([\s\S]*?)<\/script>/gi;

/**
 * The content-security policy's `'sha256-…'` source for each distinct inline script in the export's pages, read
 * once at start (the export is fixed while the process runs). A build that adds one is covered without a
 * nonce, which static HTML could not carry.
 */
export function webAppInlineScriptHashes(webDir: string): string[] {
  const root = path.resolve(webDir);
  const hashes = new Set<string>();
  for (const file of listFiles(root).filter((f) => f.endsWith('.html'))) {
    for (const m of fs.readFileSync(path.join(root, file), 'utf8').matchAll(INLINE_SCRIPT)) {
      if (m[1].trim() !== '') hashes.add(`'sha256-${crypto.createHash('sha256').update(m[1], 'utf8').digest('base64')}'`);
    }
  }
  return [...hashes].sort();
}

function listFiles(dir: string, prefix = ''): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? listFiles(path.join(dir, e.name), `${prefix}${e.name}/`) : [`${prefix}${e.name}`]));
}
