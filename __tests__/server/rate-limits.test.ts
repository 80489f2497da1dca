import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { MemoryStore, type Store } from 'express-rate-limit';
import { makeTestApp, UNREACHED_LIMITS } from '../helpers/test-app';
import { blockBody, market } from '../helpers/market';
import { DEFAULT_RATE_LIMITS, type RateLimitSettings } from '../../server/lib/http/rate-limit';
import { ConfigError, loadConfig } from '../../server/config/env';

// Request limits through express-rate-limit. The test server trusts its loopback proxy, so X-Forwarded-For
// stands for the client's address, as behind the production proxy.

const GUESSER = '203.0.113.7';
const OWNER_AT_HOME = '198.51.100.20';
const PASSWORD = 'long-enough-password';

let t: Awaited<ReturnType<typeof makeTestApp>> | undefined;
afterEach(async () => {
  await t?.close();
  t = undefined;
});

function app(limits: Partial<RateLimitSettings> = DEFAULT_RATE_LIMITS, store?: (name: keyof RateLimitSettings) => Store) {
  return makeTestApp({ rateLimits: { limits: { ...UNREACHED_LIMITS, ...limits }, store } });
}

const login = (from: string, email: string, password: string) => request(t!.app).post('/api/auth/login').set('X-Forwarded-For', from).send({ email, password });

function expectLimited(res: request.Response) {
  expect(res.status).toBe(429);
  expect(res.body).toEqual({ error: { code: 'too_many_attempts', message: expect.stringMatching(/^Too many .+\. Try again in \d+ min\.$/) } });
  expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  expect(res.headers['cache-control']).toBe('no-store');
}

describe('Sign-in limits: the guesser, not the account', () => {
  it('When one address guesses wrong ten times, then it gets 429 with Retry-After, and the owner still signs in from home', async () => {
    t = await app({ signInPerIp: DEFAULT_RATE_LIMITS.signInPerIp, signInPerEmailAndIp: DEFAULT_RATE_LIMITS.signInPerEmailAndIp });
    const { email } = await t!.signUp(['grower']);
    for (let i = 0; i < 10; i++) expect((await login(GUESSER, email, `guess-${i}-password`)).status).toBe(401);
    const refused = await login(GUESSER, email, PASSWORD);
    expectLimited(refused);
    expect(refused.body.error.message).toMatch(/sign-in attempts for this account from this address/);

    const owner = await login(OWNER_AT_HOME, email, PASSWORD);
    expect(owner.status).toBe(200);
    expect(owner.body.token).toEqual(expect.any(String));
    // The owner's wrong try at home is counted there, apart from the guesser's.
    expect((await login(OWNER_AT_HOME, email, 'a-typo-in-the-password')).status).toBe(401);
    expect((await login(OWNER_AT_HOME, email, PASSWORD)).status).toBe(200);
  });

  it('When one address guesses across many accounts, then after 30 failures it is refused for every email, and other addresses are not', async () => {
    t = await app({ signInPerIp: DEFAULT_RATE_LIMITS.signInPerIp, signInPerEmailAndIp: DEFAULT_RATE_LIMITS.signInPerEmailAndIp });
    const victim = await t!.signUp(['grazier']);
    for (let i = 0; i < 30; i++) expect((await login(GUESSER, `someone-${i}@test.example`, 'a-guessed-password')).status).toBe(401);
    expectLimited(await login(GUESSER, victim.email, 'one-more-guess!'));
    expect((await login(OWNER_AT_HOME, victim.email, PASSWORD)).status).toBe(200);
  });

  it('When sign-ins succeed, then they never count: fifteen in a row from one address all pass', async () => {
    t = await app({ signInPerIp: { limit: 3, windowMs: 60_000 }, signInPerEmailAndIp: { limit: 3, windowMs: 60_000 } });
    const { email } = await t!.signUp(['grower']);
    for (let i = 0; i < 15; i++) expect((await login(GUESSER, email, PASSWORD)).status).toBe(200);
  });

  it('When the owner signs in after a few typos, then the count at that address starts afresh', async () => {
    t = await app({ signInPerEmailAndIp: { limit: 3, windowMs: 60_000 } });
    const { email } = await t!.signUp(['grower']);
    // Two typos and the right password, three times over: six failures in all, never refused.
    for (let round = 0; round < 3; round++) {
      for (let i = 0; i < 2; i++) expect((await login(OWNER_AT_HOME, email, `typo-${i}-password`)).status).toBe(401);
      expect((await login(OWNER_AT_HOME, email, PASSWORD)).status).toBe(200);
    }
    for (let i = 0; i < 3; i++) expect((await login(OWNER_AT_HOME, email, `typo-${i}-password`)).status).toBe(401);
    expectLimited(await login(OWNER_AT_HOME, email, `typo-4-password`));
  });
});

describe('Sign-up limit', () => {
  it('When one address signs up past the limit, then 429 and no account; another address still signs up', async () => {
    t = await app({ signUpPerIp: { limit: 3, windowMs: 60 * 60_000 } });
    const signUp = (from: string, n: number) =>
      request(t!.app).post('/api/auth/register').set('X-Forwarded-For', from).send({ email: `new-${n}@test.example`, password: PASSWORD, name: 'New Person', roles: ['grower'] });
    for (let i = 0; i < 3; i++) expect((await signUp(GUESSER, i)).status).toBe(201);
    expectLimited(await signUp(GUESSER, 3));
    expect((await login(OWNER_AT_HOME, 'new-3@test.example', PASSWORD)).status).toBe(401);
    expect((await signUp(OWNER_AT_HOME, 4)).status).toBe(201);
  });
});

