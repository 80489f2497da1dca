import { startMailSink } from './index';

// The mail sink as its own process (scripts/local-services.mjs starts it for npm start and npm test):
//   SMTP_PORT (1025) · MAIL_UI_PORT (8025) · MAIL_SINK_DIR (unset: the inbox lives in memory only).
// Loopback only: the sink has no authentication.

function port(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  if (!/^\d{1,5}$/.test(raw) || Number(raw) > 65535) {
    console.error(`Fieldfold mail sink cannot start: ${name} must be a port number from 0 to 65535`);
    process.exit(1);
  }
  return Number(raw);
}

async function main() {
  const sink = await startMailSink({
    smtpPort: port('SMTP_PORT', 1025),
    uiPort: port('MAIL_UI_PORT', 8025),
    dataDir: process.env.MAIL_SINK_DIR || undefined,
    log: (line) => console.log(line),
  });
  console.log(`[mail-sink] SMTP on ${sink.host}:${sink.smtpPort}; inbox on http://localhost:${sink.uiPort}`);
  let closing = false;
  const shutdown = () => {
    if (closing) return;
    closing = true;
    sink.close().then(() => process.exit(0), () => process.exit(1));
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
}

main().catch((err: NodeJS.ErrnoException) => {
  console.error(
    err.code === 'EADDRINUSE'
      ? `Fieldfold mail sink cannot start: a port is in use (${err.message}); set SMTP_PORT / MAIL_UI_PORT to free ones`
      : `Fieldfold mail sink cannot start: ${err.message}`,
  );
  process.exit(1);
});
