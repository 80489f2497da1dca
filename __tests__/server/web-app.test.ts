import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { precompress } from '../../scripts/web/precompress';

// A small export laid out as `expo export` writes it, compressed by the build's own step.
const webDir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-web-'));
const page = (name: string) => `<!DOCTYPE html><html><head><title>${name}</title></head><body>${`<div class="r-x">${name}</div>`.repeat(60)}</body></html>`;
const files: Record<string, string> = {
  'index.html': page('home'),
  'sign-in.html': page('sign-in'),
  '+not-found.html': page('not-found'),
  'blocks/new.html': page('new block'),
  'blocks/[blockId].html': page('block frame'),
  'blocks/[blockId]/bid.html': page('bid frame'),
  '(app)/index.html': page('group copy'),
  '_expo/static/js/web/entry-0123456789abcdef0123456789abcdef.js': `globalThis.fieldfold=${JSON.stringify('x'.repeat(4000))};`.repeat(3),
  'assets/assets/fonts/web/PublicSans_400Regular.0123456789abcdef0123456789abcdef.woff2': 'wOF2-not-really',
  'sw.js': `self.addEventListener('fetch', () => {}); // ${'padding '.repeat(100)}`,
  'manifest.webmanifest': JSON.stringify({ name: 'Fieldfold', icons: Array.from({ length: 30 }, (_, i) => ({ src: `/icons/${i}.png` })) }),
};
for (const [file, text] of Object.entries(files)) {
  fs.mkdirSync(path.dirname(path.join(webDir, file)), { recursive: true });
  fs.writeFileSync(path.join(webDir, file), text);
}
precompress(webDir);

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp({ webDir });
});
afterAll(async () => {
  await t.close();
  fs.rmSync(webDir, { recursive: true, force: true });
});

const get = (p: string, encodings = 'br, gzip') => request(t.app).get(p).set('Accept-Encoding', encodings);
const size = (file: string) => String(fs.statSync(path.join(webDir, file)).size);

describe('Serving the exported web app', () => {
  const script = '/_expo/static/js/web/entry-0123456789abcdef0123456789abcdef.js';

  it('When the browser accepts brotli, then a hashed script is the .br file written at build time, cached a year, immutable', async () => {
    const res = await get(script);
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(res.headers['content-length']).toBe(size(`${script}.br`));
    expect(res.headers['content-type']).toMatch(/javascript/);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(res.headers.vary).toMatch(/Accept-Encoding/);
  });

  it('When the browser accepts only gzip, or nothing, then it gets the .gz file, or the plain one', async () => {
    const gz = await get(script, 'gzip');
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.headers['content-length']).toBe(size(`${script}.gz`));
    const plain = await get(script, 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.headers['content-length']).toBe(size(script));
  });

  it('When a font is asked for, then it is cached a year too, and sent as stored (WOFF2 is compressed already)', async () => {
    const res = await get('/assets/assets/fonts/web/PublicSans_400Regular.0123456789abcdef0123456789abcdef.woff2');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it("When a page is opened, including a deep link with an id, then its route's HTML comes compressed and never cached by a shared cache", async () => {
    for (const [p, name, file] of [
      ['/', 'home', 'index.html'],
      ['/sign-in', 'sign-in', 'sign-in.html'],
      ['/blocks/new', 'new block', 'blocks/new.html'],
      ['/blocks/42', 'block frame', 'blocks/[blockId].html'],
      ['/blocks/42/', 'block frame', 'blocks/[blockId].html'],
      ['/blocks/42/bid', 'bid frame', 'blocks/[blockId]/bid.html'],
    ]) {
      const res = await get(p);
      expect({ p, status: res.status, encoding: res.headers['content-encoding'], length: res.headers['content-length'] }).toEqual({ p, status: 200, encoding: 'br', length: size(`${file}.br`) });
      expect(res.headers['cache-control']).toBe('private, no-cache');
      expect(res.headers['content-type']).toMatch(/text\/html/);
      expect(res.text).toContain(`<title>${name}</title>`);
    }
  });

  it('When a path matches no screen, then the 404 page answers with status 404', async () => {
    const res = await get('/blocks/42/nothing-here');
    expect(res.status).toBe(404);
    expect(res.text).toContain('<title>not-found</title>');
    expect((await get('/(app)')).status).toBe(404);
  });

  it('When the service worker and the manifest are fetched, then the browser revalidates them every time', async () => {
    const sw = await get('/sw.js');
    expect(sw.status).toBe(200);
    expect(sw.headers['cache-control']).toBe('no-cache');
    expect(sw.headers['content-type']).toMatch(/javascript/);
    const manifest = await get('/manifest.webmanifest');
    expect(manifest.headers['cache-control']).toBe('no-cache');
    expect(manifest.headers['content-type']).toMatch(/application\/manifest\+json/);
  });

  it('When the API answers, then it is compressed per request, never stored by any cache, and a missing API route stays JSON', async () => {
    const moves = Array.from({ length: 60 }, (_, i) => ({ at: new Date(Date.UTC(2027, 0, 1) + i * 6 * 3600_000).toISOString(), change: i % 2 === 0 ? 50 : -20 }));
    const res = await request(t.app).post('/api/calc/head-days').set('Accept-Encoding', 'br, gzip').send({ moves, until: '2027-02-15T00:00:00Z', timeZone: 'America/Los_Angeles' });
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(res.headers['cache-control']).toBe('no-store');
    const missing = await get('/api/no-such-thing');
    expect(missing.status).toBe(404);
    expect(missing.headers['cache-control']).toBe('no-store');
    expect(missing.body.error.code).toBe('not_found');
  });
});

describe('Serving a single-output export', () => {
  it('When the export is one index.html, then every page path gets it (the router runs in the browser)', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fieldfold-web-single-'));
    fs.writeFileSync(path.join(dir, 'index.html'), page('single'));
    const single = await makeTestApp({ webDir: dir });
    try {
      const res = await request(single.app).get('/blocks/42');
      expect(res.status).toBe(200);
      expect(res.text).toContain('<title>single</title>');
    } finally {
      await single.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
