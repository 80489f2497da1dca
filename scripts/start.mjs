// npm start: install if needed → build the web app and server if stale → the local services (mail sink on
// SMTP_PORT 1025, its inbox on MAIL_UI_PORT 8025, the payments fake on PAYMENTS_FAKE_PORT 12111 unless a real
// payments API is configured) → SERVER_PROCESSES Express processes (1 unless set) on :8080, :8081, … each serving
// the API and the app, all on one database (SQLite in DATA_DIR, or DATABASE_URL) seeded once with the invented demo
// district, one DATA_DIR (token secret, uploads, documents, webhook secret) and the same local services.
import path from 'node:path';
import { buildServer, buildWeb, ensureDependencies, root, serverProcesses, startServers, stopServers } from './lib.mjs';
import { startLocalServices, usesPaymentsFake } from './local-services.mjs';

let count;
try {
  count = serverProcesses();
} catch (err) {
  console.error(`[fieldfold] cannot start: ${err.message}`);
  process.exit(1);
}

ensureDependencies();
buildWeb();
buildServer();

const port = (name, fallback) => (process.env[name] ? Number(process.env[name]) : fallback);
const appPort = port('PORT', 8080);
let services;
try {
  services = await startLocalServices({
    dataDir: path.resolve(root, process.env.DATA_DIR || 'data'),
    // The payments fake delivers its webhooks to the first process; any process would apply them the same way.
    appPort,
    payments: usesPaymentsFake(),
    ports: { smtp: port('SMTP_PORT', 1025), mailUi: port('MAIL_UI_PORT', 8025), payments: port('PAYMENTS_FAKE_PORT', 12111) },
  });
} catch (err) {
  console.error(`[fieldfold] cannot start the local services: ${err.message}`);
  process.exit(1);
}

let children = [];
let stopping = false;
async function stopAll(code) {
  if (stopping) return;
  stopping = true;
  await stopServers(children);
  await services.stop();
  process.exit(code);
}
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => void stopAll(0));

try {
  children = await startServers(count, { NODE_ENV: 'production', ...process.env, ...services.env, PORT: String(appPort) });
} catch (err) {
  console.error(`[fieldfold] ${err.message}`);
  await services.stop();
  process.exit(1);
}
if (count > 1) {
  const ports = children.map((_, i) => appPort + i).join(', ');
  console.log(`[fieldfold] ${count} server processes on ports ${ports}, sharing one database and DATA_DIR: any of them serves any request`);
}
// One process that stops on its own (a crash, a bad config) stops the whole set: half a deployment is not one.
for (const child of children) {
  child.on('exit', (code) => {
    if (stopping) return;
    console.error(`[fieldfold] a server process exited (${code ?? 'signal'}); stopping the others`);
    void stopAll(code || 1);
  });
}
