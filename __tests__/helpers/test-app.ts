import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { freshTestDatabase } from './test-database';
import { createApp, serviceContext, type AppDeps } from '../../server/app';
import { MemoryMail } from '../../server/lib/mail/memory-mail';
import { OutboxSender } from '../../server/lib/mail/outbox';
import { AfterAnswer } from '../../server/lib/http/after-answer';
import { createPayments, type PaymentsPort } from '../../server/lib/payments';
import { DEFAULT_RATE_LIMITS, type RateLimitSettings } from '../../server/lib/http/rate-limit';

// Long enough that tests may move the app's clock through a season without the session expiring.
export const TEST_TOKENS = { secret: 'test-secret-that-is-long-enough-to-sign-tokens', ttl: '400d' };

/** "Now" in the tests unless a test moves the clock: 1 Dec 2026, noon in California (blocks' default zone). */
export const TEST_NOW = Date.parse('2026-12-01T12:00:00-08:00');

export interface TestAppOptions {
  /** Collects log lines (errors the app logged, mail failures) instead of dropping them. */
  log?: (msg: string) => void;
  /** A mail adapter other than the in-memory outbox (e.g. one that fails). */
  mail?: import('../../server/lib/mail/mail-port').MailPort;
  /** A PDF renderer other than pdfkit (e.g. one that fails). */
  pdf?: AppDeps['pdf'];
  /** The payments API; by default one that nothing answers (tests that pay use helpers/invoicing.ts, with the fake). */
  payments?: PaymentsPort;
  /** An exported web app to serve beside the API. */
  webDir?: string;
  /** The Expo dev server's origin, for the CORS tests. */
  corsOrigin?: string;
  /** Where people open Fieldfold; default http://fieldfold.test. */
  publicUrl?: string;
  /** Request limits; by default every limit is out of reach (see UNREACHED_LIMITS). */
  rateLimits?: AppDeps['rateLimits'];
  /** A logger for the access log (the access-log tests); by default requests are not logged. */
  accessLogger?: AppDeps['accessLogger'];
}

/**
 * Tests send hundreds of requests from one address, far faster than people: limits no test reaches unless it
 * asks for them (the rate-limit tests pass DEFAULT_RATE_LIMITS or smaller ones).
 */
export const UNREACHED_LIMITS: RateLimitSettings = Object.fromEntries(
  Object.keys(DEFAULT_RATE_LIMITS).map((k) => [k, { limit: 1_000_000, windowMs: 60_000 }]),
) as unknown as RateLimitSettings;

/** A fresh database that ran the real migrations (in-memory SQLite, or PostgreSQL: helpers/test-database.ts), and the real app on top of it. */
export async function makeTestApp(options: TestAppOptions = {}) {
  const database = await freshTestDatabase();
  const dataSource = await openDatabase(database.target);
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-uploads-'));
  const documentsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-documents-'));
  const mail = new MemoryMail();
  const clock = { now: TEST_NOW };
  const now = () => clock.now;
  const log = options.log ?? (() => {});
  // The real outbox on the test database; tests call deliverMail() to run the sender to the end.
  const outbox = new OutboxSender(dataSource, options.mail ?? mail, now, log);
  // Work the app starts after answering (a password-reset request's lookup and mail) is awaited before mail is delivered.
  const afterAnswer = new AfterAnswer(log);
  const deps: AppDeps = {
    afterAnswer,
    dataSource,
    tokens: TEST_TOKENS,
    log,
    uploadsDir,
    documentsDir,
    outbox,
    publicUrl: options.publicUrl ?? 'http://fieldfold.test',
    now,
    pdf: options.pdf,
    payments: options.payments ?? createPayments({ mode: 'fake', secretKey: 'sk_test_nothing_answers', apiUrl: 'http://127.0.0.1:9', webhookSecret: 'whsec_unused_in_these_tests', webhookToleranceSeconds: 300 }),
    webDir: options.webDir,
    corsOrigin: options.corsOrigin,
    rateLimits: options.rateLimits ?? { limits: UNREACHED_LIMITS },
    accessLogger: options.accessLogger,
  };
  const app = createApp(deps);
  let n = 0;
  async function signUp(roles: Array<'grower' | 'grazier'>, name = 'Test Person') {
    n += 1;
    const email = `${roles.join('-')}-${n}-${Date.now()}@test.example`;
    const res = await request(app).post('/api/auth/register').send({ email, password: 'long-enough-password', name, roles });
    if (res.status !== 201) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
    return { token: res.body.token as string, user: res.body.user, email, auth: { Authorization: `Bearer ${res.body.token}` } };
  }
  return {
    app,
    dataSource,
    signUp,
    /** Everything the app mailed, oldest first (after deliverMail()). */
    mail,
    outbox,
    /** The same ports the app's services get, for tests that call a service directly. */
    ctx: serviceContext(deps),
    /** Waits for work started after an answer, then runs the outbox sender until nothing due is left; resolves with how many were sent. */
    deliverMail: async () => {
      await afterAnswer.settled();
      return outbox.drain();
    },
    uploadsDir,
    documentsDir,
    /** Moves the app's clock (ISO instant with offset). */
    setNow: (iso: string) => {
      clock.now = Date.parse(iso);
    },
    close: async () => {
      await afterAnswer.settled();
      await outbox.stop();
      await (dataSource as DataSource).destroy();
      await database.drop();
      fs.rmSync(uploadsDir, { recursive: true, force: true });
      fs.rmSync(documentsDir, { recursive: true, force: true });
    },
  };
}
