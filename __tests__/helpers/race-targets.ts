import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import Stripe from 'stripe';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { DATABASE_FILE } from '../../server/config/env';
import { createApp, type AppDeps } from '../../server/app';
import { startPaymentsFake, type PaymentsFake } from '../../server/fakes/payments/fake';
import { MemoryMail } from '../../server/lib/mail/memory-mail';
import { OutboxSender, pendingMail } from '../../server/lib/mail/outbox';
import { createPayments } from '../../server/lib/payments';
import type { Live } from './live-flow';
import { startServerProcess, type ServerProcess } from './server-process';
import { TEST_NOW, TEST_TOKENS, UNREACHED_LIMITS } from './test-app';
import { freshTestDatabase, onPostgres, type TestDatabase } from './test-database';

// The servers a race test fires at: one or more, all on ONE database, so a once-only effect must hold across
// them, not only inside one process. Chosen by RACE_TARGETS (unset: both, one after the other):
//
//   in-process   two createApp instances on one database, each with its own outbox sender, driven through
//                supertest; the clock is fixed (noon, 1 Dec 2026, California). SQLite: one migrated in-memory
//                database, which both apps share through one data source (an in-memory database is one
//                connection's own). PostgreSQL (TEST_DATABASE_URL, helpers/test-database.ts): a fresh migrated
//                database, and each app its own data source and pool on it, as each process has.
//   processes    RACE_PROCESSES (default 2) real server processes (server/index.ts) on one DATA_DIR, on the real
//                clock, started one after another (the first runs the migrations). SQLite: the file in that
//                DATA_DIR. PostgreSQL: DATABASE_URL names one fresh, EMPTY database of the test cluster, so the
//                first server migrates it as a new deployment would. Extra server variables go in
//                RACE_SERVER_ENV as JSON. RACE_DEBUG=1 prints the servers' output at close.
//
// Either way the payments fake runs inside the test process with its webhooks held (autoDeliver off), so a
// test takes a signed delivery and posts it to whichever server it likes, as many times as it likes. Mail is
// asserted on the outbox table (one row per message owed), which every mode shares.

export const RACE_WEBHOOK_SECRET = 'whsec_fieldfold_race_tests_secret';

export interface RaceTargets extends Live {
  mode: 'in-process' | 'processes';
  /** How many servers share the database. */
  size: number;
  /** The test's own connection to the shared database, for assertions (and nothing else: writes go through the API). */
  db: DataSource;
  fake: PaymentsFake;
  /** The SDK on the fake: what the payments API holds. */
  stripe: Stripe;
  /** Posts one of the fake's events, signed as the fake signs it, to server `i`. */
  deliver(eventId: string, i?: number): Promise<request.Response>;
  /** Events the fake emitted about one of its invoices. */
  eventsFor(providerInvoiceId: string, type?: string): ReturnType<PaymentsFake['events']>;
  /** Waits until no mail is due in the outbox (in-process: runs every sender; processes: their timers do). */
  settleMail(): Promise<void>;
  close(): Promise<void>;
}

export type RaceMode = RaceTargets['mode'];

/** The modes a race suite runs in: RACE_TARGETS when set, else both. */
export function raceModes(): RaceMode[] {
  const m = process.env.RACE_TARGETS;
  if (m === undefined || m === '') return ['in-process', 'processes'];
  if (m !== 'in-process' && m !== 'processes') throw new Error(`RACE_TARGETS must be in-process or processes, not ${m}`);
  return [m];
}

async function fakeFor(now: () => number) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-race-payments-'));
  const fake = await startPaymentsFake({ port: 0, dataDir: dir, webhookUrl: 'http://127.0.0.1:9/unused', webhookSecret: RACE_WEBHOOK_SECRET, autoDeliver: false, now, log: () => {} });
  return { fake, dir };
}

/**
 * The test's connection to the database the servers share: the PostgreSQL database they were given, or the SQLite
 * file in DATA_DIR. Opened after the first server migrated it (openDatabase finds nothing left to run).
 */
async function openSharedDatabase(dataDir: string, databaseUrl: string | undefined): Promise<DataSource> {
  return openDatabase(databaseUrl ?? path.join(dataDir, DATABASE_FILE));
}

export async function raceTargets(mode: RaceMode): Promise<RaceTargets> {
  return mode === 'processes' ? processTargets() : inProcessTargets();
}

