import type { Server } from 'node:http';
import path from 'node:path';
import { loadConfig, ConfigError } from './config/env';
import { openDatabase } from './db/data-source';
import { seedDemoOnce } from './db/seed/demo';
import { createApp, serviceContext, type AppDeps } from './app';
import type { MailPort } from './lib/mail/mail-port';
import { MemoryMail } from './lib/mail/memory-mail';
import { OutboxSender } from './lib/mail/outbox';
import { SmtpMail } from './lib/mail/smtp-mail';
import { createPayments } from './lib/payments';
import { InvoiceRecovery } from './modules/invoices/invoice-sync';

// config → database (migrations) → demo seed (once) → listen → graceful shutdown.
async function main() {
  const config = loadConfig();
  const dataSource = await openDatabase(config.databasePath);
  if (config.seedDemo) {
    const seeded = await seedDemoOnce(dataSource);
    if (seeded) console.log('[fieldfold] demo data seeded (see README for the demo accounts)');
  }
  // npm start sets SMTP_PORT to the local mail sink; without it mail stays in memory and each message is
  // announced by its subject, JSON-quoted so a subject can never break the log line.
  const mail: MailPort = config.smtp
    ? new SmtpMail({ ...config.smtp, from: config.mailFrom })
    : new MemoryMail((msg) => console.log(`[mail] ${JSON.stringify(msg.subject)}`), 500);
  const outbox = new OutboxSender(dataSource, mail, Date.now, console.error);
  outbox.start();
  const payments = createPayments(config.payments);
  console.log(`[fieldfold] payments: ${config.payments.mode === 'hosted' ? 'the hosted payments API' : `the local fake at ${config.payments.apiUrl}`}`);
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
  };
  const app = createApp(deps);
  // Invoices still being issued (the payments API was down, or the process stopped between two steps) go on.
  const invoiceRecovery = new InvoiceRecovery(serviceContext(deps));
  invoiceRecovery.start();
  const server: Server = app.listen(config.port, config.host, () => {
    const addr = server.address();
    const port = typeof addr === 'object' && addr ? addr.port : config.port;
    console.log(`[fieldfold] listening on http://localhost:${port} (data in ${config.dataDir})`);
    if (config.smtp) {
      const inbox = config.mailUiPort ? ` (local inbox: http://localhost:${config.mailUiPort})` : '';
      console.log(`[fieldfold] mail goes to SMTP ${config.smtp.host}:${config.smtp.port}${inbox}`);
    }
  });

  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`[fieldfold] ${signal}: closing`);
    server.close(async () => {
      await invoiceRecovery.stop();
      await outbox.stop();
      await dataSource.destroy();
      process.exit(0);
    });
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
}

main().catch((err) => {
  console.error(err instanceof ConfigError ? err.message : err);
  process.exit(1);
});
