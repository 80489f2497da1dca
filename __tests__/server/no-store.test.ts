import request from 'supertest';
import { makeTestApp, UNREACHED_LIMITS } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { bidBody, blockBody } from '../helpers/market';

// Every answer under /api, signed in or not, success or error, says `Cache-Control: no-store`: nothing a
// signed-in person was shown may be kept by a shared cache or read back from the browser's after sign-out.

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp({ rateLimits: { limits: { ...UNREACHED_LIMITS, writesPerCaller: { limit: 40, windowMs: 60_000 } } } });
});
afterEach(() => t.close());

describe('Cache-Control on the API', () => {
  it('When any signed-in JSON route answers, with success or with an error, then it is no-store', async () => {
    const c = contracts(t);
    const a = await c.signed();
    const other = await c.grower('Someone Else');
    const api = () => request(t.app);
    const answers: Array<[string, request.Response]> = [
      ['me', await api().get('/api/me').set(a.grower.auth)],
      ['profile', await api().patch('/api/me').set(a.grower.auth).send({ name: 'Greta Olsen' })],
      ['blocks', await api().get('/api/blocks').set(a.grower.auth)],
      ['block', await api().get(`/api/blocks/${a.block.id}`).set(a.grower.auth)],
      ['block POST', await api().post('/api/blocks').set(a.grower.auth).send(blockBody())],
      ['bids of a block', await api().get(`/api/blocks/${a.block.id}/bids`).set(a.grower.auth)],
      ['my bids', await api().get('/api/bids').set(a.grazier.auth)],
      ['contracts', await api().get('/api/contracts').set(a.grazier.auth)],
      ['contract', await api().get(`/api/contracts/${a.contractId}`).set(a.grazier.auth)],
      ['log', await api().get(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth)],
      ['invoices', await api().get('/api/invoices').set(a.grazier.auth)],
      ['400 bad body', await api().post(`/api/blocks/${a.block.id}/bids`).set(a.grazier.auth).send(bidBody({ headCount: -1 }))],
      ['400 bad JSON', await api().post('/api/blocks').set(a.grower.auth).set('Content-Type', 'application/json').send('{nope')],
      ['401 no token', await api().get('/api/me')],
      ['403 wrong role', await api().post('/api/blocks').set(a.grazier.auth).send(blockBody())],
      ['404 another grower', await api().get(`/api/contracts/${a.contractId}`).set(other.auth)],
      ['404 no route', await api().get('/api/no-such-thing').set(a.grower.auth)],
      ['404 bare /api', await api().get('/api')],
      ['409 conflict', await api().post(`/api/blocks/${a.block.id}/publish`).set(a.grower.auth)],
      ['413 too large', await api().post('/api/blocks').set(a.grower.auth).set('Content-Type', 'application/json').send(JSON.stringify({ name: 'x'.repeat(300_000) }))],
      ['health', await api().get('/api/health')],
      ['calculator', await api().post('/api/calc/charge').send({ basis: 'flat', rate: '1.00' })],
      ['webhook without signature', await api().post('/api/webhooks/payments').set('Content-Type', 'application/json').send('{}')],
    ];
    // And the 429 of a spent write limit.
    let limited: request.Response | null = null;
    for (let i = 0; i < 50 && !limited; i++) {
      const res = await api().patch('/api/me').set(a.grazier.auth).send({ name: 'Wade Kellner' });
      if (res.status === 429) limited = res;
    }
    answers.push(['429 limited', limited!]);
    const statuses = Object.fromEntries(answers.map(([name, res]) => [name, res.status]));
    expect(statuses).toMatchObject({ '401 no token': 401, '403 wrong role': 403, '404 another grower': 404, '404 bare /api': 404, '409 conflict': 409, '413 too large': 413, '429 limited': 429 });
    for (const [name, res] of answers) {
      expect({ name, type: res.headers['content-type'] }).toEqual({ name, type: expect.stringMatching(/^application\/json/) });
      expect({ name, cache: res.headers['cache-control'] }).toEqual({ name, cache: 'no-store' });
    }
  });
});
