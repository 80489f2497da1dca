import request from 'supertest';
import { makeTestApp } from '../helpers/test-app';
import { DEMO_BLOCKS, DEMO_PASSWORD, seedDemoOnce } from '../../server/db/seed/demo';
import { Block } from '../../server/modules/blocks/block.entity';
import { Bid } from '../../server/modules/bids/bid.entity';
import { forageFromHeight, forageFromSamples } from '../../lib/grazing/forage';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

async function signIn(email: string) {
  const res = await request(t.app).post('/api/auth/login').send({ email, password: DEMO_PASSWORD });
  return { Authorization: `Bearer ${res.body.token}` };
}

describe('the Calder Valley demo seed', () => {
  it('When seeded twice, then the second run changes nothing', async () => {
    expect(await seedDemoOnce(t.dataSource)).toBe(true);
    expect(await seedDemoOnce(t.dataSource)).toBe(false);
    expect(await t.dataSource.getRepository(Block).count()).toBe(DEMO_BLOCKS.length);
    expect(await t.dataSource.getRepository(Bid).countBy({ status: 'live' })).toBe(4);
  });

  it('When a newcomer grazier signs in, then they see a live market of open blocks near them, with cautions and days of feed', async () => {
    await seedDemoOnce(t.dataSource);
    const res = await request(t.app).get('/api/blocks').set(await signIn('wade@calder.example'));
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(4);
    for (const b of res.body.items) {
      expect(b.acres).toBeGreaterThanOrEqual(20);
      expect(b.acres).toBeLessThanOrEqual(120);
      expect(b.lbDmPerAcre).toBeGreaterThanOrEqual(1200);
      expect(b.lbDmPerAcre).toBeLessThanOrEqual(3000);
      expect(b.windowStart >= '2027-01-01' && b.outBy <= '2027-03-31').toBe(true);
      expect(b.distanceMiles).toBeLessThan(20);
      expect(b.daysForMyFlock).toBeGreaterThan(0);
    }
    const vineyard = res.body.items.find((b: { crop: string }) => b.crop === 'vineyard');
    expect(vineyard.cautions.map((c: { key: string }) => c.key)).toContain('copper-sheep');
    // Wade already bid on two blocks; the others invite a bid.
    expect(res.body.items.filter((b: { viewer: { myLiveBidId: string | null } }) => b.viewer.myLiveBidId).length).toBe(2);
  });

  it('When a grower signs in, then their blocks show live bids to compare, normalised', async () => {
    await seedDemoOnce(t.dataSource);
    const auth = await signIn('tomas@calder.example');
    const mine = await request(t.app).get('/api/blocks').set(auth);
    const fallow = mine.body.items.find((b: { name: string }) => b.name === 'Creekside fallow cover crop');
    expect(fallow.liveBidCount).toBe(2);
    const bids = await request(t.app).get(`/api/blocks/${fallow.id}/bids`).set(auth);
    expect(bids.body.items.map((b: { basis: string }) => b.basis).sort()).toEqual(['acre', 'head-day']);
    expect(bids.body.items.every((b: { normalised: { estimatedTotalCents: number } }) => b.normalised.estimatedTotalCents > 0)).toBe(true);
  });

  it('When the demo stores forage from samples or height, then the figure is the lib result', async () => {
    await seedDemoOnce(t.dataSource);
    for (const d of DEMO_BLOCKS) {
      const stored = await t.dataSource.getRepository(Block).findOneByOrFail({ name: d.input.name });
      if (d.input.forageSamples) expect(stored.lbDmPerAcre).toBe(forageFromSamples(d.input.forageSamples).lbDmPerAcre);
      if (d.input.forageHeight) expect(stored.lbDmPerAcre).toBe(forageFromHeight(d.input.forageHeight).lbDmPerAcre);
    }
  });
});
