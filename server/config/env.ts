import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import * as yup from 'yup';
import addressparser from 'nodemailer/lib/addressparser';

export const DEFAULT_MAIL_FROM = 'Fieldfold <no-reply@fieldfold.localhost>';

function port(name: string) {
  return yup.number().typeError(`${name} must be a port number`).integer(`${name} must be a whole number`).min(1, `${name} must be from 1 to 65535`).max(65535, `${name} must be from 1 to 65535`);
}

/** One mailbox, no group, no control characters; null otherwise. */
function parseFrom(value: string): { name: string; address: string } | null {
  if (/[\u0000-\u001f\u007f-\u009f\u2028\u2029]/.test(value)) return null;
  const list = addressparser(value);
  const one = list.length === 1 ? list[0] : null;
  if (!one || one.group || !/^[^\s@]+@[^\s@]+$/.test(one.address)) return null;
  return { name: one.name, address: one.address };
}

// Read once at boot; a bad value stops the process with a sentence naming the variable.
const envSchema = yup.object({
  PORT: yup.number().integer().min(0).max(65535).default(8080),
  HOST: yup.string().default('0.0.0.0'),
  DATA_DIR: yup.string().default('data'),
  PUBLIC_URL: yup.string().url('PUBLIC_URL must be a URL like http://localhost:8080'),
  TOKEN_SECRET: yup.string().min(32, 'TOKEN_SECRET must be at least 32 characters'),
  TOKEN_TTL: yup.string().matches(/^\d+[smhd]$/, 'TOKEN_TTL must look like 12h or 7d').default('7d'),
  WEB_DIR: yup.string().default('dist/web'),
  SEED_DEMO: yup.string().oneOf(['true', 'false'], 'SEED_DEMO must be true or false').default('true'),
  NODE_ENV: yup.string().default('development'),
  CORS_ORIGIN: yup.string().url('CORS_ORIGIN must be an origin like http://localhost:8081'),
  // Which proxies' X-Forwarded-For to believe for the client address the rate limits count by: a number of hops,
  // or addresses/subnets/names Express knows (loopback, uniquelocal). Never "true": anyone could then pick an address.
  TRUST_PROXY: yup
    .string()
    .matches(/^(\d{1,2}|[0-9A-Za-z.:/]+(\s*,\s*[0-9A-Za-z.:/]+)*)$/, 'TRUST_PROXY must be a hop count like 1, or addresses like loopback, 10.0.0.0/8')
    .test('not-true', 'TRUST_PROXY must name the proxies (or a hop count), not trust every sender', (v) => v === undefined || !/^(true|false)$/i.test(v))
    .default('loopback'),
  // Mail goes over SMTP when SMTP_PORT is set (npm start sets it to the local sink); otherwise it stays in memory.
  SMTP_HOST: yup.string().matches(/^[A-Za-z0-9.:-]+$/, 'SMTP_HOST must be a host name or IP address').default('127.0.0.1'),
  SMTP_PORT: port('SMTP_PORT'),
  MAIL_FROM: yup
    .string()
    .test('one-address', 'MAIL_FROM must be one address like "Fieldfold <no-reply@example.com>"', (v) => v === undefined || parseFrom(v) !== null)
    .default(DEFAULT_MAIL_FROM),
  MAIL_UI_PORT: port('MAIL_UI_PORT'),
  ...paymentsEnv(),
});

// Payments: the official SDK talks to the local fake (server/fakes/payments) unless a real secret key is set and
// no PAYMENTS_API_URL points elsewhere. The webhook signing secret is shared by the fake (which signs) and the
// server (which verifies); when unset, both read the same generated file in DATA_DIR.
function paymentsEnv() {
  return {
    PAYMENTS_SECRET_KEY: yup.string().matches(/^\S+$/, 'PAYMENTS_SECRET_KEY must not contain spaces'),
    PAYMENTS_API_URL: yup.string().url('PAYMENTS_API_URL must be a URL like http://127.0.0.1:12111'),
    PAYMENTS_FAKE_PORT: yup.number().typeError('PAYMENTS_FAKE_PORT must be a port number').integer().min(0).max(65535).default(12111),
    PAYMENTS_FAKE_HOST: yup.string().default('127.0.0.1'),
    PAYMENTS_WEBHOOK_SECRET: yup.string().min(16, 'PAYMENTS_WEBHOOK_SECRET must be at least 16 characters (the API issues whsec_…)'),
    PAYMENTS_WEBHOOK_URL: yup.string().url('PAYMENTS_WEBHOOK_URL must be a URL like http://127.0.0.1:8080/api/webhooks/payments'),
    PAYMENTS_WEBHOOK_TOLERANCE: yup
      .number()
      .typeError('PAYMENTS_WEBHOOK_TOLERANCE must be a number of seconds')
      .integer()
      .min(1, 'PAYMENTS_WEBHOOK_TOLERANCE must be at least 1 second')
      .max(3600, 'PAYMENTS_WEBHOOK_TOLERANCE must be at most 3600 seconds')
      .default(300),
  };
}

export interface Config {
  port: number;
  host: string;
  dataDir: string;
  databasePath: string;
  publicUrl: string;
  tokenSecret: string;
  tokenTtl: string;
  webDir: string;
  seedDemo: boolean;
  production: boolean;
  /** Only the Expo dev server needs it (npm run dev); production serves app and API from one origin. */
  corsOrigin: string | null;
  /** Express's `trust proxy`: a hop count or the proxies' addresses (default loopback). */
  trustProxy: string | number;
  /** Where mail goes over SMTP; null keeps it in memory (tests, `npm run dev`). */
  smtp: { host: string; port: number } | null;
  mailFrom: { name: string; address: string };
  /** The local mail sink's inbox page (npm start sets it), named in the start-up line; null elsewhere. */
  mailUiPort: number | null;
  payments: PaymentsConfig;
}

