import fs from 'node:fs';
import path from 'node:path';
import express, { type Express } from 'express';
import type { DataSource } from 'typeorm';
import { accountsRouter } from './modules/accounts/accounts.routes';
import { calcRouter } from './modules/calc/calc.routes';
import { errorHandler, notFoundHandler } from './lib/errors/error-handler';

export interface AppDeps {
  dataSource: DataSource;
  tokens: { secret: string; ttl: string };
  /** Folder of the exported web app; when absent the process serves the API only. */
  webDir?: string;
  corsOrigin?: string | null;
  log?: (msg: string) => void;
}

/** Builds the whole HTTP app; never listens (server/index.ts does), so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

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
  api.use(notFoundHandler);
  app.use('/api', api);

  if (deps.webDir && fs.existsSync(path.join(deps.webDir, 'index.html'))) {
    const webDir = path.resolve(deps.webDir);
    app.use(express.static(webDir, { extensions: ['html'], index: 'index.html', maxAge: '1h' }));
    // Deep links (/blocks/42) are routes of the single-page app.
    app.get(/^(?!\/api\/).*/, (_req, res) => res.sendFile(path.join(webDir, 'index.html')));
  }

  app.use(errorHandler(deps.log));
  return app;
}
