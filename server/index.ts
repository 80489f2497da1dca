import type { Server } from 'node:http';
import path from 'node:path';
import { loadConfig, ConfigError } from './config/env';
import { openDatabase } from './db/data-source';
import { seedDemoOnce } from './db/seed/demo';
import { AfterAnswer } from './lib/http/after-answer';
import { createApp, serviceContext, type AppDeps } from './app';
import type { MailPort } from './lib/mail/mail-port';
import { MemoryMail } from './lib/mail/memory-mail';
import { OutboxSender } from './lib/mail/outbox';
import { SmtpMail } from './lib/mail/smtp-mail';
import { createPayments } from './lib/payments';
import { InvoiceRecovery } from './modules/invoices/invoice-sync';
import { registerRunning, runningProcesses } from './lib/running-servers';
import { DatabaseRateLimitStore } from './lib/http/rate-limit-store';
import { scaledLimits } from './lib/http/rate-limit';
import { errorLine, serverLogger } from './lib/log';

// config → database (migrations) → demo seed (once) → listen → graceful shutdown.
async function main() {
  const config = loadConfig();
  const logger = serverLogger(config.logLevel);
  const logError = errorLine(logger);
  // DATA_DIR/running/<pid>.json says a server uses this folder (npm run restore refuses while one does); written
  // before the database opens, so a restore that begins now sees it, and a restore already running stops us.
  const unregister = registerRunning(config.dataDir, 'server', { port: config.port });
  const restoring = runningProcesses(config.dataDir).find((p) => p.role === 'restore');
  if (restoring) throw new ConfigError(`Fieldfold cannot start: a restore (process ${restoring.pid}) is replacing the data in ${config.dataDir}; start again once it has finished`);
  // With several processes on one PostgreSQL database, one migrates and seeds while the others wait (data-source.ts).
  const dataSource = await openDatabase(config.databaseUrl ?? config.databasePath, async (ds) => {
    if (!config.seedDemo) return;
    const seeded = await seedDemoOnce(ds);
    if (seeded) logger.info('[fieldfold] demo data seeded (see README for the demo accounts)');
  });
  // npm start sets SMTP_PORT to the local mail sink; without it mail stays in memory and each message is
  // announced by its subject, JSON-quoted so a subject can never break the log line.
  const mail: MailPort = config.smtp
    ? new SmtpMail({ ...config.smtp, from: config.mailFrom })
    : new MemoryMail((msg) => logger.info(`[mail] ${JSON.stringify(msg.subject)}`), 500);
  const outbox = new OutboxSender(dataSource, mail, Date.now, logError);
  const afterAnswer = new AfterAnswer(logError);
  outbox.start();
  const payments = createPayments(config.payments);
  logger.info(`[fieldfold] payments: ${config.payments.mode === 'hosted' ? 'the hosted payments API' : `the local fake at ${config.payments.apiUrl}`}`);
  const deps: AppDeps = {
    dataSource,
    tokens: { secret: config.tokenSecret, ttl: config.tokenTtl },
    webDir: config.webDir,
    corsOrigin: config.corsOrigin,
    trustProxy: config.trustProxy,
    uploadsDir: path.join(config.dataDir, 'uploads'),
    documentsDir: path.join(config.dataDir, 'documents'),
    outbox,
    publicUrl: config.publicUrl,
    payments,
    afterAnswer,
    log: logError,
    accessLogger: logger,
    // Several processes (PostgreSQL, or SERVER_PROCESSES > 1 on one SQLite file) count every limit in the shared
    // database, so a guesser gets no more tries by landing on another process; one process counts in memory.
    rateLimits: {
      limits: scaledLimits(config.rateLimitMultiplier),
      store: config.databaseUrl !== null || Number(process.env.SERVER_PROCESSES ?? 1) > 1 ? (name) => new DatabaseRateLimitStore(dataSource, { prefix: `${name}:` }) : undefined,
    },
  };
  const app = createApp(deps);
  // Invoices still being issued (the payments API was down, or the process stopped between two steps) go on.
  const invoiceRecovery = new InvoiceRecovery(serviceContext(deps));
  invoiceRecovery.start();
  const server: Server = app.listen(config.port, config.host, () => {
    const addr = server.address();
    const port = typeof addr === 'object' && addr ? addr.port : config.port;
    const database = config.databaseUrl ? `PostgreSQL at ${postgresLabel(config.databaseUrl)}` : 'SQLite';
    logger.info(`[fieldfold] listening on http://localhost:${port} (${database}; files in ${config.dataDir})`);
    if (config.smtp) {
      const inbox = config.mailUiPort ? ` (local inbox: http://localhost:${config.mailUiPort})` : '';
      logger.info(`[fieldfold] mail goes to SMTP ${config.smtp.host}:${config.smtp.port}${inbox}`);
    }
  });

  // Idle keep-alive connections stay open longer than a load balancer's or a client pool's idle timeout (commonly
  // 60 s): Node's 5 s default closes a socket just as a client reuses it, and that request fails ("other side closed").
  server.keepAliveTimeout = 65_000;
  server.headersTimeout = 66_000;

  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    logger.info(`[fieldfold] ${signal}: closing`);
    server.close(async () => {
      await afterAnswer.settled();
      await invoiceRecovery.stop();
      await outbox.stop();
      await dataSource.destroy();
      unregister();
      process.exit(0);
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
}

/** host:port/database of a DATABASE_URL, without the user and password (for the start-up line). */
function postgresLabel(url: string): string {
  const u = new URL(url);
  return `${u.host}${u.pathname}`;
}

main().catch((err) => {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
});
