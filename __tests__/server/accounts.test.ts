import request from 'supertest';
import jwt from 'jsonwebtoken';
import { makeTestApp, TEST_NOW, TEST_TOKENS } from '../helpers/test-app';
import { DEFAULT_RATE_LIMITS } from '../../server/lib/http/rate-limit';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

describe('POST /api/auth/register', () => {
  it('When the body is valid, then it creates the account and returns a token that opens GET /api/me', async () => {
    const res = await request(t.app)
      .post('/api/auth/register')
      .send({ email: 'ana@test.example', password: 'a-good-password', name: 'Ana Field', roles: ['grower'] });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'ana@test.example', name: 'Ana Field', roles: ['grower'], activeRole: 'grower' });
    expect(res.body.user.passwordHash).toBeUndefined();
    const me = await request(t.app).get('/api/me').set('Authorization', `Bearer ${res.body.token}`);
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('ana@test.example');
  });

  it('When the password is short, the email malformed and the role unknown, then 400 names each field', async () => {
    const res = await request(t.app)
      .post('/api/auth/register')
      .send({ email: 'not-an-email', password: 'short', name: 'Ana', roles: ['shepherd'] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'password', 'roles[0]']);
    expect(res.body.error.fields.password).toMatch(/at least 10 characters/);
  });

  it('When someone asks for the admin role at sign-up, then 400 on roles and no account', async () => {
    const res = await request(t.app)
      .post('/api/auth/register')
      .send({ email: 'sneaky@test.example', password: 'a-good-password', name: 'Sneaky', roles: ['admin'] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['roles[0]']).toMatch(/grower or grazier/);
    const login = await request(t.app).post('/api/auth/login').send({ email: 'sneaky@test.example', password: 'a-good-password' });
    expect(login.status).toBe(401);
  });

  it('When no role is chosen or a field is unknown, then 400 names it', async () => {
    const res = await request(t.app)
      .post('/api/auth/register')
      .send({ email: 'a@test.example', password: 'a-good-password', name: 'Ana', roles: [], isAdmin: true });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.roles).toMatch(/at least one role/);
    expect(res.body.error.fields.isAdmin).toMatch(/Unknown field/);
  });

  it('When the email is taken, then 409', async () => {
    const body = { email: 'twice@test.example', password: 'a-good-password', name: 'Twice', roles: ['grazier'] };
    expect((await request(t.app).post('/api/auth/register').send(body)).status).toBe(201);
    const again = await request(t.app).post('/api/auth/register').send(body);
    expect(again.status).toBe(409);
    expect(again.body.error.fields.email).toBeDefined();
  });

  it('When the body is not JSON, then 400 not 500', async () => {
    const res = await request(t.app).post('/api/auth/register').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_json');
  });
});

