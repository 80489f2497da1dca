import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { clientId, contracts } from '../helpers/contracts';
import { LogEntry } from '../../server/modules/contracts/contract-records.entity';
import { LOG_CLOCK_SKEW_MINUTES } from '../../lib/schemas/contract';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let c: ReturnType<typeof contracts>;
beforeEach(async () => {
  t = await makeTestApp();
  c = contracts(t);
});
afterEach(() => t.close());

// A real PNG: uploads are decoded and re-encoded (sharp), so a signature with filler is refused now.
let PNG: Buffer;
beforeAll(async () => {
  PNG = await sharp({ create: { width: 40, height: 30, channels: 3, background: { r: 120, g: 150, b: 70 } } }).png().toBuffer();
});
const IN = { kind: 'move', at: '2027-01-10T08:00:00-08:00', change: 600, paddock: 'North cell' };

describe('POST /api/contracts/:id/log', () => {
  it('When the grazier logs the first move in, then it is stored (201), the contract turns to grazing and the figures start', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const res = await c.log(a.grazier, a.contractId, IN);
    expect(res.status).toBe(201);
    expect(res.body.entry).toMatchObject({ kind: 'move', change: 600, author: 'grazier', authorName: 'Wade Kellner', flags: [], photos: [] });
    // 600 head × 2 days since 08:00 on Jan 10.
    expect(res.body.figures).toMatchObject({ headNow: 600, headDaysSoFar: 1200 });
    expect((await c.read(a.grower, a.contractId)).status).toBe('grazing');
  });

  it('When the same client id is sent twice, then it is stored once: 201, then 200 with the stored entry', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const body = { ...IN, clientId: clientId() };
    const first = await c.log(a.grazier, a.contractId, body);
    const replay = await c.log(a.grazier, a.contractId, body);
    expect([first.status, replay.status]).toEqual([201, 200]);
    expect(replay.body.entry.id).toBe(first.body.entry.id);
    expect(await t.dataSource.getRepository(LogEntry).countBy({ contractId: a.contractId })).toBe(1);
  });

  it('When two copies of one entry race, then one is stored and both answers carry it', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const body = { ...IN, clientId: clientId() };
    const [x, y] = await Promise.all([c.log(a.grazier, a.contractId, body), c.log(a.grazier, a.contractId, body)]);
    expect([x.status, y.status].sort()).toEqual([200, 201]);
    expect(x.body.entry.id).toBe(y.body.entry.id);
    expect(await t.dataSource.getRepository(LogEntry).countBy({ contractId: a.contractId })).toBe(1);
    // The head count was raised once, not twice.
    expect(y.body.figures.headNow).toBe(600);
  });

  it('When an entry is in the future, before the first day, or takes the head count below zero, then 400 naming at or change', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const future = await c.log(a.grazier, a.contractId, { ...IN, at: `2027-01-12T08:${String(LOG_CLOCK_SKEW_MINUTES + 1).padStart(2, '0')}:00-08:00` });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.at).toMatch(/future/);
    // Within the allowed skew of a phone's clock: accepted.
    expect((await c.log(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-12T08:04:00-08:00', note: 'Phone clock a little fast' })).status).toBe(201);
    // 23:59 on Jan 9 at the block is before the first day, although it is already Jan 10 in UTC.
    const early = await c.log(a.grazier, a.contractId, { ...IN, at: '2027-01-09T23:59:00-08:00' });
    expect(early.status).toBe(400);
    expect(early.body.error.fields.at).toMatch(/before the contract's first day, Jan 10, 2027/);
    expect((await c.log(a.grazier, a.contractId, IN)).status).toBe(201);
    const tooMany = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-01-11T08:00:00-08:00', change: -601 });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.fields.change).toMatch(/takes out 601 head, but the log has 600/);
    // A move out placed before the move in is below zero at its own time.
    const beforeIn = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-01-10T07:00:00-08:00', change: -10 });
    expect(beforeIn.status).toBe(400);
    expect(beforeIn.body.error.fields).toHaveProperty('change');
    const bad = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-01-11 08:00', change: 5 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.at).toMatch(/UTC offset/);
  });

  it('When a move out comes after the out-by date, then it is stored and flagged, never refused, and the figures warn while animals stay on', async () => {
    const a = await c.signed();
    t.setNow('2027-03-02T10:00:00-08:00');
    await c.logOk(a.grazier, a.contractId, IN);
    const page = await c.api().get(`/api/contracts/${a.contractId}/log`).set(a.grower.auth);
    expect(page.body.figures.alerts.map((x: { key: string }) => x.key)).toEqual(expect.arrayContaining(['after-out-by', 'after-end-date']));
    const out = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-03-02T09:30:00-08:00', change: -600 });
    expect(out.status).toBe(201);
    expect(out.body.entry.flags).toEqual(['After the animals-out-by date (Mar 1, 2027)']);
    const onTheDay = await c.log(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-29T09:30:00-08:00', note: 'A day over' });
    expect(onTheDay.body.entry.flags).toEqual(['After the agreed end date (Jan 28, 2027)']);
  });

  it('When the grower logs, then only observations of their own; a tally off the head count is flagged; the shape must fit the kind', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    await c.logOk(a.grazier, a.contractId, IN);
    expect((await c.log(a.grower, a.contractId, { kind: 'move', at: '2027-01-11T08:00:00-08:00', change: -10 })).status).toBe(403);
    expect((await c.log(a.grower, a.contractId, { kind: 'tally', at: '2027-01-11T08:00:00-08:00', count: 600 })).status).toBe(403);
    const note = await c.log(a.grower, a.contractId, { kind: 'observation', at: '2027-01-11T15:00:00-08:00', residualHeightIn: 3.5, note: 'Gate left open by the pump house' });
    expect(note.status).toBe(201);
    expect(note.body.entry).toMatchObject({ author: 'grower', authorName: 'Greta Olsen' });
    const losses = await c.log(a.grower, a.contractId, { kind: 'observation', at: '2027-01-11T15:00:00-08:00', losses: 1 });
    expect(losses.status).toBe(400);
    expect(losses.body.error.fields).toHaveProperty('losses');
    const tally = await c.log(a.grazier, a.contractId, { kind: 'tally', at: '2027-01-11T09:00:00-08:00', count: 597, losses: 3, note: 'Three lost to a dog' });
    expect(tally.body.entry.flags).toEqual(['Tally of 597 differs from the 600 head the moves put on the block']);
    expect(tally.body.figures.lossesSoFar).toBe(3);
    expect(tally.body.figures.alerts.map((x: { key: string }) => x.key)).toContain('losses-logged');
    const shape = await c.log(a.grazier, a.contractId, { kind: 'move', at: '2027-01-11T09:00:00-08:00', count: 5 });
    expect(shape.status).toBe(400);
    expect(Object.keys(shape.body.error.fields).sort()).toEqual(['change', 'count']);
  });

  it('When the contract is not yet signed by both, then a move is 409; a stranger gets 404 for writing and reading', async () => {
    const a = await c.awarded();
    await c.sign(a.grower, a.contractId);
    t.setNow('2027-01-12T08:00:00-08:00');
    const early = await c.log(a.grazier, a.contractId, IN);
    expect(early.status).toBe(409);
    expect(early.body.error.code).toBe('not_signed');
    const stranger = await c.grazier('Stella Stranger');
    expect((await c.log(stranger, a.contractId, IN)).status).toBe(404);
    expect((await c.api().get(`/api/contracts/${a.contractId}/log`).set(stranger.auth)).status).toBe(404);
  });
});

