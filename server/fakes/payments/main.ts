// Standalone entry: `node build/server/fakes/payments/main.js` (built with the server), or
// `npx tsx --tsconfig server/tsconfig.json server/fakes/payments/main.ts` in development.
// Listens on PAYMENTS_FAKE_PORT (12111), keeps its state in DATA_DIR/payments-fake and delivers signed events to
// PAYMENTS_WEBHOOK_URL (default: the Fieldfold server on PORT) with the secret the server verifies with.
import { ConfigError, loadPaymentsFakeConfig } from '../../config/env';
import { startPaymentsFake } from './fake';

async function main() {
  const config = loadPaymentsFakeConfig();
  const fake = await startPaymentsFake({
    port: config.port,
    host: config.host,
    dataDir: config.dataDir,
    webhookUrl: config.webhookUrl,
    webhookSecret: config.webhookSecret,
  });
  console.log(`[payments-fake] listening on ${fake.url} (state in ${config.dataDir}; webhooks to ${config.webhookUrl})`);
  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`[payments-fake] ${signal}: closing`);
    fake.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
}

main().catch((err) => {
  console.error(err instanceof ConfigError ? err.message.replace('Fieldfold cannot start', 'The payments fake cannot start') : err);
  process.exit(1);
});
