import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { contracts, clientId } from '../helpers/contracts';
import { bidBody, blockBody } from '../helpers/market';
import { builtInKeys, check } from '../../server/lib/http/validate';
import { AppError } from '../../server/lib/errors/app-error';
import { logEntrySchema } from '../../lib/schemas/contract';

// Keys named like members every object inherits (`constructor`, `__proto__`, …) used to crash yup's cast
// ("field.resolve is not a function") and answer 500. Every body and query now refuses them as unknown fields.

const KEYS = ['__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', 'valueOf'];
const VALUES = ['{"x":1}', '"text"', '1', 'null', '[]'];

/** The JSON text of `body` with `"key": value` first, written by hand: JSON.stringify drops an own `__proto__`. */
function withKey(body: object, key: string, value: string): string {
  const rest = JSON.stringify(body).slice(1);
  return `{"${key}":${value}${rest === '}' ? '' : ','}${rest}`;
}

let t: Awaited<ReturnType<typeof makeTestApp>>;
let logged: string[];
beforeEach(async () => {
  logged = [];
  t = await makeTestApp({ log: (m) => logged.push(m) });
});
afterEach(() => t.close());

describe('Request keys named like built-in object members', () => {
  it('When any of them is sent to sign-up, sign-in, blocks, bids, the log, the profile or the calculator, then 400 names it and nothing is stored', async () => {
    const c = contracts(t);
    const a = await c.signed();
    const draft = await c.draft(a.grower, { name: 'South bench draft' });
    const open = await c.openBlock(a.grower, { name: 'West bench open' });
    t.setNow('2027-01-20T16:00:00-08:00');
    const targets: Array<{ method: 'post' | 'patch'; url: string; body: object; auth?: Record<string, string> }> = [
      { method: 'post', url: '/api/auth/register', body: { email: 'proto@test.example', password: 'long-enough-password', name: 'Pro To', roles: ['grower'] } },
      { method: 'post', url: '/api/auth/login', body: { email: a.grower.email, password: 'long-enough-password' } },
      { method: 'post', url: '/api/blocks', body: blockBody(), auth: a.grower.auth },
      { method: 'patch', url: `/api/blocks/${draft.id}`, body: { name: 'Renamed block' }, auth: a.grower.auth },
      { method: 'post', url: `/api/blocks/${open.id}/bids`, body: bidBody(), auth: a.grazier.auth },
      { method: 'post', url: `/api/contracts/${a.contractId}/log`, body: { clientId: clientId(), kind: 'move', at: '2027-01-10T08:00:00-08:00', change: 600 }, auth: a.grazier.auth },
      { method: 'patch', url: '/api/me', body: { name: 'Wade Kellner' }, auth: a.grazier.auth },
      { method: 'post', url: '/api/calc/forage', body: { frameAreaM2: 0.25, samples: [{ dryGrams: 10 }] } },
      { method: 'post', url: '/api/calc/head-days', body: { moves: [{ at: '2027-01-10T08:00:00-08:00', change: 1 }], until: '2027-01-11T08:00:00-08:00' } },
      { method: 'post', url: '/api/calc/charge', body: { basis: 'flat', rate: '1.00' } },
    ];
    for (const target of targets) {
      for (const key of KEYS) {
        for (const value of VALUES) {
          const req = request(t.app)[target.method](target.url).set('Content-Type', 'application/json');
          if (target.auth) req.set(target.auth);
          const res = await req.send(withKey(target.body, key, value));
          const where = `${target.method} ${target.url} ${key}=${value}`;
          expect({ where, status: res.status }).toEqual({ where, status: 400 });
          expect({ where, field: res.body.error.fields?.[key] }).toEqual({ where, field: `Unknown field: ${key}` });
        }
      }
    }
    expect(logged.filter((l) => l.startsWith('[error]'))).toEqual([]);
    // Nothing was stored on the way: no account for the refused sign-up, the block keeps its name, the log has no entry.
    const login = await request(t.app).post('/api/auth/login').send({ email: 'proto@test.example', password: 'long-enough-password' });
    expect(login.status).toBe(401);
    expect((await request(t.app).get(`/api/blocks/${draft.id}`).set(a.grower.auth)).body.block.name).toBe('South bench draft');
    expect((await request(t.app).get(`/api/blocks/${open.id}/bids`).set(a.grower.auth)).body.items).toEqual([]);
    const log = await request(t.app).get(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth);
    expect(log.body.items).toEqual([]);
  });

  it('When one sits deep inside a nested object or a list, then 400 names it at its path', async () => {
    const res = await request(t.app)
      .post('/api/calc/forage')
      .set('Content-Type', 'application/json')
      .send('{"frameAreaM2":0.25,"samples":[{"dryGrams":10},{"dryGrams":11,"constructor":{"prototype":1}}]}');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'samples[1].constructor': 'Unknown field: constructor' });

    const grazier = await t.signUp(['grazier']);
    const flock = await request(t.app)
      .patch('/api/me')
      .set(grazier.auth)
      .set('Content-Type', 'application/json')
      .send('{"flock":{"__proto__":{"headCount":5},"species":"sheep","animalClass":"dry ewes","headCount":600,"bodyWeightLb":150}}');
    expect(flock.status).toBe(400);
    expect(flock.body.error.fields).toEqual({ 'flock.__proto__': 'Unknown field: __proto__' });
    expect((await request(t.app).get('/api/me').set(grazier.auth)).body.user.flock).toBeNull();
  });

  it('When they arrive as query parameters of the lists, then 400 names them', async () => {
    const c = contracts(t);
    const a = await c.signed();
    for (const url of ['/api/blocks', '/api/contracts', `/api/contracts/${a.contractId}/log`, '/api/invoices', '/api/bids']) {
      const res = await request(t.app).get(`${url}?constructor=1&toString=2`).set(a.grazier.auth);
      expect({ url, status: res.status, fields: res.body.error?.fields }).toEqual({
        url,
        status: 400,
        fields: { constructor: 'Unknown field: constructor', toString: 'Unknown field: toString' },
      });
    }
  });

  it('When a body nests far deeper than any form, then the check walks it without recursion and answers', async () => {
    const deep = `${'['.repeat(20_000)}${']'.repeat(20_000)}`;
    expect(builtInKeys(JSON.parse(`{"samples":${deep}}`))).toEqual([]);
    const res = await request(t.app).post('/api/calc/forage').set('Content-Type', 'application/json').send(`{"frameAreaM2":0.25,"samples":${deep}}`);
    expect(res.status).toBe(400);
  });

  it('When a service checks a value that did not come through the API (the demo seed), then check() refuses them too', async () => {
    const value = JSON.parse('{"clientId":"demo-1","kind":"move","at":"2027-01-10T08:00:00-08:00","change":5,"hasOwnProperty":1}');
    const err = await check(logEntrySchema, value).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).status).toBe(400);
    expect((err as AppError).fields).toEqual({ hasOwnProperty: 'Unknown field: hasOwnProperty' });
  });
});
