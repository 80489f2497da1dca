import { Writable } from 'node:stream';
import request from 'supertest';
import sharp from 'sharp';
import { loggedUrl } from '../../server/lib/http/access-log';
import { serverLogger, type LogLevel } from '../../server/lib/log';
import { loadConfig } from '../../server/config/env';
import { makeTestApp } from '../helpers/test-app';
import { market } from '../helpers/market';

// The access log (pino-http on the server's pino logger): a line per API request, with no header, body, token or
// query value in it — photo, PDF and reset links carry their secret in the query string.

/** A logger whose JSON lines land in `lines` (raw text kept too, to search for secrets). */
function collectingLogger(level: LogLevel = 'info') {
  const lines: Array<Record<string, unknown>> = [];
  const raw: string[] = [];
  const stream = new Writable({
    write(chunk, _enc, done) {
      for (const line of String(chunk).split('\n').filter(Boolean)) {
        raw.push(line);
        lines.push(JSON.parse(line));
      }
      done();
    },
  });
  return { logger: serverLogger(level, stream), lines, raw };
}

describe('loggedUrl', () => {
  it('When a URL has a query, then the log keeps the path and the parameter names only', () => {
    expect(loggedUrl('/api/blocks/b1/photos/p1?access=eyJ.secret.sig')).toEqual({ path: '/api/blocks/b1/photos/p1', query: ['access'] });
    expect(loggedUrl('/reset-password?token=abc&token=def')).toEqual({ path: '/reset-password', query: ['token'] });
    expect(loggedUrl('/api/blocks?view=market&maxMiles=150')).toEqual({ path: '/api/blocks', query: ['view', 'maxMiles'] });
    expect(loggedUrl('/api/me')).toEqual({ path: '/api/me' });
    expect(loggedUrl('/api/me?')).toEqual({ path: '/api/me' });
    // A mis-encoded link turns the token into part of a name: such names are left out.
    expect(loggedUrl('/api/invoices/i1/pdf?access%3DeyJ.secret.sig')).toEqual({ path: '/api/invoices/i1/pdf' });
  });
});

describe('the access log', () => {
  let t: Awaited<ReturnType<typeof makeTestApp>>;
  let log: ReturnType<typeof collectingLogger>;
  beforeEach(async () => {
    log = collectingLogger();
    t = await makeTestApp({ accessLogger: log.logger });
  });
  afterEach(() => t.close());

  it('When a signed-in grazier lists the market, then one info line has the method, path, parameter names, status, time and an id the answer carries', async () => {
    const m = market(t);
    const z = await m.grazier();
    log.lines.length = 0;
    const res = await request(t.app).get('/api/blocks?view=market&maxMiles=150').set(z.auth);
    expect(res.status).toBe(200);
    const line = log.lines.find((l) => (l.req as { path?: string })?.path === '/api/blocks');
    expect(line).toMatchObject({ level: 30, service: 'fieldfold', req: { method: 'GET', path: '/api/blocks', query: ['view', 'maxMiles'] }, res: { status: 200 }, responseTime: expect.any(Number) });
    expect((line!.req as { id: string }).id).toBe(res.headers['x-request-id']);
    expect(Object.keys(line!.req as object).sort()).toEqual(['id', 'method', 'path', 'query']);
  });

  it('When requests carry a bearer token, a password and a photo link token, then none of them is anywhere in the log', async () => {
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    const jpeg = await sharp({ create: { width: 20, height: 20, channels: 3, background: { r: 90, g: 140, b: 60 } } }).jpeg().toBuffer();
    const up = await request(t.app).post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', jpeg, { filename: 'a.jpg', contentType: 'image/jpeg' });
    expect(up.status).toBe(201);
    const photoToken = new URL(up.body.photo.url, 'http://x').searchParams.get('access')!;
    expect((await request(t.app).get(up.body.photo.url)).status).toBe(200);
    expect((await request(t.app).post('/api/auth/login').send({ email: g.email, password: 'long-enough-password' })).status).toBe(200);
    const text = log.raw.join('\n');
    expect(log.lines.some((l) => (l.req as { path?: string })?.path?.endsWith('/photos/' + up.body.photo.id))).toBe(true);
    for (const secret of [g.token, photoToken, 'long-enough-password', 'Bearer', 'authorization', 'cookie']) expect(text).not.toContain(secret);
  });

  it('When a request is refused or fails to find its record, then it is logged at warn; health checks are not logged', async () => {
    expect((await request(t.app).get('/api/me')).status).toBe(401);
    expect((await request(t.app).get('/api/health')).status).toBe(200);
    expect(log.lines.map((l) => [(l.req as { path: string }).path, l.level, (l.res as { status: number }).status])).toEqual([['/api/me', 40, 401]]);
  });
});

describe('LOG_LEVEL', () => {
  it('When it is not a level, then the server refuses to start with a sentence naming it; unset, it is info', () => {
    expect(() => loadConfig({ DATA_DIR: '/tmp/fieldfold-log-level-test', LOG_LEVEL: 'loud' })).toThrow(/LOG_LEVEL must be one of fatal, error, warn, info, debug, silent/);
    expect(loadConfig({ DATA_DIR: '/tmp/fieldfold-log-level-test' }).logLevel).toBe('info');
  });
});
