import fs from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import sharp from 'sharp';
import { makeTestApp, TEST_TOKENS } from '../helpers/test-app';
import { market } from '../helpers/market';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let m: ReturnType<typeof market>;
beforeEach(async () => {
  t = await makeTestApp();
  m = market(t);
});
afterEach(() => t.close());

// Real (small) images: the server judges a file by its first bytes, then decodes and re-encodes it with sharp.
let JPEG: Buffer;
let PNG: Buffer;
let WEBP: Buffer;
beforeAll(async () => {
  const pixels = () => sharp({ create: { width: 40, height: 30, channels: 3, background: { r: 120, g: 150, b: 70 } } });
  [JPEG, PNG, WEBP] = await Promise.all([pixels().jpeg().toBuffer(), pixels().png().toBuffer(), pixels().webp().toBuffer()]);
});

async function upload(auth: Record<string, string>, blockId: string, bytes: Buffer, filename = 'photo.jpg', contentType = 'image/jpeg') {
  return m.api().post(`/api/blocks/${blockId}/photos`).set(auth).attach('photo', bytes, { filename, contentType });
}

describe('POST /api/blocks/:id/photos', () => {
  it('When the owner uploads a JPEG, PNG and WebP, then each is stored under a random name and listed with a signed URL', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    for (const [bytes, type] of [[JPEG, 'image/jpeg'], [PNG, 'image/png'], [WEBP, 'image/webp']] as const) {
      const res = await upload(g.auth, b.id, bytes, 'IMG_0001.jpg', 'application/octet-stream');
      expect(res.status).toBe(201);
      expect(res.body.photo).toMatchObject({ mimeType: type, sizeBytes: expect.any(Number), url: expect.stringMatching(/^\/api\/blocks\/.+\/photos\/.+\?access=/) });
    }
    const files = fs.readdirSync(t.uploadsDir);
    expect(files).toHaveLength(3);
    // sizeBytes is the stored (re-encoded) file's size.
    const sizes = files.map((f) => fs.statSync(path.join(t.uploadsDir, f)).size).sort();
    const view0 = (await m.api().get(`/api/blocks/${b.id}`).set(g.auth)).body.block;
    expect(view0.photos.map((p: { sizeBytes: number }) => p.sizeBytes).sort()).toEqual(sizes);
    expect(files.every((f) => /^[0-9a-f]{32}\.(jpg|png|webp)$/.test(f))).toBe(true);
    const view = (await m.api().get(`/api/blocks/${b.id}`).set(g.auth)).body.block;
    expect(view.photos.map((p: { mimeType: string }) => p.mimeType)).toEqual(['image/jpeg', 'image/png', 'image/webp']);
  });

  it('When a text file is named .jpg and declared image/jpeg, then 415 names the photo field and nothing is stored', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const res = await upload(g.auth, b.id, Buffer.from('this is not a picture, just text\n'), 'block.jpg', 'image/jpeg');
    expect(res.status).toBe(415);
    expect(res.body.error).toMatchObject({ code: 'unsupported_type', fields: { photo: expect.stringMatching(/not a JPEG, PNG or WebP/) } });
    expect(fs.readdirSync(t.uploadsDir)).toEqual([]);
  });

  it('When a photo is larger than 8 MB, then 413 names the photo field', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const big = Buffer.concat([JPEG, Buffer.alloc(8 * 1024 * 1024, 0)]);
    const res = await upload(g.auth, b.id, big);
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({ code: 'too_large', fields: { photo: 'This photo is larger than 8 MB' } });
    expect(fs.readdirSync(t.uploadsDir)).toEqual([]);
  });

  it('When the file comes in another field or not at all, then 400 names the field', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const wrong = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('picture', JPEG, 'a.jpg');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields.picture).toMatch(/form field "photo"/);
    const none = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth);
    expect(none.status).toBe(400);
    expect(none.body.error.fields.photo).toMatch(/Choose a photo/);
  });

  it('When a block already has 10 photos, then the eleventh is 409', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    for (let i = 0; i < 10; i++) expect((await upload(g.auth, b.id, JPEG)).status).toBe(201);
    const res = await upload(g.auth, b.id, JPEG);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('too_many_photos');
    expect(fs.readdirSync(t.uploadsDir)).toHaveLength(10);
  });

  it('When someone else uploads, then 404 for another grower (a draft does not leak) and 403 for a grazier', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    expect((await upload((await m.grower('Other')).auth, b.id, JPEG)).status).toBe(404);
    expect((await upload((await m.grazier()).auth, b.id, JPEG)).status).toBe(403);
  });
});

