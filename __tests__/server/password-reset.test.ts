import crypto from 'node:crypto';
import request from 'supertest';
import { makeTestApp, TEST_NOW, UNREACHED_LIMITS } from '../helpers/test-app';
import { PasswordReset } from '../../server/modules/accounts/account.entity';
import { OutboxMessage } from '../../server/lib/mail/outbox.entity';
import type { MailMessage } from '../../server/lib/mail/mail-port';

// POST /api/auth/password-reset { email } and POST /api/auth/password-reset/confirm { token, password }.

const OLD = 'long-enough-password';
const NEW = 'a-new-orchard-password';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

const ask = (email: string, from = '198.51.100.20') => request(t.app).post('/api/auth/password-reset').set('X-Forwarded-For', from).send({ email });
const confirm = (token: string, password = NEW) => request(t.app).post('/api/auth/password-reset/confirm').send({ token, password });
const login = (email: string, password: string) => request(t.app).post('/api/auth/login').send({ email, password });

/** The mail queued for `to` once the request's work (done after its 202) is in: delivers the outbox until it shows. */
async function mailTo(to: string, subject = /new Fieldfold password/): Promise<MailMessage> {
  for (let i = 0; i < 100; i++) {
    await t.deliverMail();
    const found = t.mail.outbox.filter((m) => m.to === to && subject.test(m.subject));
    if (found.length > 0) return found[found.length - 1];
    await new Promise((r) => setTimeout(r, 10));
  }
  throw new Error(`no mail to ${to}`);
}

function tokenIn(mail: MailMessage): string {
  const link = /http:\/\/fieldfold\.test\/reset-password\?token=([A-Za-z0-9_-]+)/.exec(mail.text);
  expect(link).not.toBeNull();
  return link![1];
}

describe('POST /api/auth/password-reset', () => {
  it('When an account asks, then 202, and a mail links to /reset-password with a token kept only as its SHA-256', async () => {
    const p = await t.signUp(['grower'], 'Greta Olsen');
    const res = await ask(p.email.toUpperCase());
    expect(res.status).toBe(202);
    const mail = await mailTo(p.email);
    expect(mail.subject).toBe('Set a new Fieldfold password');
    expect(mail.text).toMatch(/works once, for 30 minutes/);
    const token = tokenIn(mail);
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(mail.html).toContain(`href="http://fieldfold.test/reset-password?token=${token}"`);

    const rows = await t.dataSource.getRepository(PasswordReset).find();
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ accountId: p.user.id, tokenHash: crypto.createHash('sha256').update(token).digest('hex'), usedAt: null, expiresAt: TEST_NOW + 30 * 60_000 });
    // The token is nowhere in the database: not in the reset table, and the sent mail's body was dropped.
    const dump = JSON.stringify(await t.dataSource.query(`SELECT * FROM password_resets`)) + JSON.stringify(await t.dataSource.getRepository(OutboxMessage).find());
    expect(dump).not.toContain(token);
  });

  it('When the email has no account, then the answer is the very same 202 and no mail goes anywhere', async () => {
    const p = await t.signUp(['grazier']);
    const unknown = await ask('nobody-here@test.example');
    const known = await ask(p.email);
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual(known.body);
    expect(Object.keys(unknown.headers).sort()).toEqual(Object.keys(known.headers).sort());
    await mailTo(p.email);
    expect(t.mail.outbox.map((m) => m.to)).toEqual([p.email]);
    expect(await t.dataSource.getRepository(PasswordReset).count()).toBe(1);
  });

  it('When the email is malformed or a field unknown, then 400 names it (it says nothing about accounts either)', async () => {
    const res = await request(t.app).post('/api/auth/password-reset').send({ email: 'not-an-email', admin: true });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['admin', 'email']);
  });
});

