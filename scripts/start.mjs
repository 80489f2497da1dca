// npm start: install if needed → build the web app and server if stale → one Express process on :8080
// serving the API and the app, with SQLite in DATA_DIR seeded once with the invented demo district.
import { spawn } from 'node:child_process';
import { buildServer, buildWeb, ensureDependencies, root, serverEntry } from './lib.mjs';

ensureDependencies();
buildWeb();
buildServer();

const child = spawn(process.execPath, ['--enable-source-maps', serverEntry], { cwd: root, stdio: 'inherit', env: { NODE_ENV: 'production', ...process.env } });
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => child.kill(sig));
child.on('exit', (code) => process.exit(code ?? 0));
