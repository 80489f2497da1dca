import express, { type Express } from 'express';
import type { DataSource } from 'typeorm';
import { accountsRouter } from './modules/accounts/accounts.routes';
import { calcRouter } from './modules/calc/calc.routes';
import { blocksRouter } from './modules/blocks/blocks.routes';
import { bidsRouter } from './modules/bids/bids.routes';
import { contractsRouter } from './modules/contracts/contracts.routes';
import { errorHandler, notFoundHandler } from './lib/errors/error-handler';
import { compressAndCache, webApp } from './lib/http/web-app';
import type { MailPort } from './lib/mail/mail-port';
import { MemoryMail } from './lib/mail/memory-mail';
import { localPhotoStore } from './lib/storage/photo-store';
import type { ServiceContext } from './lib/service-context';

export interface AppDeps {
  dataSource: DataSource;
  tokens: { secret: string; ttl: string };
  /** Folder of the exported web app; when absent the process serves the API only. */
  webDir?: string;
  corsOrigin?: string | null;
  log?: (msg: string) => void;
  /** Where block photos are stored (DATA_DIR/uploads in production, a temp folder in tests); outside the web root. */
  uploadsDir: string;
  /** Outgoing mail; defaults to an in-memory outbox (the SMTP adapter comes with the payments issue). */
  mail?: MailPort;
  /** Clock in epoch ms, for "today" at a block; tests fix it. */
  now?: () => number;
}

/** Builds the whole HTTP app; never listens (server/index.ts does), so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(compressAndCache());

  const api = express.Router();
  if (deps.corsOrigin) {
    const origin = deps.corsOrigin;
    api.use((req, res, next) => {
      res.set({ 'Access-Control-Allow-Origin': origin, 'Access-Control-Allow-Headers': 'Authorization, Content-Type', 'Access-Control-Allow-Methods': 'GET, POST, PATCH, DELETE', Vary: 'Origin' });
      if (req.method === 'OPTIONS') return void res.status(204).end();
      next();
    });
  }
  api.use(express.json({ limit: '200kb' }));
  api.get('/health', async (_req, res) => {
    await deps.dataSource.query('SELECT 1');
    res.json({ ok: true, service: 'fieldfold' });
  });
  api.use(accountsRouter(deps.dataSource, deps.tokens));
  api.use('/calc', calcRouter());
  const market: ServiceContext = {
    ds: deps.dataSource,
    mail: deps.mail ?? new MemoryMail(undefined, 500),
    now: deps.now ?? Date.now,
    log: deps.log ?? console.error,
    photos: localPhotoStore(deps.uploadsDir),
    tokenSecret: deps.tokens.secret,
  };
  api.use(blocksRouter(market));
  api.use(bidsRouter(market));
  api.use(contractsRouter(market));
  api.use(notFoundHandler);
  app.use('/api', api);

  if (deps.webDir) app.use(webApp(deps.webDir));

  app.use(errorHandler(deps.log));
  return app;
}