describe('POST /api/auth/password-reset/confirm', () => {
  it('When the mailed token sets a new password, then it signs in, the old password does not, every session is closed, and a second use is 410 naming token', async () => {
    const p = await t.signUp(['grazier'], 'Wade Kellner');
    const otherDevice = (await login(p.email, OLD)).body.token as string;
    await ask(p.email);
    const token = tokenIn(await mailTo(p.email));

    const res = await confirm(token);
    expect(res.status).toBe(204);
    expect((await login(p.email, NEW)).status).toBe(200);
    expect((await login(p.email, OLD)).status).toBe(401);
    expect((await request(t.app).get('/api/me').set(p.auth)).status).toBe(401);
    expect((await request(t.app).get('/api/me').set('Authorization', `Bearer ${otherDevice}`)).status).toBe(401);
    expect((await mailTo(p.email, /password was changed/)).text).toMatch(/every device signed in with the old one was signed out/);

    const again = await confirm(token, 'yet-another-password');
    expect(again.status).toBe(410);
    expect(again.body.error.fields).toEqual({ token: expect.stringMatching(/used already/) });
    expect((await login(p.email, NEW)).status).toBe(200);
  });

  it('When two confirmations race with one token, then exactly one sets its password', async () => {
    const p = await t.signUp(['grower']);
    await ask(p.email);
    const token = tokenIn(await mailTo(p.email));
    const [a, b] = await Promise.all([confirm(token, 'first-racing-password'), confirm(token, 'second-racing-password')]);
    expect([a.status, b.status].sort()).toEqual([204, 410]);
    const winner = a.status === 204 ? 'first-racing-password' : 'second-racing-password';
    const loser = a.status === 204 ? 'second-racing-password' : 'first-racing-password';
    expect((await login(p.email, winner)).status).toBe(200);
    expect((await login(p.email, loser)).status).toBe(401);
  });

  it('When the link is older than 30 minutes, then 410 naming token and the password is unchanged', async () => {
    const p = await t.signUp(['grower']);
    await ask(p.email);
    const token = tokenIn(await mailTo(p.email));
    t.setNow(new Date(TEST_NOW + 30 * 60_000 + 1).toISOString());
    const res = await confirm(token);
    expect(res.status).toBe(410);
    expect(res.body.error.fields.token).toMatch(/expired/);
    expect((await login(p.email, OLD)).status).toBe(200);
  });

  it('When a newer link is used, then the older one no longer works', async () => {
    const p = await t.signUp(['grower']);
    await ask(p.email);
    const first = tokenIn(await mailTo(p.email));
    t.mail.outbox.length = 0;
    await ask(p.email);
    const second = tokenIn(await mailTo(p.email));
    expect(second).not.toBe(first);
    expect((await confirm(second)).status).toBe(204);
    expect((await confirm(first, 'some-other-password')).status).toBe(410);
  });

  it('When the token is made up, malformed or missing, or the password too short or over 72 bytes, then 400 names the field', async () => {
    const made = await confirm(crypto.randomBytes(32).toString('base64url'));
    expect(made.status).toBe(400);
    expect(made.body.error).toMatchObject({ code: 'invalid_token', fields: { token: expect.stringMatching(/not one we sent/) } });
    expect((await confirm('short-token')).body.error.fields).toEqual({ token: expect.stringMatching(/not complete/) });
    const missing = await request(t.app).post('/api/auth/password-reset/confirm').send({ password: NEW });
    expect(Object.keys(missing.body.error.fields)).toEqual(['token']);
    const weak = await confirm(crypto.randomBytes(32).toString('base64url'), 'short');
    expect(weak.body.error.fields).toEqual({ password: expect.stringMatching(/at least 10/) });
    const long = await confirm(crypto.randomBytes(32).toString('base64url'), 'ü'.repeat(37));
    expect(long.body.error.fields).toEqual({ password: expect.stringMatching(/at most 72 bytes/) });
  });
});

describe('Password-reset limits', () => {
  it('When one email is asked for past its limit, then 429 from any address; other emails still get mail', async () => {
    await t.close();
    t = await makeTestApp({ rateLimits: { limits: { ...UNREACHED_LIMITS, passwordResetPerEmail: { limit: 3, windowMs: 3_600_000 }, passwordResetPerIp: { limit: 5, windowMs: 3_600_000 } } } });
    const p = await t.signUp(['grower']);
    const q = await t.signUp(['grazier']);
    for (let i = 0; i < 3; i++) expect((await ask(p.email, `203.0.113.${i}`)).status).toBe(202);
    const limited = await ask(p.email, '203.0.113.50');
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('too_many_attempts');
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    expect((await ask(q.email, '203.0.113.50')).status).toBe(202);
    // And one address asking for many emails is stopped at its own limit (5 an hour here).
    for (let i = 0; i < 5; i++) expect((await ask(`someone-${i}@test.example`, '203.0.113.60')).status).toBe(202);
    expect((await ask('someone-5@test.example', '203.0.113.60')).status).toBe(429);
  });
});