describe('GET /api/blocks/:id/photos/:photoId', () => {
  it('When an <img> follows the signed URL, then the bytes come back without an Authorization header; a bearer token works too', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const photo = (await upload(g.auth, b.id, PNG)).body.photo;
    const z = await m.grazier();
    const seen = (await m.api().get(`/api/blocks/${b.id}`).set(z.auth)).body.block.photos[0];
    const viaLink = await request(t.app).get(seen.url).buffer(true);
    expect(viaLink.status).toBe(200);
    expect(viaLink.headers['content-type']).toBe('image/png');
    expect(viaLink.headers['x-content-type-options']).toBe('nosniff');
    // The stored file: the upload as sharp re-encoded it.
    const [stored] = fs.readdirSync(t.uploadsDir);
    expect(Buffer.compare(viaLink.body as Buffer, fs.readFileSync(path.join(t.uploadsDir, stored)))).toBe(0);
    const viaBearer = await m.api().get(`/api/blocks/${b.id}/photos/${photo.id}`).set(z.auth).buffer(true);
    expect(viaBearer.status).toBe(200);
  });

  it('When there is no token, a forged or expired one, or one for another photo, then 401; a photo token is no sign-in token', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    const p1 = (await upload(g.auth, b.id, JPEG)).body.photo;
    const p2 = (await upload(g.auth, b.id, PNG)).body.photo;
    const token1 = new URL(p1.url, 'http://x').searchParams.get('access')!;
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p1.id}`)).status).toBe(401);
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p2.id}?access=${token1}`)).status).toBe(401);
    const forged = jwt.sign({ typ: 'photo', pid: p1.id, bid: b.id }, 'another-secret-another-secret-another', { subject: g.user.id });
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p1.id}?access=${forged}`)).status).toBe(401);
    const expired = jwt.sign({ typ: 'photo', pid: p1.id, bid: b.id, exp: Math.floor(Date.now() / 1000) - 5 }, TEST_TOKENS.secret, { subject: g.user.id });
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p1.id}?access=${expired}`)).status).toBe(401);
    const asSignIn = await m.api().get('/api/me').set('Authorization', `Bearer ${token1}`);
    expect(asSignIn.status).toBe(401);
  });

  it('When the viewer may no longer see the block, then their link gets 404', async () => {
    const g = await m.grower();
    const b = await m.openBlock(g);
    await upload(g.auth, b.id, JPEG);
    const z = await m.grazier();
    const url = (await m.api().get(`/api/blocks/${b.id}`).set(z.auth)).body.block.photos[0].url;
    expect((await request(t.app).get(url)).status).toBe(200);
    await m.api().post(`/api/blocks/${b.id}/withdraw`).set(g.auth);
    expect((await request(t.app).get(url)).status).toBe(404);
  });

  it('When a grazier asks for a photo of a draft by bearer token, then 404', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const p = (await upload(g.auth, b.id, JPEG)).body.photo;
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p.id}`).set((await m.grazier()).auth)).status).toBe(404);
  });
});

describe('DELETE /api/blocks/:id/photos/:photoId', () => {
  it('When the owner deletes a photo, then 204, the file is gone and the photo is 404', async () => {
    const g = await m.grower();
    const b = await m.draft(g);
    const p = (await upload(g.auth, b.id, JPEG)).body.photo;
    const z = await m.grazier();
    expect((await m.api().delete(`/api/blocks/${b.id}/photos/${p.id}`).set(z.auth)).status).toBe(403);
    expect((await m.api().delete(`/api/blocks/${b.id}/photos/${p.id}`).set(g.auth)).status).toBe(204);
    expect(fs.readdirSync(t.uploadsDir)).toEqual([]);
    expect((await m.api().get(`/api/blocks/${b.id}/photos/${p.id}`).set(g.auth)).status).toBe(404);
    expect((await m.api().delete(`/api/blocks/${b.id}/photos/${p.id}`).set(g.auth)).status).toBe(404);
    expect(path.isAbsolute(t.uploadsDir)).toBe(true);
  });
});
