// npm start: install if needed → build the web app and server if stale → one Express process on :8080
// serving the API and the app, with SQLite in DATA_DIR seeded once with the invented demo district.
import { spawn } from 'node:child_process';
import { buildServer, buildWeb, ensureDependencies, root, serverEntry, startPaymentsFake, usesPaymentsFake } from './lib.mjs';

ensureDependencies();
buildWeb();
buildServer();

// The local payments fake (PAYMENTS_FAKE_PORT, 12111) runs beside the server unless a real payments API is configured.
const fake = usesPaymentsFake() ? await startPaymentsFake({}) : null;
const child = spawn(process.execPath, ['--enable-source-maps', serverEntry], { cwd: root, stdio: 'inherit', env: { NODE_ENV: 'production', ...process.env } });
for (const sig of ['SIGINT', 'SIGTERM'])
  process.on(sig, () => {
    child.kill(sig);
    fake?.kill(sig);
  });
child.on('exit', (code) => {
  fake?.kill('SIGTERM');
  process.exit(code ?? 0);
});