export interface PaymentsConfig {
  /** 'hosted' only with a real key and no PAYMENTS_API_URL; otherwise the SDK is pointed at `apiUrl`. */
  mode: 'fake' | 'hosted';
  secretKey: string;
  /** The API base the SDK uses in fake mode (http://127.0.0.1:PAYMENTS_FAKE_PORT unless PAYMENTS_API_URL). */
  apiUrl: string | null;
  webhookSecret: string;
  /** Oldest signed timestamp a webhook may carry, in seconds (the SDK's default is 300). */
  webhookToleranceSeconds: number;
}

/** What the standalone payments fake (server/fakes/payments/main.ts) needs. */
export interface PaymentsFakeConfig {
  port: number;
  host: string;
  dataDir: string;
  webhookUrl: string;
  webhookSecret: string;
}

/** The fake accepts any test-looking key; this one is used when none is configured. */
export const FAKE_SECRET_KEY = 'sk_test_fieldfold_local_fake';

export class ConfigError extends Error {}

type Env = yup.InferType<typeof envSchema>;

function parseEnv(env: NodeJS.ProcessEnv): Env {
  try {
    return envSchema.validateSync(
      Object.fromEntries(Object.entries(env).filter(([k, v]) => k in envSchema.fields && v !== '')),
      { abortEarly: false },
    );
  } catch (err) {
    const errors = err instanceof yup.ValidationError ? err.errors.join('; ') : String(err);
    throw new ConfigError(`Fieldfold cannot start: ${errors}`);
  }
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, root = process.cwd()): Config {
  const parsed = parseEnv(env);
  const dataDir = path.resolve(root, parsed.DATA_DIR);
  fs.mkdirSync(dataDir, { recursive: true });
  return {
    port: parsed.PORT,
    host: parsed.HOST,
    dataDir,
    databasePath: path.join(dataDir, 'fieldfold.sqlite'),
    publicUrl: parsed.PUBLIC_URL ?? `http://localhost:${parsed.PORT}`,
    tokenSecret: parsed.TOKEN_SECRET ?? localSecret(dataDir),
    tokenTtl: parsed.TOKEN_TTL,
    webDir: path.resolve(root, parsed.WEB_DIR),
    seedDemo: parsed.SEED_DEMO === 'true',
    production: parsed.NODE_ENV === 'production',
    corsOrigin: parsed.CORS_ORIGIN ?? null,
    trustProxy: /^\d+$/.test(parsed.TRUST_PROXY) ? Number(parsed.TRUST_PROXY) : parsed.TRUST_PROXY,
    smtp: parsed.SMTP_PORT === undefined ? null : { host: parsed.SMTP_HOST, port: parsed.SMTP_PORT },
    mailFrom: parseFrom(parsed.MAIL_FROM)!,
    mailUiPort: parsed.MAIL_UI_PORT ?? null,
    payments: paymentsConfig(parsed, dataDir),
  };
}

function paymentsConfig(parsed: Env, dataDir: string): PaymentsConfig {
  const key = parsed.PAYMENTS_SECRET_KEY;
  const hosted = key !== undefined && /^sk_(live|test)_/.test(key) && parsed.PAYMENTS_API_URL === undefined;
  return {
    mode: hosted ? 'hosted' : 'fake',
    secretKey: key ?? FAKE_SECRET_KEY,
    apiUrl: hosted ? null : (parsed.PAYMENTS_API_URL ?? `http://127.0.0.1:${parsed.PAYMENTS_FAKE_PORT}`),
    webhookSecret: parsed.PAYMENTS_WEBHOOK_SECRET ?? webhookSecretFile(dataDir),
    webhookToleranceSeconds: parsed.PAYMENTS_WEBHOOK_TOLERANCE,
  };
}

export function loadPaymentsFakeConfig(env: NodeJS.ProcessEnv = process.env, root = process.cwd()): PaymentsFakeConfig {
  const parsed = parseEnv(env);
  const dataDir = path.resolve(root, parsed.DATA_DIR);
  fs.mkdirSync(dataDir, { recursive: true });
  return {
    port: parsed.PAYMENTS_FAKE_PORT,
    host: parsed.PAYMENTS_FAKE_HOST,
    dataDir: path.join(dataDir, 'payments-fake'),
    webhookUrl: parsed.PAYMENTS_WEBHOOK_URL ?? `http://127.0.0.1:${parsed.PORT}/api/webhooks/payments`,
    webhookSecret: parsed.PAYMENTS_WEBHOOK_SECRET ?? webhookSecretFile(dataDir),
  };
}

// Like the token secret: made once, kept beside the database. The server and the fake may start together, so the
// file is created exclusively and whoever loses the race reads the winner's secret.
function webhookSecretFile(dataDir: string): string {
  const file = path.join(dataDir, 'payments-webhook-secret');
  try {
    fs.writeFileSync(file, `whsec_${crypto.randomBytes(24).toString('base64url')}`, { mode: 0o600, flag: 'wx' });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
  }
  return fs.readFileSync(file, 'utf8').trim();
}

// Out of the box there is no secret to configure: one is made on first start and kept beside the database,
// so tokens survive a restart. Production sets TOKEN_SECRET instead.
function localSecret(dataDir: string): string {
  const file = path.join(dataDir, 'token-secret');
  try {
    return fs.readFileSync(file, 'utf8').trim();
  } catch {
    const secret = crypto.randomBytes(48).toString('base64url');
    fs.writeFileSync(file, secret, { mode: 0o600 });
    return secret;
  }
}
