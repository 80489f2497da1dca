import { MAX_PAGE } from '../../lib/schemas/paging';
import { makeTestApp } from '../helpers/test-app';
import { market, type Person } from '../helpers/market';
import { MAX_BID_PAGE_SIZE } from '../../lib/schemas/bid';

// A block's bids and a grazier's bids come a page at a time with a total, so a busy block or a long season
// never makes one request load every bid.

let t: Awaited<ReturnType<typeof makeTestApp>>;
let m: ReturnType<typeof market>;
beforeAll(async () => {
  t = await makeTestApp();
  m = market(t);
});
afterAll(() => t.close());

describe('GET /api/blocks/:id/bids and GET /api/bids, a page at a time', () => {
  let grower: Person;
  let graziers: Person[];
  let blockId: string;
  let bidIds: string[];

  beforeAll(async () => {
    grower = await m.grower();
    blockId = (await m.openBlock(grower)).id;
    graziers = [];
    bidIds = [];
    for (let i = 0; i < 7; i++) {
      const g = await m.grazier(`Grazier ${i}`);
      graziers.push(g);
      bidIds.push((await m.bid(g, blockId, { headCount: 100 + i })).id);
    }
  });

  it('When the owner asks for pages of 3 of 7 bids, then the pages hold them oldest first, without overlap, and total counts all 7', async () => {
    const pages = [];
    for (const page of [1, 2, 3]) {
      const res = await m.api().get(`/api/blocks/${blockId}/bids?page=${page}&pageSize=3`).set(grower.auth);
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ total: 7, page, pageSize: 3 });
      pages.push(...res.body.items.map((b: { id: string }) => b.id));
    }
    const all = await m.api().get(`/api/blocks/${blockId}/bids`).set(grower.auth);
    expect(all.body).toMatchObject({ total: 7, page: 1, pageSize: 50 });
    // Oldest first; bids placed within one second (the stored time's precision) follow their ids.
    const expected = [...all.body.items].sort((a, b) => (a.createdAt < b.createdAt ? -1 : a.createdAt > b.createdAt ? 1 : a.id < b.id ? -1 : 1));
    expect(all.body.items.map((b: { id: string }) => b.id)).toEqual(expected.map((b) => b.id));
    expect(new Set(pages)).toEqual(new Set(bidIds));
    expect(pages).toEqual(expected.map((b) => b.id));
  });

  it('When a page size above the cap, an unknown parameter or a bad status is asked, then 400 names each', async () => {
    const res = await m.api().get(`/api/blocks/${blockId}/bids?pageSize=${MAX_BID_PAGE_SIZE + 1}&sort=rate&status=won`).set(grower.auth);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      pageSize: `Page size must be at most ${MAX_BID_PAGE_SIZE}`,
      sort: 'Unknown field: sort',
      status: 'Status must be one of: live, accepted, declined, withdrawn',
    });
    expect((await m.api().get('/api/bids?page=0').set(graziers[0].auth)).body.error.fields).toEqual({ page: 'Page must be 1 or more' });
    // A page past any offset the database reads was a 500 (found by the hostile-input properties).
    const far = await m.api().get('/api/bids?page=99999999999999999999').set(graziers[0].auth);
    expect({ status: far.status, fields: far.body.error.fields }).toEqual({ status: 400, fields: { page: `Page must be at most ${MAX_PAGE}` } });
  });

  it('When a grazier asks for the block\'s bids, then only their own, with a total of 1; a stranger to the block gets 404', async () => {
    const own = await m.api().get(`/api/blocks/${blockId}/bids`).set(graziers[2].auth);
    expect(own.body).toMatchObject({ total: 1 });
    expect(own.body.items.map((b: { id: string }) => b.id)).toEqual([bidIds[2]]);
    const draft = await m.draft(grower, { name: 'Not open' });
    expect((await m.api().get(`/api/blocks/${draft.id}/bids`).set(graziers[2].auth)).status).toBe(404);
  });

  it('When a grazier with bids on several blocks pages through GET /api/bids, then newest first, a status narrows them, and total counts them', async () => {
    const g = graziers[0];
    const more = [];
    for (let i = 0; i < 3; i++) {
      const b = await m.openBlock(grower, { name: `Second block ${i}` });
      more.push((await m.bid(g, b.id)).id);
    }
    await m.api().post(`/api/bids/${more[1]}/withdraw`).set(g.auth);
    const first = await m.api().get('/api/bids?pageSize=2').set(g.auth);
    expect(first.body).toMatchObject({ total: 4, page: 1, pageSize: 2 });
    const second = await m.api().get('/api/bids?pageSize=2&page=2').set(g.auth);
    const ids = [...first.body.items, ...second.body.items].map((b: { id: string }) => b.id);
    expect(new Set(ids)).toEqual(new Set([bidIds[0], ...more]));
    const created = [...first.body.items, ...second.body.items].map((b: { createdAt: string }) => b.createdAt);
    expect([...created].sort().reverse()).toEqual(created);
    const live = await m.api().get('/api/bids?status=live').set(g.auth);
    expect(live.body.total).toBe(3);
    expect(live.body.items.every((b: { status: string }) => b.status === 'live')).toBe(true);
  });
});
