import request from 'supertest';
import type { DataSource } from 'typeorm';
import { openDatabase } from '../../server/db/data-source';
import { createApp } from '../../server/app';

export const TEST_TOKENS = { secret: 'test-secret-that-is-long-enough-to-sign-tokens', ttl: '1h' };

/** A fresh in-memory SQLite that ran the real migrations, and the real app on top of it. */
export async function makeTestApp() {
  const dataSource = await openDatabase(':memory:');
  const app = createApp({ dataSource, tokens: TEST_TOKENS, log: () => {} });
  let n = 0;
  async function signUp(roles: Array<'grower' | 'grazier'>, name = 'Test Person') {
    n += 1;
    const email = `${roles.join('-')}-${n}-${Date.now()}@test.example`;
    const res = await request(app).post('/api/auth/register').send({ email, password: 'long-enough-password', name, roles });
    if (res.status !== 201) throw new Error(`sign-up failed: ${res.status} ${JSON.stringify(res.body)}`);
    return { token: res.body.token as string, user: res.body.user, email, auth: { Authorization: `Bearer ${res.body.token}` } };
  }
  return { app, dataSource, signUp, close: () => (dataSource as DataSource).destroy() };
}
