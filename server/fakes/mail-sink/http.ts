import fs from 'node:fs';
import path from 'node:path';
import express, { type Express, type Request } from 'express';
import { AppError } from '../../lib/errors/app-error';
import { errorHandler, notFoundHandler } from '../../lib/errors/error-handler';
import { inboxPage, notFoundPage, PAGE_CSP, PAGE_SIZE } from './inbox-page';
import type { MailStore } from './store';

const MAX_LIMIT = 1000;
const FONT_FILES = new Set(['PublicSans_400Regular.ttf', 'PublicSans_600SemiBold.ttf', 'Bitter_700Bold.ttf']);

/** assets/fonts of the repository, from the source tree (tsx, ts-jest) or from build/ (compiled). */
function findFontsDir(): string | null {
  let dir = __dirname;
  for (let i = 0; i < 6; i += 1) {
    const candidate = path.join(dir, 'assets', 'fonts');
    if (fs.existsSync(path.join(candidate, 'PublicSans_400Regular.ttf'))) return candidate;
    dir = path.dirname(dir);
  }
  return null;
}

/** `start` and `limit` as the catchers take them: whole numbers in the query, refused (400) when malformed. */
function paging(req: Request, defaultLimit: number): { start: number; limit: number } {
  const fields: Record<string, string> = {};
  const read = (name: string, fallback: number, max: number): number => {
    const raw = req.query[name];
    if (raw === undefined) return fallback;
    if (typeof raw !== 'string' || !/^\d{1,7}$/.test(raw)) {
      fields[name] = `${name} must be a whole number from 0 to ${max}`;
      return fallback;
    }
    const n = Number(raw);
    if (n > max) fields[name] = `${name} must be a whole number from 0 to ${max}`;
    return n;
  };
  const start = read('start', 0, 1_000_000);
  const limit = read('limit', defaultLimit, MAX_LIMIT);
  if (Object.keys(fields).length > 0) throw AppError.badRequest('Some query parameters need attention', fields);
  return { start, limit };
}

function hostOf(origin: string): string | null {
  try {
    return new URL(origin).host;
  } catch {
    return null; // "null" (sandboxed or opaque origins) and anything malformed
  }
}

function id(req: Request): string {
  const value = req.params.id;
  if (typeof value !== 'string' || value === '') throw AppError.notFound('Message');
  return value;
}

export function sinkApp(store: MailStore, log: (line: string) => void): Express {
  const app = express();
  app.disable('x-powered-by');
  const fontsDir = findFontsDir();

  // same-origin, not no-referrer: under no-referrer browsers send `Origin: null` with the inbox's own
  // "Empty inbox" form, and /clear could not tell it from a cross-site post.
  app.use((_req, res, next) => {
    res.set({ 'X-Content-Type-Options': 'nosniff', 'Referrer-Policy': 'same-origin', 'Cache-Control': 'no-store' });
    next();
  });

  // ——— JSON, in the shape development mail catchers serve ———
  app.get('/api/v2/messages', (req, res) => {
    const { start, limit } = paging(req, 50);
    const items = store.list(start, limit);
    res.json({ total: store.total, count: items.length, start, items });
  });
  app.get('/api/v1/messages', (_req, res) => {
    res.json(store.list(0, store.total));
  });
  app.get('/api/v1/messages/:id', (req, res) => {
    const m = store.get(id(req));
    if (!m) throw AppError.notFound('Message');
    res.json(m);
  });
  app.delete('/api/v1/messages', (_req, res) => {
    store.clear();
    res.status(200).json({ ok: true });
  });
  app.delete('/api/v1/messages/:id', (req, res) => {
    if (!store.remove(id(req))) throw AppError.notFound('Message');
    res.status(200).json({ ok: true });
  });

  // ——— the inbox page ———
  const page = (res: express.Response, status: number, html: string) => {
    res.status(status).set({ 'Content-Security-Policy': PAGE_CSP, 'Content-Type': 'text/html; charset=utf-8' }).send(html);
  };
  app.get('/', (req, res) => {
    const { start } = paging(req, PAGE_SIZE);
    page(res, 200, inboxPage({ items: store.list(start, PAGE_SIZE), total: store.total, start, open: null, fonts: fontsDir !== null }));
  });
  app.get('/messages/:id', (req, res) => {
    const m = store.get(id(req));
    if (!m) return page(res, 404, notFoundPage(store.total, fontsDir !== null));
    page(res, 200, inboxPage({ items: store.list(0, PAGE_SIZE), total: store.total, start: 0, open: m, fonts: fontsDir !== null }));
  });
  app.get('/messages/:id/raw', (req, res) => {
    const m = store.get(id(req));
    if (!m) throw AppError.notFound('Message');
    res.type('text/plain; charset=utf-8').send(m.Raw.Data);
  });
  // A form cannot send DELETE; a cross-site form must not empty the inbox either.
  app.post('/clear', (req, res) => {
    const origin = req.get('origin');
    if (origin !== undefined && hostOf(origin) !== req.get('host')) throw AppError.forbidden('Empty the inbox from its own page');
    store.clear();
    res.redirect(303, '/');
  });
  app.get('/fonts/:file', (req, res) => {
    const file = String(req.params.file);
    if (!fontsDir || !FONT_FILES.has(file)) throw AppError.notFound('Font');
    res.set('Cache-Control', 'public, max-age=86400').sendFile(path.join(fontsDir, file));
  });

  app.use(notFoundHandler);
  app.use(errorHandler(log));
  return app;
}
