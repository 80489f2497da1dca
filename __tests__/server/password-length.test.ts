import request from 'supertest';
import bcrypt from 'bcryptjs';
import { makeTestApp } from '../helpers/test-app';
import { hashPassword } from '../../server/modules/accounts/accounts.service';
import { AppError } from '../../server/lib/errors/app-error';
import { PASSWORD_MAX_BYTES, registerSchema, utf8Length } from '../../lib/schemas/account';

// bcrypt reads a password's first 72 UTF-8 bytes and drops the rest without a word: "ü" is 2 bytes, an emoji 4,
// so a 40-character password can already be cut. Longer ones are refused where they are set.

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

const register = (email: string, password: string) => request(t.app).post('/api/auth/register').send({ email, password, name: 'Jürgen Müller', roles: ['grazier'] });

describe('Passwords and bcrypt’s 72 bytes', () => {
  it('When a sign-up password is 37 characters of ü (74 bytes), then 400 names password and no account is made', async () => {
    const password = 'ü'.repeat(37);
    expect(password.length).toBe(37);
    expect(utf8Length(password)).toBe(74);
    const res = await register('juergen@test.example', password);
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['password']);
    expect(res.body.error.fields.password).toMatch(/at most 72 bytes/);
    expect((await request(t.app).post('/api/auth/login').send({ email: 'juergen@test.example', password: 'ü'.repeat(36) })).status).toBe(401);
  });

  it('When it is exactly 72 bytes of mixed scripts and emoji, then the account is made and that whole password signs in', async () => {
    const password = `weide-🐑🐑-${'ö'.repeat(17)}-${'羊'.repeat(6)}-ok!`;
    expect(utf8Length(password)).toBe(PASSWORD_MAX_BYTES);
    expect(utf8Length(password)).toBe(Buffer.byteLength(password, 'utf8'));
    expect((await register('weide@test.example', password)).status).toBe(201);
    expect((await request(t.app).post('/api/auth/login').send({ email: 'weide@test.example', password })).status).toBe(200);
    // One byte short of it is another password.
    expect((await request(t.app).post('/api/auth/login').send({ email: 'weide@test.example', password: password.slice(0, -1) })).status).toBe(401);
  });

  it('When a service is handed a long password past the schema, then hashPassword refuses it with a 400 naming password', async () => {
    const err = await hashPassword('🐑'.repeat(19)).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).fields).toEqual({ password: expect.stringMatching(/72 bytes/) });
    // At the limit it hashes, and bcrypt checks all of it.
    const hash = await hashPassword('🐑'.repeat(18));
    expect(await bcrypt.compare('🐑'.repeat(18), hash)).toBe(true);
  });

  it('When the shared schema checks the app’s sign-up form, then it counts bytes the same way', async () => {
    const base = { email: 'a@test.example', name: 'Ana Field', roles: ['grower'] };
    await expect(registerSchema.validate({ ...base, password: 'a'.repeat(72) })).resolves.toBeTruthy();
    await expect(registerSchema.validate({ ...base, password: 'a'.repeat(73) })).rejects.toThrow(/at most 72 bytes/);
    await expect(registerSchema.validate({ ...base, password: 'é'.repeat(37) })).rejects.toThrow(/at most 72 bytes/);
    // A lone surrogate is sent as U+FFFD (3 bytes).
    expect(utf8Length('\ud83d')).toBe(Buffer.byteLength('\ud83d', 'utf8'));
  });
});
