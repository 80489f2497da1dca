import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ConfigError, FAKE_SECRET_KEY, loadConfig, loadPaymentsFakeConfig } from '../../server/config/env';

// Which payments API the server talks to, decided once at boot from the environment.

let root: string;
beforeEach(() => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-config-'));
});
afterEach(() => fs.rmSync(root, { recursive: true, force: true }));

const env = (over: Record<string, string> = {}) => ({ DATA_DIR: 'data', ...over }) as NodeJS.ProcessEnv;

test('When nothing about payments is set, then the server points the SDK at the local fake on 12111 with a generated webhook secret the fake shares', () => {
  const { payments } = loadConfig(env(), root);
  expect(payments).toMatchObject({ mode: 'fake', secretKey: FAKE_SECRET_KEY, apiUrl: 'http://127.0.0.1:12111', webhookToleranceSeconds: 300 });
  expect(payments.webhookSecret).toMatch(/^whsec_[A-Za-z0-9_-]{32}$/);
  const fake = loadPaymentsFakeConfig(env(), root);
  expect(fake).toMatchObject({ port: 12111, host: '127.0.0.1', webhookUrl: 'http://127.0.0.1:8080/api/webhooks/payments', webhookSecret: payments.webhookSecret });
  expect(fake.dataDir).toBe(path.join(root, 'data', 'payments-fake'));
  // Kept across restarts, like the token secret.
  expect(loadConfig(env(), root).payments.webhookSecret).toBe(payments.webhookSecret);
});

test('When a real key is set without PAYMENTS_API_URL, then the hosted API is used; with a URL, the fake at that URL', () => {
  expect(loadConfig(env({ PAYMENTS_SECRET_KEY: 'sk_test_abc123' }), root).payments).toMatchObject({ mode: 'hosted', apiUrl: null, secretKey: 'sk_test_abc123' });
  expect(loadConfig(env({ PAYMENTS_SECRET_KEY: 'sk_live_abc123' }), root).payments.mode).toBe('hosted');
  expect(loadConfig(env({ PAYMENTS_SECRET_KEY: 'sk_test_abc123', PAYMENTS_API_URL: 'http://127.0.0.1:4000' }), root).payments).toMatchObject({
    mode: 'fake',
    apiUrl: 'http://127.0.0.1:4000',
  });
  expect(loadConfig(env({ PAYMENTS_FAKE_PORT: '13000', PORT: '9000' }), root).payments.apiUrl).toBe('http://127.0.0.1:13000');
  expect(loadPaymentsFakeConfig(env({ PAYMENTS_FAKE_PORT: '13000', PORT: '9000' }), root)).toMatchObject({ port: 13000, webhookUrl: 'http://127.0.0.1:9000/api/webhooks/payments' });
});

test('When a payments variable is malformed, then boot stops with a sentence naming it', () => {
  expect(() => loadConfig(env({ PAYMENTS_FAKE_PORT: 'twelve' }), root)).toThrow(new ConfigError('Fieldfold cannot start: PAYMENTS_FAKE_PORT must be a port number'));
  expect(() => loadConfig(env({ PAYMENTS_WEBHOOK_SECRET: 'short' }), root)).toThrow(/PAYMENTS_WEBHOOK_SECRET must be at least 16 characters/);
  expect(() => loadConfig(env({ PAYMENTS_API_URL: 'not a url' }), root)).toThrow(/PAYMENTS_API_URL must be a URL/);
  expect(() => loadConfig(env({ PAYMENTS_WEBHOOK_TOLERANCE: '0' }), root)).toThrow(/PAYMENTS_WEBHOOK_TOLERANCE must be at least 1 second/);
});
