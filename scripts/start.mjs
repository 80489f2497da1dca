// npm start: install if needed → build the web app and server if stale → the local services (mail sink on
// SMTP_PORT 1025, its inbox on MAIL_UI_PORT 8025, the payments fake on PAYMENTS_FAKE_PORT 12111 unless a real
// payments API is configured) → one Express process on :8080 serving the API and the
// app, with SQLite in DATA_DIR seeded once with the invented demo district.
import path from 'node:path';
import { spawn } from 'node:child_process';
import { buildServer, buildWeb, ensureDependencies, root, serverEntry } from './lib.mjs';
import { startLocalServices, usesPaymentsFake } from './local-services.mjs';

ensureDependencies();
buildWeb();
buildServer();

const port = (name, fallback) => (process.env[name] ? Number(process.env[name]) : fallback);
let services;
try {
  services = await startLocalServices({
    dataDir: path.resolve(root, process.env.DATA_DIR || 'data'),
    appPort: port('PORT', 8080),
    payments: usesPaymentsFake(),
    ports: { smtp: port('SMTP_PORT', 1025), mailUi: port('MAIL_UI_PORT', 8025), payments: port('PAYMENTS_FAKE_PORT', 12111) },
  });
} catch (err) {
  console.error(`[fieldfold] cannot start the local services: ${err.message}`);
  process.exit(1);
}

const child = spawn(process.execPath, ['--enable-source-maps', serverEntry], { cwd: root, stdio: 'inherit', env: { NODE_ENV: 'production', ...process.env, ...services.env } });
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => child.kill(sig));
child.on('exit', async (code) => {
  await services.stop();
  process.exit(code ?? 0);
});
