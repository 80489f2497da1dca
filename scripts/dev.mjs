// npm run dev: the API with reload (tsx watch) on :8080 and the Expo dev server on :8081 pointing at it.
import { spawn } from 'node:child_process';
import { ensureDependencies, root, runTs } from './lib.mjs';

ensureDependencies();
// The app requires the subset WOFF2 fonts, which are generated (git-ignored).
runTs('scripts/build-web.ts', ['--fonts-only']);
const apiPort = process.env.PORT ?? '8080';
const procs = [
  spawn('npx', ['tsx', 'watch', '--tsconfig', 'server/tsconfig.json', 'server/index.ts'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, PORT: apiPort, CORS_ORIGIN: 'http://localhost:8081' },
  }),
  // The local payments fake the SDK talks to (PAYMENTS_FAKE_PORT, 12111), delivering webhooks to the API above.
  spawn('npx', ['tsx', '--tsconfig', 'server/tsconfig.json', 'server/fakes/payments/main.ts'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, PORT: apiPort },
  }),
  spawn('npx', ['expo', 'start', '--web', '--port', '8081'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, EXPO_PUBLIC_API_URL: `http://localhost:${apiPort}` },
  }),
];
const stop = (sig) => procs.forEach((p) => p.kill(sig));
process.on('SIGINT', () => stop('SIGINT'));
process.on('SIGTERM', () => stop('SIGTERM'));
for (const p of procs) p.on('exit', () => stop('SIGTERM'));