describe('POST /api/auth/login and /logout', () => {
  it('When the password is right, then a token; when wrong, then 401 without saying which part was wrong', async () => {
    const { email } = await t.signUp(['grazier']);
    const ok = await request(t.app).post('/api/auth/login').send({ email, password: 'long-enough-password' });
    expect(ok.status).toBe(200);
    expect(ok.body.token).toEqual(expect.any(String));
    const bad = await request(t.app).post('/api/auth/login').send({ email, password: 'wrong-password!' });
    expect(bad.status).toBe(401);
    expect(bad.body.error.message).toBe('Email or password is not right');
    const nobody = await request(t.app).post('/api/auth/login').send({ email: 'nobody@test.example', password: 'wrong-password!' });
    expect(nobody.status).toBe(401);
    expect(nobody.body.error.message).toBe(bad.body.error.message);
  });

  it('When sign-in fails ten times for one email, then the eleventh try gets 429 with Retry-After', async () => {
    // The production limits (the shared test app keeps them out of reach); more in rate-limits.test.ts.
    await t.close();
    t = await makeTestApp({ rateLimits: { limits: DEFAULT_RATE_LIMITS } });
    const { email } = await t.signUp(['grower']);
    for (let i = 0; i < 10; i++) {
      expect((await request(t.app).post('/api/auth/login').send({ email, password: 'guess-' + i })).status).toBe(401);
    }
    const limited = await request(t.app).post('/api/auth/login').send({ email, password: 'long-enough-password' });
    expect(limited.status).toBe(429);
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('When a user signs out, then the same token gets 401', async () => {
    const { auth } = await t.signUp(['grower']);
    expect((await request(t.app).post('/api/auth/logout').set(auth)).status).toBe(204);
    const me = await request(t.app).get('/api/me').set(auth);
    expect(me.status).toBe(401);
  });
});

describe('GET /api/me with a bad token', () => {
  it('When there is no token, a malformed one, one signed with another secret, or an expired one, then 401', async () => {
    const { user } = await t.signUp(['grower']);
    expect((await request(t.app).get('/api/me')).status).toBe(401);
    expect((await request(t.app).get('/api/me').set('Authorization', 'Bearer nonsense')).status).toBe(401);
    const forged = jwt.sign({ sid: 'x' }, 'another-secret-another-secret-another', { subject: user.id });
    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${forged}`)).status).toBe(401);
    const expired = jwt.sign({ sid: 'x', exp: Math.floor(TEST_NOW / 1000) - 10 }, TEST_TOKENS.secret, { subject: user.id });
    const res = await request(t.app).get('/api/me').set('Authorization', `Bearer ${expired}`);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });
});

describe('PATCH /api/me', () => {
  it('When a grazier saves a home base and a flock, then GET /api/me returns them', async () => {
    const { auth } = await t.signUp(['grazier']);
    const res = await request(t.app)
      .patch('/api/me')
      .set(auth)
      .send({
        businessName: 'Ridge Sheep',
        phone: '+1 555 010 2000',
        homePlace: 'Ridge corrals',
        homeLatitude: 39.5,
        homeLongitude: -121.9,
        flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 450, bodyWeightLb: 140 },
      });
    expect(res.status).toBe(200);
    expect(res.body.user.flock).toEqual({ species: 'sheep', animalClass: 'dry ewes', headCount: 450, bodyWeightLb: 140 });
    expect((await request(t.app).get('/api/me').set(auth)).body.user.homeLatitude).toBe(39.5);
  });

  it('When values are out of range or of the wrong type, then 400 names each and nothing changes', async () => {
    const { auth } = await t.signUp(['grazier']);
    const res = await request(t.app)
      .patch('/api/me')
      .set(auth)
      .send({ homeLatitude: 123, homeLongitude: -121, flock: { species: 'cattle', animalClass: 'dry ewes', headCount: '600', bodyWeightLb: 140 } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({
      homeLatitude: expect.stringMatching(/between -90 and 90/),
      'flock.species': expect.any(String),
      'flock.headCount': expect.any(String),
    });
    expect((await request(t.app).get('/api/me').set(auth)).body.user.homeLatitude).toBeNull();
  });

  it('When a grower tries to switch to grazier or keep a flock, then 400 names the field', async () => {
    const { auth } = await t.signUp(['grower']);
    const res = await request(t.app).patch('/api/me').set(auth).send({ activeRole: 'grazier' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.activeRole).toMatch(/not a grazier/);
  });

  it('When an account holds both roles, then it can switch its active role', async () => {
    const { auth } = await t.signUp(['grower', 'grazier']);
    const res = await request(t.app).patch('/api/me').set(auth).send({ activeRole: 'grazier' });
    expect(res.status).toBe(200);
    expect(res.body.user.activeRole).toBe('grazier');
  });
});

describe('GET /api/health and unknown routes', () => {
  it('answers health and gives the error shape for an unknown route', async () => {
    expect((await request(t.app).get('/api/health')).body).toEqual({ ok: true, service: 'fieldfold' });
    const res = await request(t.app).get('/api/nothing-here');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('Concurrent sign-ups', () => {
  it('When two sign-ups race for one email, then exactly one account is created and the other gets 409', async () => {
    const body = { email: 'race@test.example', password: 'a-good-password', name: 'Racer', roles: ['grower'] };
    const [a, b] = await Promise.all([request(t.app).post('/api/auth/register').send(body), request(t.app).post('/api/auth/register').send(body)]);
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const rows = await t.dataSource.query(`SELECT COUNT(*) AS n FROM accounts WHERE email = 'race@test.example'`);
    expect(Number(rows[0].n)).toBe(1);
  });
});
