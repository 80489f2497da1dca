import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';

// helmet's headers and Fieldfold's content-security policy on API answers and on pages; CORS through `cors`.

// A page as `expo export` writes it: the hydration flag inline, the route's scripts from _expo, RNW's inline styles.
const HYDRATE = 'globalThis.__EXPO_ROUTER_HYDRATE__=true;';
const page = `<!DOCTYPE html><html><head><style id="expo-reset">#root{display:flex}</style><script type="module">${HYDRATE}</script></head><body><div style="position:absolute">x</div><script src="/_expo/static/js/web/entry-0123456789abcdef0123456789abcdef.js" defer></script></body></html>`;
const webDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-web-csp-'));
fs.writeFileSync(path.join(webDir, 'index.html'), page);
fs.writeFileSync(path.join(webDir, 'sign-in.html'), page);
fs.writeFileSync(path.join(webDir, '+not-found.html'), '<!DOCTYPE html><html><body>not here</body></html>');
afterAll(() => fs.rmSync(webDir, { recursive: true, force: true }));

/** The policy's directives as a map: name → sources. */
function directives(header: string | undefined): Record<string, string[]> {
  expect(header).toBeDefined();
  return Object.fromEntries(
    header!
      .split(';')
      .map((d) => d.trim().split(/\s+/))
      .filter((parts) => parts[0])
      .map(([name, ...sources]) => [name, sources]),
  );
}

function expectHardening(headers: Record<string, string>) {
  expect(headers['x-content-type-options']).toBe('nosniff');
  expect(headers['x-frame-options']).toBe('DENY');
  expect(headers['referrer-policy']).toBe('no-referrer');
  expect(headers['cross-origin-opener-policy']).toBe('same-origin');
  expect(headers['x-powered-by']).toBeUndefined();
  const csp = directives(headers['content-security-policy']);
  expect(csp['default-src']).toEqual(["'self'"]);
  expect(csp['connect-src']).toEqual(["'self'"]);
  expect(csp['font-src']).toEqual(["'self'"]);
  expect(csp['img-src']).toEqual(["'self'", 'data:', 'blob:']);
  expect(csp['object-src']).toEqual(["'none'"]);
  expect(csp['frame-ancestors']).toEqual(["'none'"]);
  // Styles inline (React Native Web), scripts never.
  expect(csp['style-src']).toEqual(["'self'", "'unsafe-inline'"]);
  expect(csp['script-src']).not.toContain("'unsafe-inline'");
  expect(csp['script-src']).not.toContain("'unsafe-eval'");
  return csp;
}

describe('Security headers', () => {
  it('When the API answers, then it carries the hardening headers and the policy', async () => {
    const t = await makeTestApp();
    try {
      const res = await request(t.app).get('/api/health');
      expect(res.status).toBe(200);
      const csp = expectHardening(res.headers);
      expect(csp['script-src']).toEqual(["'self'"]);
      // Plain http: no HSTS and no upgrade of subresources (localhost and the tests run without TLS).
      expect(res.headers['strict-transport-security']).toBeUndefined();
      expect(csp['upgrade-insecure-requests']).toBeUndefined();
    } finally {
      await t.close();
    }
  });

  it("When a page of the export is opened, then the policy names its inline script's hash and nothing else inline", async () => {
    const t = await makeTestApp({ webDir });
    try {
      const res = await request(t.app).get('/sign-in');
      expect(res.status).toBe(200);
      expect(res.text).toContain(HYDRATE);
      const csp = expectHardening(res.headers);
      const hash = `'sha256-${crypto.createHash('sha256').update(HYDRATE).digest('base64')}'`;
      expect(csp['script-src']).toEqual(["'self'", hash]);
      // The unknown page too.
      expectHardening((await request(t.app).get('/nowhere')).headers);
    } finally {
      await t.close();
    }
  });

  it('When PUBLIC_URL is https, then HSTS is sent and browsers are told to upgrade http subresources', async () => {
    const t = await makeTestApp({ publicUrl: 'https://fieldfold.example' });
    try {
      const res = await request(t.app).get('/api/health');
      expect(res.headers['strict-transport-security']).toMatch(/^max-age=\d{7,}; includeSubDomains$/);
      expect(directives(res.headers['content-security-policy'])['upgrade-insecure-requests']).toEqual([]);
    } finally {
      await t.close();
    }
  });
});

describe('CORS', () => {
  const devOrigin = 'http://localhost:8081';

  it('When no CORS origin is configured, then no CORS header is sent (app and API share one origin)', async () => {
    const t = await makeTestApp();
    try {
      const res = await request(t.app).get('/api/health').set('Origin', 'http://evil.example');
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
      const pre = await request(t.app).options('/api/me').set('Origin', devOrigin).set('Access-Control-Request-Method', 'GET');
      expect(pre.headers['access-control-allow-origin']).toBeUndefined();
    } finally {
      await t.close();
    }
  });

  it('When the dev server origin is configured, then a preflight from it is answered 204 naming only that origin, the methods and headers', async () => {
    const t = await makeTestApp({ corsOrigin: devOrigin });
    try {
      const pre = await request(t.app)
        .options('/api/blocks')
        .set('Origin', devOrigin)
        .set('Access-Control-Request-Method', 'PATCH')
        .set('Access-Control-Request-Headers', 'authorization,content-type');
      expect(pre.status).toBe(204);
      expect(pre.headers['access-control-allow-origin']).toBe(devOrigin);
      expect(pre.headers['access-control-allow-methods']).toBe('GET,POST,PATCH,DELETE');
      expect(pre.headers['access-control-allow-headers']).toBe('Authorization,Content-Type');
      expect(pre.headers['access-control-allow-credentials']).toBeUndefined();
      expect(pre.headers.vary).toMatch(/Origin/);

      const res = await request(t.app).get('/api/health').set('Origin', devOrigin);
      expect(res.headers['access-control-allow-origin']).toBe(devOrigin);
      expect(res.headers['access-control-expose-headers']).toMatch(/Retry-After/);
      // Another origin is never echoed back: the browser refuses it the answer.
      const other = await request(t.app).get('/api/health').set('Origin', 'http://evil.example');
      expect(other.headers['access-control-allow-origin']).toBe(devOrigin);
    } finally {
      await t.close();
    }
  });
});
