import request from 'supertest';
import { makeTestApp, TEST_NOW } from '../helpers/test-app';
import { DEMO_PASSWORD, demoMarket, demoStays, demoToday, seedDemoOnce } from '../../server/db/seed/demo';
import { Block } from '../../server/modules/blocks/block.entity';
import { Bid } from '../../server/modules/bids/bid.entity';
import { forageFromHeight, forageFromSamples } from '../../lib/grazing/forage';
import { addDaysToKey, localDateKey, parseIsoInstant } from '../../lib/dates';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(() => t.close());

async function signIn(email: string) {
  const res = await request(t.app).post('/api/auth/login').send({ email, password: DEMO_PASSWORD });
  return { Authorization: `Bearer ${res.body.token}` };
}

const LA = 'America/Los_Angeles';
const today = demoToday(TEST_NOW);

describe('the Calder Valley demo seed', () => {
  it('When seeded twice, then the second run changes nothing', async () => {
    expect(await seedDemoOnce(t.dataSource, TEST_NOW)).toBe(true);
    expect(await seedDemoOnce(t.dataSource, TEST_NOW)).toBe(false);
    expect(await t.dataSource.getRepository(Block).count()).toBe(demoMarket(today).blocks.length + demoStays(today).length);
    expect(await t.dataSource.getRepository(Bid).countBy({ status: 'live' })).toBe(4);
  });

  it('When a newcomer grazier signs in, then they see a live market of open blocks near them, starting after today, with cautions and days of feed', async () => {
    await seedDemoOnce(t.dataSource, TEST_NOW);
    const res = await request(t.app).get('/api/blocks').set(await signIn('wade@calder.example'));
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(4);
    for (const b of res.body.items) {
      expect(b.acres).toBeGreaterThanOrEqual(20);
      expect(b.acres).toBeLessThanOrEqual(120);
      expect(b.lbDmPerAcre).toBeGreaterThanOrEqual(1200);
      expect(b.lbDmPerAcre).toBeLessThanOrEqual(3000);
      expect(b.windowStart > today && b.outBy <= addDaysToKey(today, 120)).toBe(true);
      expect(b.distanceMiles).toBeLessThan(20);
      expect(b.daysForMyFlock).toBeGreaterThan(0);
    }
    const vineyard = res.body.items.find((b: { crop: string }) => b.crop === 'vineyard');
    expect(vineyard.cautions.map((c: { key: string }) => c.key)).toContain('copper-sheep');
    // Wade already bid on two blocks; the others invite a bid.
    expect(res.body.items.filter((b: { viewer: { myLiveBidId: string | null } }) => b.viewer.myLiveBidId).length).toBe(2);
  });

  it('When a grower signs in, then their blocks show live bids to compare, normalised, with the graziers’ record of finished contracts', async () => {
    await seedDemoOnce(t.dataSource, TEST_NOW);
    const auth = await signIn('tomas@calder.example');
    const mine = await request(t.app).get('/api/blocks').set(auth);
    const fallow = mine.body.items.find((b: { name: string }) => b.name === 'Creekside fallow cover crop');
    expect(fallow.liveBidCount).toBe(2);
    const bids = await request(t.app).get(`/api/blocks/${fallow.id}/bids`).set(auth);
    expect(bids.body.items.map((b: { basis: string }) => b.basis).sort()).toEqual(['acre', 'head-day']);
    expect(bids.body.items.every((b: { normalised: { estimatedTotalCents: number } }) => b.normalised.estimatedTotalCents > 0)).toBe(true);
    const record = Object.fromEntries(bids.body.items.map((b: { grazier: { name: string; completedContracts: number } }) => [b.grazier.name, b.grazier.completedContracts]));
    expect(record).toEqual({ 'Wade Kellner': 2, 'Mirela Haas': 1 });
  });

  it('When the demo stores forage from samples or height, then the figure is the lib result', async () => {
    await seedDemoOnce(t.dataSource, TEST_NOW);
    for (const d of demoMarket(today).blocks) {
      const stored = await t.dataSource.getRepository(Block).findOneByOrFail({ name: d.input.name });
      if (d.input.forageSamples) expect(stored.lbDmPerAcre).toBe(forageFromSamples(d.input.forageSamples).lbDmPerAcre);
      if (d.input.forageHeight) expect(stored.lbDmPerAcre).toBe(forageFromHeight(d.input.forageHeight).lbDmPerAcre);
    }
  });

  it('When Wade signs in, then he has last season’s agreed contracts with full logs and one flock grazing now, logged up to yesterday', async () => {
    await seedDemoOnce(t.dataSource, TEST_NOW);
    const auth = await signIn('wade@calder.example');
    const list = await request(t.app).get('/api/contracts').set(auth);
    const byStatus = (s: string) => list.body.items.filter((c: { status: string }) => c.status === s);
    expect(byStatus('agreed')).toHaveLength(2);
    expect(byStatus('grazing')).toHaveLength(1);

    for (const c of byStatus('agreed')) {
      const log = await request(t.app).get(`/api/contracts/${c.id}/log?limit=100`).set(auth);
      expect(log.status).toBe(200);
      expect(log.body.items.length).toBeGreaterThanOrEqual(10);
      expect(log.body.figures.headNow).toBe(0);
      // The agreed figure is what the log gives, or the grower's counter the grazier accepted.
      expect(c.signOff.status).toBe('agreed');
      expect(c.agreedHeadDays).toBe(c.signOff.agreedHeadDays);
      expect(c.signOff.proposedHeadDays).toBe(log.body.figures.headDaysSoFar);
      if (c.signOff.agreedBy === 'grazier') expect(c.agreedHeadDays).toBe(c.signOff.counterHeadDays);
      expect(c.signatures).toHaveLength(2);
      expect(log.body.items.every((e: { flags: string[] }) => !e.flags.some((f) => f.startsWith('After the animals-out-by')))).toBe(true);
    }

    const [now] = byStatus('grazing');
    const log = await request(t.app).get(`/api/contracts/${now.id}/log?limit=100`).set(auth);
    const days = log.body.items.map((e: { at: string }) => localDateKey(parseIsoInstant(e.at)!, LA));
    expect(days[0]).toBe(addDaysToKey(today, -1));
    expect(days.every((d: string) => d < today)).toBe(true);
    expect(log.body.figures.headNow).toBe(598);
    expect(log.body.figures.headDaysSoFar).toBeGreaterThan(3000);
    expect(log.body.canWrite).toEqual(['move', 'tally', 'observation']);
    expect(log.body.items.some((e: { author: string }) => e.author === 'grower')).toBe(true);
  });

  it('When Mirela signs in, then one contract waits for her signature, already signed by the grower', async () => {
    await seedDemoOnce(t.dataSource, TEST_NOW);
    const list = await request(t.app).get('/api/contracts?status=to-sign').set(await signIn('mirela@calder.example'));
    expect(list.body.items).toHaveLength(1);
    expect(list.body.items[0]).toMatchObject({ viewer: { party: 'grazier', mustSign: true }, signatures: [{ party: 'grower', typedName: 'Tomás Reyes' }] });
  });

  it('When the demo is seeded on another day, then its market and its grazing contract move with it: it never empties itself', async () => {
    const later = TEST_NOW + 400 * 86_400_000;
    t.setNow(new Date(later).toISOString());
    await seedDemoOnce(t.dataSource, later);
    const auth = await signIn('wade@calder.example');
    const market = await request(t.app).get('/api/blocks').set(auth);
    expect(market.body.total).toBe(4);
    const list = await request(t.app).get('/api/contracts?status=grazing').set(auth);
    const log = await request(t.app).get(`/api/contracts/${list.body.items[0].id}/log`).set(auth);
    expect(localDateKey(parseIsoInstant(log.body.items[0].at)!, LA)).toBe(addDaysToKey(demoToday(later), -1));
  });
});