describe('GET /api/contracts/:id/log', () => {
  it('When the log is read, then pages of entries come newest first with a cursor, and the figures cover the whole log', async () => {
    const a = await c.signed({ block: { residualHeightIn: 3 } });
    t.setNow('2027-01-20T16:00:00-08:00');
    await c.logOk(a.grazier, a.contractId, IN);
    for (let d = 11; d <= 19; d++) {
      await c.logOk(a.grazier, a.contractId, { kind: 'observation', at: `2027-01-${d}T07:30:00-08:00`, residualHeightIn: 6 - (d - 11) * 0.4, waterChecked: true, fenceChecked: true });
    }
    await c.logOk(a.grazier, a.contractId, { kind: 'move', at: '2027-01-20T08:00:00-08:00', change: -600 });
    const seen: string[] = [];
    let cursor: string | null = null;
    let figures: Record<string, unknown> | null = null;
    do {
      const res: { status: number; body: { items: Array<{ at: string }>; nextCursor: string | null; figures: Record<string, unknown>; canWrite: string[] } } = await c
        .api()
        .get(`/api/contracts/${a.contractId}/log`)
        .query({ limit: 4, ...(cursor ? { cursor } : {}) })
        .set(a.grower.auth);
      expect(res.status).toBe(200);
      expect(res.body.canWrite).toEqual(['observation']);
      seen.push(...res.body.items.map((e) => e.at));
      figures = res.body.figures;
      cursor = res.body.nextCursor;
    } while (cursor);
    expect(seen).toHaveLength(11);
    expect([...seen].sort().reverse()).toEqual(seen);
    // 600 head for exactly 10 days. Intake: a 150 lb dry ewe at 2.5 % of body weight (NCAT ATTRA, "Grazier's Math")
    // = 3.75 lb DM a day, so 6 000 head-days eat 22 500 lb; the 80 ac block at 2 000 lb/ac stands 160 000 lb.
    expect(figures).toMatchObject({ headNow: 0, headDaysSoFar: 6000, eatenLb: 22_500, standingLb: 160_000, targetTakeLb: 72_000 });
    expect((figures!.byDay as unknown[]).length).toBe(11);
    // The last residual logged (2.8 in on Jan 19) is below the 3 in the grower asked to leave.
    expect(figures).toMatchObject({ latestResidualHeightIn: expect.closeTo(2.8, 9) });
    expect((figures!.alerts as Array<{ key: string }>).map((x) => x.key)).toEqual(['residual-below']);
  });
});

