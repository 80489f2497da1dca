import express, { type Express } from 'express';
import type { DataSource } from 'typeorm';
import { accountsRouter } from './modules/accounts/accounts.routes';
import { calcRouter } from './modules/calc/calc.routes';
import { blocksRouter } from './modules/blocks/blocks.routes';
import { bidsRouter } from './modules/bids/bids.routes';
import { contractsRouter } from './modules/contracts/contracts.routes';
import { invoicesRouter, paymentsWebhookRouter } from './modules/invoices/invoices.routes';
import type { PaymentsPort } from './lib/payments';
import { errorHandler, notFoundHandler } from './lib/errors/error-handler';
import type { MailOutbox } from './lib/mail/outbox';
import { appLinks } from './lib/mail/links';
import { compressAndCache, webApp, webAppInlineScriptHashes } from './lib/http/web-app';
import { apiCors, securityHeaders } from './lib/http/security-headers';
import { apiRateLimits, type RateLimitOptions } from './lib/http/rate-limit';
import { refuseBuiltInKeys } from './lib/http/validate';
import { localPhotoStore } from './lib/storage/photo-store';
import { localFileStore } from './lib/storage/file-store';
import type { PdfRenderer } from './lib/pdf/pdf-renderer';
import { pdfkitRenderer } from './lib/pdf/pdfkit-renderer';
import type { ServiceContext } from './lib/service-context';
import { AfterAnswer } from './lib/http/after-answer';
import type { Logger } from 'pino';
import { accessLog } from './lib/http/access-log';

export interface AppDeps {
  dataSource: DataSource;
  tokens: { secret: string; ttl: string };
  /** Folder of the exported web app; when absent the process serves the API only. */
  webDir?: string;
  corsOrigin?: string | null;
  log?: (msg: string) => void;
  /** Where block photos are stored (DATA_DIR/uploads in production, a temp folder in tests); outside the web root. */
  uploadsDir: string;
  /** Where generated PDF records are stored (DATA_DIR/documents; a temp folder in tests); outside the web root. */
  documentsDir: string;
  /** The PDF renderer; defaults to pdfkit with Fieldfold's fonts. */
  pdf?: PdfRenderer;
  /** The mail outbox's sender (server/lib/mail/outbox.ts): use cases queue mail, then kick it after commit. */
  outbox: MailOutbox;
  /** Where people open Fieldfold (links in mail); default http://localhost:8080. */
  publicUrl?: string;
  /** Clock in epoch ms, for "today" at a block, sessions and mail; tests fix it. */
  now?: () => number;
  /** The payments API (server/lib/payments): the SDK adapter on the local fake or the hosted API. */
  payments: PaymentsPort;
  /** Request limits (server/lib/http/rate-limit.ts): other numbers, or another store than this process's memory. */
  rateLimits?: RateLimitOptions;
  /** Express's `trust proxy`: which hops' X-Forwarded-For to believe for the client address (default loopback). */
  trustProxy?: string | number;
  /** Work routes run after answering; pass one to await it (shutdown, tests). */
  afterAnswer?: AfterAnswer;
  /** Where the access log goes (server/lib/http/access-log.ts); without one, requests are not logged (most tests). */
  accessLogger?: Logger;
}

/** The ports the business modules use, from the app's dependencies (tests build one to call services directly). */
export function serviceContext(deps: AppDeps): ServiceContext {
  const log = deps.log ?? console.error;
  return {
    ds: deps.dataSource,
    outbox: deps.outbox,
    links: appLinks(deps.publicUrl ?? 'http://localhost:8080'),
    now: deps.now ?? Date.now,
    log,
    photos: localPhotoStore(deps.uploadsDir),
    documents: localFileStore(deps.documentsDir),
    pdf: deps.pdf ?? pdfkitRenderer(),
    payments: deps.payments,
    afterAnswer: deps.afterAnswer ?? new AfterAnswer(log),
    tokenSecret: deps.tokens.secret,
  };
}

/** Builds the whole HTTP app; never listens (server/index.ts does), so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  // No ETag computed over every JSON answer (a hash of the whole body, each time): /api answers are no-store, so
  // nothing revalidates them. The files keep their own validators (serve-static's, and the documents' SHA-256).
  app.set('etag', false);
  // The rate limits count per client address: only a proxy we run may say what it is (X-Forwarded-For).
  app.set('trust proxy', deps.trustProxy ?? 'loopback');
  // First, so every answer is logged, refusals by the limits included.
  if (deps.accessLogger) app.use(accessLog(deps.accessLogger));
  app.use(
    securityHeaders({
      inlineScriptHashes: deps.webDir ? webAppInlineScriptHashes(deps.webDir) : [],
      https: (deps.publicUrl ?? '').startsWith('https://'),
      corsOrigin: deps.corsOrigin ?? null,
    }),
  );
  app.use(compressAndCache());

  const api = express.Router();
  if (deps.corsOrigin) api.use(apiCors(deps.corsOrigin));
  // Limits first, so a refused request costs no JSON parse, no multer read and no bcrypt (numbers in rate-limit.ts).
  const limits = apiRateLimits(deps.tokens.secret, deps.rateLimits);
  api.use(limits.writes);
  api.post(['/blocks/:id/photos', '/contracts/:id/log/:entryId/photos'], limits.uploads);
  api.use(express.json({ limit: '200kb' }), refuseBuiltInKeys);
  // After the parser: these count per email as well as per address.
  api.post('/auth/login', limits.signIn);
  api.post('/auth/register', limits.signUp);
  api.post(['/auth/password-reset', '/auth/password-reset/confirm'], limits.passwordReset);
  api.get('/health', async (_req, res) => {
    await deps.dataSource.query('SELECT 1');
    res.json({ ok: true, service: 'fieldfold' });
  });
  const ctx = serviceContext(deps);
  api.use(accountsRouter(ctx, deps.tokens));
  api.use('/calc', calcRouter());
  api.use(blocksRouter(ctx));
  api.use(bidsRouter(ctx));
  api.use(contractsRouter(ctx));
  api.use(invoicesRouter(ctx));
  api.use(notFoundHandler);
  // Ahead of the API router and its JSON parser: the webhook's signature covers the raw bytes.
  app.use('/api', paymentsWebhookRouter(ctx));
  app.use('/api', api);

  if (deps.webDir) app.use(webApp(deps.webDir));

  app.use(errorHandler(deps.log));
  return app;
}