function common(fake: PaymentsFake, api: Live['api']) {
  return {
    fake,
    stripe: new Stripe('sk_test_fieldfold', { host: '127.0.0.1', port: fake.port, protocol: 'http' }),
    deliver(eventId: string, i = 0) {
      const { payload, signature } = fake.signedDelivery(eventId);
      return api(i).post('/api/webhooks/payments').set('Content-Type', 'application/json').set('Stripe-Signature', signature).send(payload);
    },
    eventsFor(providerInvoiceId: string, type?: string) {
      return fake.events().filter((e) => (e.data.object as { id?: string }).id === providerInvoiceId && (type === undefined || e.type === type));
    },
  };
}

async function inProcessTargets(size = 2): Promise<RaceTargets> {
  const now = () => TEST_NOW;
  const { fake, dir } = await fakeFor(now);
  const database = await freshTestDatabase();
  const db = await openDatabase(database.target);
  // SQLite's in-memory database is one connection's own: both apps share the test's data source there.
  const appSources = onPostgres ? await Promise.all(Array.from({ length: size }, () => openDatabase(database.target))) : Array.from({ length: size }, () => db);
  const uploadsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-race-uploads-'));
  const documentsDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-race-documents-'));
  const mail = new MemoryMail();
  const payments = createPayments({ mode: 'fake', secretKey: 'sk_test_fieldfold', apiUrl: fake.url, webhookSecret: RACE_WEBHOOK_SECRET, webhookToleranceSeconds: 300 });
  // One sender per app, as each process has its own: the outbox's lease must keep them from sending a row twice.
  const senders = appSources.map((ds) => new OutboxSender(ds, mail, now, () => {}));
  const apps = senders.map((outbox, i) => {
    const deps: AppDeps = { dataSource: appSources[i], tokens: TEST_TOKENS, log: () => {}, uploadsDir, documentsDir, outbox, publicUrl: 'http://fieldfold.test', now, payments, rateLimits: { limits: UNREACHED_LIMITS } };
    return createApp(deps);
  });
  const api = (i = 0) => request(apps[i % size]);
  return {
    mode: 'in-process',
    size,
    api,
    now,
    db,
    ...common(fake, api),
    async settleMail() {
      await Promise.all(senders.map((s) => s.drain()));
    },
    async close() {
      await Promise.all(senders.map((s) => s.stop()));
      for (const ds of new Set([...appSources, db])) await ds.destroy();
      await database.drop();
      await fake.close();
      for (const d of [dir, uploadsDir, documentsDir]) fs.rmSync(d, { recursive: true, force: true });
    },
  };
}

async function processTargets(): Promise<RaceTargets> {
  const size = Number(process.env.RACE_PROCESSES ?? 2);
  if (!Number.isInteger(size) || size < 1) throw new Error('RACE_PROCESSES must be a whole number from 1');
  const extra = process.env.RACE_SERVER_ENV ? (JSON.parse(process.env.RACE_SERVER_ENV) as Record<string, string>) : {};
  const { fake, dir } = await fakeFor(Date.now);
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-race-data-'));
  const database: TestDatabase | null = onPostgres ? await freshTestDatabase({ migrated: false }) : null;
  const env: Record<string, string> = { PAYMENTS_API_URL: fake.url, PAYMENTS_WEBHOOK_SECRET: RACE_WEBHOOK_SECRET, ...(database ? { DATABASE_URL: database.target } : {}), ...extra };
  const servers: ServerProcess[] = [];
  try {
    // One after another: the first migrates a fresh database, the others find it migrated.
    for (let i = 0; i < size; i++) servers.push(await startServerProcess({ dataDir, env }));
  } catch (err) {
    await Promise.all(servers.map((s) => s.kill()));
    await database?.drop();
    throw err;
  }
  const db = await openSharedDatabase(dataDir, env.DATABASE_URL);
  const api = (i = 0) => request(servers[i % size].url);
  return {
    mode: 'processes',
    size,
    api,
    now: Date.now,
    db,
    ...common(fake, api),
    async settleMail() {
      // Each server's sender polls every 2 s.
      const deadline = Date.now() + 20_000;
      while ((await pendingMail(db)) > 0) {
        if (Date.now() > deadline) throw new Error('mail still pending after 20 s');
        await new Promise((r) => setTimeout(r, 200));
      }
    },
    async close() {
      await Promise.all(servers.map((s) => s.stop()));
      if (process.env.RACE_DEBUG) for (const s of servers) console.log(s.output());
      await db.destroy();
      await database?.drop();
      await fake.close();
      for (const d of [dir, dataDir]) fs.rmSync(d, { recursive: true, force: true });
    },
  };
}