describe('photos on log entries', () => {
  it('When the author adds a photo, then it is stored and shown to both parties by a signed link; a non-image is 415, too large 413, and a stranger 404', async () => {
    const a = await c.signed();
    t.setNow('2027-01-12T08:00:00-08:00');
    const entry = await c.logOk(a.grazier, a.contractId, { kind: 'observation', at: '2027-01-11T08:00:00-08:00', note: 'Residual by the pump house' });
    const url = `/api/contracts/${a.contractId}/log/${entry.id}/photos`;
    const up = await request(t.app).post(url).set(a.grazier.auth).attach('photo', PNG, 'pump.png');
    expect(up.status).toBe(201);
    expect((await request(t.app).post(url).set(a.grazier.auth).attach('photo', Buffer.from('not an image at all'), 'x.png')).status).toBe(415);
    expect((await request(t.app).post(url).set(a.grower.auth).attach('photo', PNG, 'x.png')).status).toBe(403);
    const big = await request(t.app).post(url).set(a.grazier.auth).attach('photo', Buffer.concat([PNG, Buffer.alloc(8 * 1024 * 1024)]), 'big.png');
    expect(big.status).toBe(413);
    expect(big.body.error.fields).toHaveProperty('photo');

    const page = await c.api().get(`/api/contracts/${a.contractId}/log`).set(a.grower.auth);
    const photo = page.body.items[0].photos[0];
    const viaLink = await request(t.app).get(photo.url).buffer(true);
    expect(viaLink.status).toBe(200);
    expect(viaLink.headers['content-type']).toBe('image/png');
    const [stored] = fs.readdirSync(t.uploadsDir);
    expect(Buffer.compare(viaLink.body as Buffer, fs.readFileSync(path.join(t.uploadsDir, stored)))).toBe(0);
    const stranger = await c.grower('Sam Stranger');
    expect((await request(t.app).get(`${url}/${photo.id}`).set(stranger.auth)).status).toBe(404);
  });
});
