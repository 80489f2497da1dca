import express from 'express';
import { rateLimit } from 'express-rate-limit';
import request from 'supertest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { DatabaseRateLimitStore } from '../../server/lib/http/rate-limit-store';
import { freshTestDatabase, rawQuery, type TestDatabase } from '../helpers/test-database';

// The store express-rate-limit counts in when several server processes share one database. Two express apps, each
// with its own store object on the same database (two data sources on PostgreSQL: two processes in all but name),
// must count one client's requests together.

let db: TestDatabase;
let dsA: DataSource;
let dsB: DataSource;
// The wall clock to start with: express-rate-limit works out Retry-After from the store's reset time and Date.now().
const clock = { now: Date.now() };
const WINDOW_MS = 60_000;

beforeEach(async () => {
  db = await freshTestDatabase();
  dsA = await openDatabase(db.target);
  // SQLite ':memory:' is one connection's own database, so there both apps share the one data source.
  dsB = db.target === ':memory:' ? dsA : await openDatabase(db.target);
  clock.now = Date.now();
});

/** express-rate-limit takes a success's hit back when the response has finished, after the client has it. */
async function until(check: () => Promise<boolean>) {
  const deadline = Date.now() + 5000;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error('the store never reached the expected count');
    await new Promise((r) => setTimeout(r, 10));
  }
}

afterEach(async () => {
  if (dsB !== dsA) await dsB.destroy();
  await dsA.destroy();
  await db.drop();
});

function appOn(ds: DataSource, options: { limit?: number; prefix?: string; skipSuccessfulRequests?: boolean } = {}) {
  const store = new DatabaseRateLimitStore(ds, { prefix: options.prefix ?? 'sign-in:', now: () => clock.now });
  const app = express();
  app.use(
    rateLimit({
      windowMs: WINDOW_MS,
      limit: options.limit ?? 3,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      skipSuccessfulRequests: options.skipSuccessfulRequests ?? false,
      store,
      keyGenerator: (req) => String(req.headers['x-client'] ?? 'anon'),
      // The key generator above is the test's; express-rate-limit's IP checks have nothing to check here.
      validate: { keyGeneratorIpFallback: false },
      message: { error: { code: 'too_many_requests', message: 'Too many requests' } },
    }),
  );
  app.get('/ok', (_req, res) => void res.json({ ok: true }));
  app.get('/fail', (_req, res) => void res.status(401).json({ ok: false }));
  return { app, store };
}

describe('DatabaseRateLimitStore (express-rate-limit on the shared database)', () => {
  it('When one client\'s requests are spread over two processes, then they are counted together and the fourth is refused by either', async () => {
    const a = appOn(dsA);
    const b = appOn(dsB);
    expect((await request(a.app).get('/ok').set('x-client', 'greta')).status).toBe(200);
    expect((await request(b.app).get('/ok').set('x-client', 'greta')).status).toBe(200);
    const third = await request(a.app).get('/ok').set('x-client', 'greta');
    expect(third.status).toBe(200);
    expect(third.headers['ratelimit']).toMatch(/r=0/);
    const fourth = await request(b.app).get('/ok').set('x-client', 'greta');
    expect(fourth.status).toBe(429);
    expect(fourth.body.error.code).toBe('too_many_requests');
    expect(Number(fourth.headers['retry-after'])).toBeGreaterThanOrEqual(59);
    expect(Number(fourth.headers['retry-after'])).toBeLessThanOrEqual(60);
    // Another client has its own count.
    expect((await request(b.app).get('/ok').set('x-client', 'wade')).status).toBe(200);
  });

  it('When twenty requests of one client arrive at once across both processes, then exactly the limit get through', async () => {
    const a = appOn(dsA, { limit: 5 });
    const b = appOn(dsB, { limit: 5 });
    const statuses = await Promise.all(Array.from({ length: 20 }, (_, i) => request(i % 2 ? a.app : b.app).get('/ok').set('x-client', 'burst').then((r) => r.status)));
    expect(statuses.filter((s) => s === 200)).toHaveLength(5);
    expect(statuses.filter((s) => s === 429)).toHaveLength(15);
    const [row] = await rawQuery<{ hits: number | string }>(dsA, 'SELECT "hits" FROM "rate_limit_hits" WHERE "key" = :key', { key: 'sign-in:burst' });
    expect(Number(row.hits)).toBe(20);
  });

  it('When the window has passed, then the count starts again from one', async () => {
    const a = appOn(dsA, { limit: 1 });
    expect((await request(a.app).get('/ok').set('x-client', 'c')).status).toBe(200);
    expect((await request(a.app).get('/ok').set('x-client', 'c')).status).toBe(429);
    clock.now += WINDOW_MS;
    expect((await request(a.app).get('/ok').set('x-client', 'c')).status).toBe(200);
    expect(await a.store.get('c')).toEqual({ totalHits: 1, resetTime: new Date(clock.now + WINDOW_MS) });
  });

  it('When only failures count (skipSuccessfulRequests), then a success takes its hit back, on the shared count', async () => {
    const a = appOn(dsA, { limit: 2, skipSuccessfulRequests: true });
    const b = appOn(dsB, { limit: 2, skipSuccessfulRequests: true });
    expect((await request(a.app).get('/fail').set('x-client', 'd')).status).toBe(401);
    for (let i = 0; i < 3; i++) {
      expect((await request(b.app).get('/ok').set('x-client', 'd')).status).toBe(200);
      await until(async () => (await a.store.get('d'))?.totalHits === 1);
    }
    expect((await request(a.app).get('/fail').set('x-client', 'd')).status).toBe(401);
    expect((await request(b.app).get('/ok').set('x-client', 'd')).status).toBe(429);
  });

  it('When a key or a limiter is reset, or windows have ended, then only those counts go', async () => {
    const signIn = appOn(dsA, { prefix: 'sign-in:' });
    const reset = appOn(dsB, { prefix: 'reset:' });
    for (const client of ['e', 'f']) {
      await request(signIn.app).get('/ok').set('x-client', client);
      await request(reset.app).get('/ok').set('x-client', client);
    }
    await signIn.store.resetKey('e');
    expect(await signIn.store.get('e')).toBeUndefined();
    expect((await signIn.store.get('f'))?.totalHits).toBe(1);
    expect((await reset.store.get('e'))?.totalHits).toBe(1);
    await reset.store.resetAll();
    expect(await reset.store.get('f')).toBeUndefined();
    expect((await signIn.store.get('f'))?.totalHits).toBe(1);
    clock.now += WINDOW_MS;
    await signIn.store.sweep();
    expect(await rawQuery(dsA, 'SELECT "key" FROM "rate_limit_hits"')).toEqual([]);
  });
});
