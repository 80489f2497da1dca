import request from 'supertest';
import sharp from 'sharp';
import jwt from 'jsonwebtoken';
import { makeTestApp, TEST_NOW, TEST_TOKENS } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { makeInvoicingApp } from '../helpers/invoicing';

// Sessions: a token expires with its session, is rotated by POST /api/auth/refresh (the old session closes), and
// every signed link (block photo, log photo, invoice PDF) opens only while the session it was made under is open.

const DAY = 86_400_000;
const photo = () => sharp({ create: { width: 32, height: 24, channels: 3, background: { r: 90, g: 140, b: 60 } } }).jpeg().toBuffer();

describe('POST /api/auth/refresh', () => {
  let t: Awaited<ReturnType<typeof makeTestApp>>;
  beforeEach(async () => {
    t = await makeTestApp();
  });
  afterEach(() => t.close());

  it('When a signed-in app refreshes, then it gets a new token for a new session and the old token is signed out', async () => {
    const person = await t.signUp(['grazier'], 'Wade Kellner');
    const res = await request(t.app).post('/api/auth/refresh').set(person.auth);
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ id: person.user.id, email: person.email });
    const fresh = res.body.token as string;
    expect(fresh).not.toBe(person.token);
    const oldClaims = jwt.decode(person.token) as { sid: string };
    const newClaims = jwt.decode(fresh) as { sid: string; sub: string };
    expect(newClaims.sid).not.toBe(oldClaims.sid);
    expect(newClaims.sub).toBe(person.user.id);

    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${fresh}`)).status).toBe(200);
    const old = await request(t.app).get('/api/me').set(person.auth);
    expect(old.status).toBe(401);
    expect(old.body.error.message).toBe('You have been signed out. Sign in again.');
  });

  it('When the same token is refreshed twice (a replayed copy), then only the first gets a session', async () => {
    const person = await t.signUp(['grower']);
    const [a, b] = await Promise.all([request(t.app).post('/api/auth/refresh').set(person.auth), request(t.app).post('/api/auth/refresh').set(person.auth)]);
    expect([a.status, b.status].sort()).toEqual([200, 401]);
    const again = await request(t.app).post('/api/auth/refresh').set(person.auth);
    expect(again.status).toBe(401);
  });

  it('When the refreshed token is used past the configured life, then it has expired like any other', async () => {
    const person = await t.signUp(['grower']);
    t.setNow(new Date(TEST_NOW + 200 * DAY).toISOString());
    const res = await request(t.app).post('/api/auth/refresh').set(person.auth);
    expect(res.status).toBe(200);
    // The new token lives TOKEN_TTL (400 d in the tests) from the refresh, not from the first sign-in.
    const claims = jwt.decode(res.body.token) as { iat: number; exp: number };
    expect(claims.exp - claims.iat).toBe(400 * 86_400);
    expect(claims.iat).toBe(Math.floor((TEST_NOW + 200 * DAY) / 1000));
    t.setNow(new Date(TEST_NOW + 599 * DAY).toISOString());
    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${res.body.token}`)).status).toBe(200);
    t.setNow(new Date(TEST_NOW + 601 * DAY).toISOString());
    const late = await request(t.app).get('/api/me').set('Authorization', `Bearer ${res.body.token}`);
    expect(late.status).toBe(401);
    expect(late.body.error.code).toBe('unauthenticated');
  });

  it('When a token was never used past its life, then the session has expired too (401) and refreshing it is refused', async () => {
    const person = await t.signUp(['grower']);
    t.setNow(new Date(TEST_NOW + 401 * DAY).toISOString());
    expect((await request(t.app).get('/api/me').set(person.auth)).status).toBe(401);
    expect((await request(t.app).post('/api/auth/refresh').set(person.auth)).status).toBe(401);
  });

  it('When a signed photo link is sent as a bearer token, then it is never a sign-in, even though it names a session', async () => {
    const g = await t.signUp(['grower']);
    const m = contracts(t);
    const block = await m.draft(g);
    await request(t.app).post(`/api/blocks/${block.id}/photos`).set(g.auth).attach('photo', await photo(), 'a.jpg');
    const url: string = (await request(t.app).get(`/api/blocks/${block.id}`).set(g.auth)).body.block.photos[0].url;
    const access = decodeURIComponent(new URL(url, 'http://x').searchParams.get('access')!);
    expect(jwt.decode(access)).toMatchObject({ typ: 'photo', ses: (jwt.decode(g.token) as { sid: string }).sid });
    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${access}`)).status).toBe(401);
    // And a sign-in token with a made-up type is refused the same way.
    const typed = jwt.sign({ sid: (jwt.decode(g.token) as { sid: string }).sid, typ: 'photo' }, TEST_TOKENS.secret, { subject: g.user.id });
    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${typed}`)).status).toBe(401);
  });
});

