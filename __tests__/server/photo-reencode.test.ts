import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import request from 'supertest';
import sharp from 'sharp';
import { makeTestApp } from '../helpers/test-app';
import { contracts } from '../helpers/contracts';
import { market } from '../helpers/market';
import { MAX_INPUT_PIXELS, MAX_PHOTO_EDGE_PX } from '../../server/lib/storage/reencode-photo';

// Uploaded photos are stored as sharp re-encodes them: upright, without EXIF (GPS), within 2048 px, same type.

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

/** A phone photo: 3000 × 2000, with the camera's make and a GPS position in its EXIF, and an orientation tag. */
function phonePhoto(width = 3000, height = 2000, orientation?: number) {
  const image = sharp({ create: { width, height, channels: 3, background: { r: 96, g: 140, b: 64 } } }).withExif({
    IFD0: { Make: 'FieldPhone', Model: 'Truck Cam 2', Copyright: 'Greta Olsen' },
    IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '39/1 43/1 1380/100', GPSLongitudeRef: 'W', GPSLongitude: '121/1 55/1 3430/100' },
  });
  return (orientation ? image.withMetadata({ orientation }) : image).jpeg({ quality: 90 }).toBuffer();
}

/** The GPS IFD pointer tag (0x8825), in either byte order: present when EXIF names a position. */
const hasGpsTag = (exif: Buffer) => exif.includes(Buffer.from([0x88, 0x25])) || exif.includes(Buffer.from([0x25, 0x88]));

function storedFiles(): Buffer[] {
  return fs.readdirSync(t.uploadsDir).map((f) => fs.readFileSync(path.join(t.uploadsDir, f)));
}

/** A PNG whose header claims `width` × `height` but whose data is a few bytes: what a decompression bomb looks like. */
function pngClaiming(width: number, height: number): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(zlib.crc32(body));
    return Buffer.concat([len, body, crc]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // RGB
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', zlib.deflateSync(Buffer.alloc(1024))), chunk('IEND', Buffer.alloc(0))]);
}

describe('Re-encoding uploaded photos', () => {
  it('When a grower uploads a JPEG carrying EXIF GPS, then the stored file has no EXIF at all and fits within 2048 px', async () => {
    const original = await phonePhoto();
    const before = await sharp(original).metadata();
    expect(before.exif && hasGpsTag(before.exif)).toBe(true);

    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    const res = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', original, 'IMG_2041.jpg');
    expect(res.status).toBe(201);

    const [stored] = storedFiles();
    const meta = await sharp(stored).metadata();
    expect(meta.format).toBe('jpeg');
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(meta.iptc).toBeUndefined();
    expect(stored.includes(Buffer.from('FieldPhone'))).toBe(false);
    expect([meta.width, meta.height]).toEqual([2048, 1365]);
    expect(Math.max(meta.width!, meta.height!)).toBeLessThanOrEqual(MAX_PHOTO_EDGE_PX);
    expect(res.body.photo.sizeBytes).toBe(stored.length);
    // What the photo link serves is that file.
    const served = await request(t.app).get(res.body.photo.url).buffer(true);
    expect(Buffer.compare(served.body as Buffer, stored)).toBe(0);
  });

  it('When a photo was taken sideways (EXIF orientation 6), then it is stored upright with no orientation tag left', async () => {
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    expect((await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', await phonePhoto(600, 400, 6), 'side.jpg')).status).toBe(201);
    const meta = await sharp(storedFiles()[0]).metadata();
    expect([meta.width, meta.height, meta.orientation]).toEqual([400, 600, undefined]);
  });

  it('When a grazier adds a GPS-tagged photo to a log entry, then it is re-encoded the same way', async () => {
    const c = contracts(t);
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const entry = await c.logOk(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-11T08:00:00-08:00', note: 'Residual by the pump house' });
    const res = await request(t.app).post(`/api/contracts/${a.contractId}/log/${entry.id}/photos`).set(a.grazier.auth).attach('photo', await phonePhoto(4000, 3000), 'pump.jpg');
    expect(res.status).toBe(201);
    const meta = await sharp(storedFiles()[0]).metadata();
    expect(meta.exif).toBeUndefined();
    expect([meta.width, meta.height]).toEqual([2048, 1536]);
  });

  it('When a PNG or a WebP comes, then it stays that type; a small one is not enlarged', async () => {
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    const pixels = () => sharp({ create: { width: 300, height: 120, channels: 4, background: { r: 10, g: 90, b: 200, alpha: 0.5 } } });
    for (const [bytes, format] of [[await pixels().png().toBuffer(), 'png'], [await pixels().webp().toBuffer(), 'webp']] as const) {
      const res = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', bytes, `a.${format}`);
      expect(res.status).toBe(201);
      expect(res.body.photo.mimeType).toBe(`image/${format}`);
    }
    const metas = await Promise.all(storedFiles().map((f) => sharp(f).metadata()));
    expect(metas.map((x) => [x.format, x.width, x.height]).sort()).toEqual([
      ['png', 300, 120],
      ['webp', 300, 120],
    ]);
  });

  it('When a file starts like a JPEG but is not one, then 415 names the photo field and nothing is stored', async () => {
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    const fake = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00]), Buffer.alloc(500, 7)]);
    const res = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', fake, 'a.jpg');
    expect(res.status).toBe(415);
    expect(res.body.error).toMatchObject({ code: 'unsupported_type', fields: { photo: expect.stringMatching(/could not be read/) } });
    expect(storedFiles()).toEqual([]);
  });

  it('When a few-kB PNG claims 30 000 × 30 000 pixels (a decompression bomb), then 413 names the photo field at once, without decoding it', async () => {
    const bomb = pngClaiming(30_000, 30_000);
    expect(bomb.length).toBeLessThan(2_000);
    expect(30_000 * 30_000).toBeGreaterThan(MAX_INPUT_PIXELS);
    const m = market(t);
    const g = await m.grower();
    const b = await m.draft(g);
    const started = performance.now();
    const res = await m.api().post(`/api/blocks/${b.id}/photos`).set(g.auth).attach('photo', bomb, 'bomb.png');
    const ms = performance.now() - started;
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({ code: 'too_large', fields: { photo: expect.stringMatching(/more than 50 megapixels/) } });
    expect(ms).toBeLessThan(1_000);
    expect(storedFiles()).toEqual([]);
  });
});