describe('Write and upload limits, per signed-in account', () => {
  it('When one account writes past its limit, then 429; another account on the same address still writes, and reads are never counted', async () => {
    t = await app({ writesPerCaller: { limit: 5, windowMs: 60_000 } });
    const m = market(t!);
    const busy = await m.grower('Busy Grower');
    const other = await m.grower('Other Grower');
    for (let i = 0; i < 5; i++) expect((await m.api().post('/api/blocks').set(busy.auth).send(blockBody({ name: `Block ${i}` }))).status).toBe(201);
    for (let i = 0; i < 10; i++) expect((await m.api().get('/api/blocks').set(busy.auth)).status).toBe(200);
    const refused = await m.api().post('/api/blocks').set(busy.auth).send(blockBody({ name: 'One too many' }));
    expectLimited(refused);
    expect((await m.api().get('/api/blocks?view=mine').set(busy.auth)).body.total).toBe(5);
    expect((await m.api().post('/api/blocks').set(other.auth).send(blockBody())).status).toBe(201);
    // Sign-in and the calculator have limits of their own (or none): not counted as writes.
    for (let i = 0; i < 8; i++) expect((await m.api().post('/api/calc/charge').send({ basis: 'flat', rate: '1.00' })).status).toBe(200);
  });

  it('When a token is forged to name another account, then it counts against its own address and cannot drain that account', async () => {
    t = await app({ writesPerCaller: { limit: 3, windowMs: 60_000 } });
    const m = market(t!);
    const victim = await m.grower('Victim Grower');
    const forged = jwt.sign({ sid: 'made-up' }, 'not-the-server-secret-not-the-server-secret', { subject: victim.user.id });
    for (let i = 0; i < 5; i++) {
      await m.api().post('/api/blocks').set('X-Forwarded-For', GUESSER).set('Authorization', `Bearer ${forged}`).send(blockBody());
    }
    expect((await m.api().post('/api/blocks').set(victim.auth).send(blockBody())).status).toBe(201);
  });

  it('When one account uploads past its limit, then 429 before the body is read', async () => {
    t = await app({ uploadsPerCaller: { limit: 2, windowMs: 60_000 } });
    const m = market(t!);
    const g = await m.grower();
    const b = await m.draft(g);
    const notAPhoto = Buffer.from('not a picture');
    for (let i = 0; i < 2; i++) {
      const res = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', notAPhoto, 'a.jpg');
      expect(res.status).toBe(415);
    }
    expectLimited(await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', notAPhoto, 'a.jpg'));
  });
});

describe('Where the counts live', () => {
  it('When a store factory is given (the seam for a shared database store), then each limiter counts in its own store from it', async () => {
    const made: Array<{ name: string; keys: string[] }> = [];
    const factory = (name: keyof RateLimitSettings): Store => {
      const inner = new MemoryStore();
      const seen = { name, keys: [] as string[] };
      made.push(seen);
      return {
        init: (o) => inner.init(o),
        increment: (key) => {
          seen.keys.push(key);
          return inner.increment(key);
        },
        decrement: (key) => inner.decrement(key),
        resetKey: (key) => inner.resetKey(key),
      };
    };
    t = await app(DEFAULT_RATE_LIMITS, factory);
    expect(made.map((s) => s.name).sort()).toEqual(Object.keys(DEFAULT_RATE_LIMITS).sort());
    await login(GUESSER, 'Someone@Test.example ', 'a-guessed-password');
    expect(made.find((s) => s.name === 'signInPerIp')!.keys).toEqual([GUESSER]);
    expect(made.find((s) => s.name === 'signInPerEmailAndIp')!.keys).toEqual([`someone@test.example|${GUESSER}`]);
  });
});

describe('Which client address is counted (TRUST_PROXY)', () => {
  const root = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-trust-proxy-'));
  afterAll(() => fs.rmSync(root, { recursive: true, force: true }));
  const config = (TRUST_PROXY?: string) => loadConfig({ DATA_DIR: 'data', ...(TRUST_PROXY ? { TRUST_PROXY } : {}) } as NodeJS.ProcessEnv, root);

  it('When it is unset, a hop count or a list, then Express is told exactly that; "true" stops the server naming the variable', () => {
    expect(config().trustProxy).toBe('loopback');
    expect(config('1').trustProxy).toBe(1);
    expect(config('loopback, 10.0.0.0/8').trustProxy).toBe('loopback, 10.0.0.0/8');
    expect(() => config('true')).toThrow(ConfigError);
    expect(() => config('true')).toThrow(/TRUST_PROXY/);
  });

  it('When the proxy is not trusted, then a sender cannot pick its address with X-Forwarded-For to dodge the limit', async () => {
    t = await makeTestApp({ rateLimits: { limits: { ...UNREACHED_LIMITS, signInPerIp: { limit: 2, windowMs: 60_000 } } } });
    // The shared test app trusts loopback (the tests stand for the proxy); a server trusting no proxy:
    t.app.set('trust proxy', false);
    for (let i = 0; i < 2; i++) expect((await login(`192.0.2.${i}`, 'nobody@test.example', 'a-guessed-password')).status).toBe(401);
    expectLimited(await login('192.0.2.99', 'nobody@test.example', 'a-guessed-password'));
  });
});