describe('Signed links after sign-out', () => {
  it('When the grower signs out on one device, then the block photo links made for that session stop opening; those of the other device still open', async () => {
    const t = await makeTestApp();
    try {
      const c = contracts(t);
      const phone = await c.grower('Greta Olsen');
      const laptop = await request(t.app).post('/api/auth/login').send({ email: phone.email, password: 'long-enough-password' });
      const laptopAuth = { Authorization: `Bearer ${laptop.body.token}` };
      const block = await c.draft(phone);
      expect((await request(t.app).post(`/api/blocks/${block.id}/photos`).set(phone.auth).attach('photo', await photo(), 'a.jpg')).status).toBe(201);
      const phoneLink: string = (await request(t.app).get(`/api/blocks/${block.id}`).set(phone.auth)).body.block.photos[0].url;
      const laptopLink: string = (await request(t.app).get(`/api/blocks/${block.id}`).set(laptopAuth)).body.block.photos[0].url;
      expect((await request(t.app).get(phoneLink)).status).toBe(200);

      expect((await request(t.app).post('/api/auth/logout').set(phone.auth)).status).toBe(204);
      const closed = await request(t.app).get(phoneLink);
      expect(closed.status).toBe(401);
      expect(closed.body.error.message).toMatch(/photo link has expired or is not valid/);
      expect((await request(t.app).get(laptopLink)).status).toBe(200);

      // Rotating the laptop's token closes its links too; the new session's view has working ones.
      const rotated = await request(t.app).post('/api/auth/refresh').set(laptopAuth);
      expect((await request(t.app).get(laptopLink)).status).toBe(401);
      const newLink: string = (await request(t.app).get(`/api/blocks/${block.id}`).set('Authorization', `Bearer ${rotated.body.token}`)).body.block.photos[0].url;
      expect((await request(t.app).get(newLink)).status).toBe(200);
    } finally {
      await t.close();
    }
  });

  it('When the grazier signs out, then the log photo links of that session stop opening', async () => {
    const t = await makeTestApp();
    try {
      const c = contracts(t);
      const a = await c.signed();
      t.setNow('2027-01-12T08:00:00-08:00');
      const entry = await c.logOk(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-11T08:00:00-08:00', note: 'Residual by the pump house' });
      const up = await request(t.app).post(`/api/contracts/${a.contractId}/log/${entry.id}/photos`).set(a.grazier.auth).attach('photo', await photo(), 'pump.jpg');
      expect(up.status).toBe(201);
      const link: string = (await request(t.app).get(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth)).body.items[0].photos[0].url;
      expect((await request(t.app).get(link)).status).toBe(200);
      expect((await request(t.app).post('/api/auth/logout').set(a.grazier.auth)).status).toBe(204);
      expect((await request(t.app).get(link)).status).toBe(401);
      // The link the upload answered with was made for the same session: closed as well.
      expect((await request(t.app).get(up.body.photo.url)).status).toBe(401);
    } finally {
      await t.close();
    }
  });

  it('When the grower signs out, then the invoice PDF link of that session stops opening', async () => {
    const t = await makeInvoicingApp();
    try {
      const c = await t.agreedContract();
      const res = await t.api().post(`/api/contracts/${c.contractId}/invoice`).set(c.grazier.auth).send({});
      expect(res.status).toBe(201);
      const link: string = (await t.api().get(`/api/invoices/${res.body.invoice.id}`).set(c.grower.auth)).body.invoice.pdf.url;
      expect((await t.api().get(link)).status).toBe(200);
      expect((await t.api().post('/api/auth/logout').set(c.grower.auth)).status).toBe(204);
      const closed = await t.api().get(link);
      expect(closed.status).toBe(401);
      expect(closed.body.error.message).toMatch(/download link has expired or is not valid/);
    } finally {
      await t.close();
    }
  });
});
