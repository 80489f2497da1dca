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
  // Mail goes over SMTP when SMTP_PORT is set (npm start sets it to the local sink); otherwise it stays in memory.
  SMTP_HOST: yup.string().matches(/^[A-Za-z0-9.:-]+$/, 'SMTP_HOST must be a host name or IP address').default('127.0.0.1'),
  SMTP_PORT: port('SMTP_PORT'),
  MAIL_FROM: yup
    .string()
    .test('one-address', 'MAIL_FROM must be one address like "Fieldfold <no-reply@example.com>"', (v) => v === undefined || parseFrom(v) !== null)
    .default(DEFAULT_MAIL_FROM),
  MAIL_UI_PORT: port('MAIL_UI_PORT'),
});

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
  /** Where mail goes over SMTP; null keeps it in memory (tests, `npm run dev`). */
  smtp: { host: string; port: number } | null;
  mailFrom: { name: string; address: string };
  /** The local mail sink's inbox page (npm start sets it), named in the start-up line; null elsewhere. */
  mailUiPort: number | null;
}

export class ConfigError extends Error {}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, root = process.cwd()): Config {
  let parsed: yup.InferType<typeof envSchema>;
  try {
    parsed = envSchema.validateSync(
      Object.fromEntries(Object.entries(env).filter(([k, v]) => k in envSchema.fields && v !== '')),
      { abortEarly: false },
    );
  } catch (err) {
    const errors = err instanceof yup.ValidationError ? err.errors.join('; ') : String(err);
    throw new ConfigError(`Fieldfold cannot start: ${errors}`);
  }
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
    smtp: parsed.SMTP_PORT === undefined ? null : { host: parsed.SMTP_HOST, port: parsed.SMTP_PORT },
    mailFrom: parseFrom(parsed.MAIL_FROM)!,
    mailUiPort: parsed.MAIL_UI_PORT ?? null,
  };
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
