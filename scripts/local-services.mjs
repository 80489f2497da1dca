// The local stand-ins for hosted services, each its own Node process run from the compiled server
// (build/server/fakes/…), for npm start and npm test. Each one is spawned, awaited until every port it
// owns answers, and handed back with stop(); `env` is what the app server needs to reach them.
// Today: the mail sink (SMTP + inbox page) and the payments fake (the API the official SDK talks to, which
// delivers signed webhooks to the app server). A further fake joins by one more startService call below.
import { spawn } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { freePort, root } from './lib.mjs';

const LOOPBACK = '127.0.0.1';
const READY_TIMEOUT_MS = 15_000;

function answers(port) {
  return new Promise((resolve) => {
    const socket = net.connect({ host: LOOPBACK, port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

function checkPort(name, value) {
  if (!Number.isInteger(value) || value < 1 || value > 65535) throw new Error(`${name} must be a port number from 1 to 65535`);
  return value;
}

/** Spawns `entry` with `env` and resolves once every port in `ports` accepts a connection. */
async function startService({ name, entry, env, ports, quiet }) {
  for (const [variable, port] of Object.entries(ports)) {
    if (await answers(port)) throw new Error(`${name}: port ${port} is already in use (set ${variable} to a free port, or stop what holds it)`);
  }
  const child = spawn(process.execPath, ['--enable-source-maps', entry], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: quiet ? ['ignore', 'pipe', 'pipe'] : ['ignore', 'inherit', 'inherit'],
  });
  let output = '';
  child.stdout?.on('data', (d) => (output += d));
  child.stderr?.on('data', (d) => (output += d));
  // A parent that exits for any reason takes its services with it.
  const killOnExit = () => child.kill('SIGTERM');
  process.on('exit', killOnExit);

  const exited = new Promise((resolve) => child.once('exit', (code, signal) => resolve(code ?? signal)));
  const stop = async () => {
    process.off('exit', killOnExit);
    if (child.exitCode !== null || child.signalCode !== null) return;
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), 5_000);
    await exited;
    clearTimeout(timer);
  };

  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`${name} exited early (${child.exitCode}):\n${output}`);
    const up = await Promise.all(Object.values(ports).map(answers));
    if (up.every(Boolean)) return { name, pid: child.pid, stop };
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop();
  throw new Error(`${name} did not open ports ${Object.values(ports).join(', ')} within ${READY_TIMEOUT_MS / 1000} s:\n${output}`);
}

/** The server talks to the local payments fake unless a real key is set and no PAYMENTS_API_URL (server/config/env.ts). */
export function usesPaymentsFake(env = process.env) {
  return !(env.PAYMENTS_API_URL || /^sk_(live|test)_/.test(env.PAYMENTS_SECRET_KEY ?? ''));
}

/**
 * Starts every local service. `ports` fixes them (npm start: 1025 and 8025, or SMTP_PORT / MAIL_UI_PORT);
 * a port left out is a free one (npm test). State that should survive a restart goes under `dataDir`.
 * `appPort` is the app server's port, where the payments fake delivers its webhooks; `payments: false` leaves the
 * fake out (a real payments API is configured). Both share `dataDir`, and with it the generated webhook secret.
 * @param {{ dataDir: string, appPort: number, quiet?: boolean, payments?: boolean, ports?: { smtp?: number, mailUi?: number, payments?: number } }} options
 */
export async function startLocalServices({ dataDir, appPort, quiet = false, payments = true, ports = {} }) {
  const smtpPort = checkPort('SMTP_PORT', ports.smtp ?? (await freePort()));
  const mailUiPort = checkPort('MAIL_UI_PORT', ports.mailUi ?? (await freePort()));
  const paymentsPort = payments ? checkPort('PAYMENTS_FAKE_PORT', ports.payments ?? (await freePort())) : null;
  const started = [];
  const stop = async () => {
    await Promise.all(started.splice(0).map((s) => s.stop()));
  };
  try {
    started.push(
      await startService({
        name: 'mail sink',
        entry: path.join(root, 'build', 'server', 'fakes', 'mail-sink', 'main.js'),
        env: { SMTP_PORT: String(smtpPort), MAIL_UI_PORT: String(mailUiPort), MAIL_SINK_DIR: path.join(dataDir, 'mail-sink') },
        ports: { SMTP_PORT: smtpPort, MAIL_UI_PORT: mailUiPort },
        quiet,
      }),
    );
    if (paymentsPort !== null) {
      started.push(
        await startService({
          name: 'payments fake',
          entry: path.join(root, 'build', 'server', 'fakes', 'payments', 'main.js'),
          env: { PAYMENTS_FAKE_PORT: String(paymentsPort), PAYMENTS_FAKE_HOST: LOOPBACK, DATA_DIR: dataDir, PAYMENTS_WEBHOOK_URL: `http://${LOOPBACK}:${appPort}/api/webhooks/payments` },
          ports: { PAYMENTS_FAKE_PORT: paymentsPort },
          quiet,
        }),
      );
    }
  } catch (err) {
    await stop();
    throw err;
  }
  return {
    /** What the app server needs to reach the services. */
    env: { SMTP_HOST: LOOPBACK, SMTP_PORT: String(smtpPort), MAIL_UI_PORT: String(mailUiPort), ...(paymentsPort !== null ? { PAYMENTS_FAKE_PORT: String(paymentsPort) } : {}) },
    mailSink: { smtpPort, uiPort: mailUiPort, url: `http://${LOOPBACK}:${mailUiPort}` },
    payments: paymentsPort === null ? null : { port: paymentsPort, url: `http://${LOOPBACK}:${paymentsPort}` },
    stop,
  };
}
