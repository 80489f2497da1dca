import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { Account } from '../../modules/accounts/account.entity';
import { Block } from '../../modules/blocks/block.entity';
import { Bid } from '../../modules/bids/bid.entity';
import { validBlockRecord } from '../../modules/blocks/blocks.service';
import { validBidRecord } from '../../modules/bids/bids.service';
import { inTransaction } from '../../lib/db/transaction';
import { todayIn } from '../../../lib/day-keys';
import { DEFAULT_TIME_ZONE } from '../../../lib/schemas/block';
import { demoMarket, type DemoEmail } from './demo-market';
import { demoStays, seedStay } from './demo-contracts';

export { demoMarket } from './demo-market';
export { demoStays } from './demo-contracts';

// The invented demo scenario: the fictional Calder Valley district, its growers and graziers.
// Names, places, flocks and figures are made up for the demo only; nothing here is a real business.
export const DEMO_PASSWORD = 'calder-valley-demo';

export const DEMO_ACCOUNTS = [
  {
    email: 'greta@calder.example',
    name: 'Greta Olsen',
    roles: 'grower',
    businessName: 'Olsen Walnut Orchard',
    phone: '+1 530 555 0142',
    homePlace: 'Calder Valley, north bench',
    homeLatitude: 39.712,
    homeLongitude: -121.934,
  },
  {
    email: 'tomas@calder.example',
    name: 'Tomás Reyes',
    roles: 'grower',
    businessName: 'Three Terraces Vineyard',
    phone: '+1 530 555 0187',
    homePlace: 'Calder Valley, west slope',
    homeLatitude: 39.655,
    homeLongitude: -122.041,
  },
  {
    email: 'wade@calder.example',
    name: 'Wade Kellner',
    roles: 'grazier',
    businessName: 'Kellner Range Sheep',
    phone: '+1 530 555 0119',
    homePlace: 'Pine Hollow corrals',
    homeLatitude: 39.801,
    homeLongitude: -121.876,
    flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 },
  },
  {
    email: 'mirela@calder.example',
    name: 'Mirela Haas',
    roles: 'grazier,grower',
    businessName: 'Haas Brush Goats',
    phone: '+1 530 555 0163',
    homePlace: 'Calder town yards',
    homeLatitude: 39.688,
    homeLongitude: -121.99,
    flock: { species: 'goats', animalClass: 'wethers', headCount: 240, bodyWeightLb: 120 },
  },
  {
    email: 'ops@calder.example',
    name: 'Fieldfold Operator',
    roles: 'admin',
  },
] as const;

// Each account above is one the market and the stays can name (checked by the compiler).
export const DEMO_EMAILS: ReadonlyArray<DemoEmail> = DEMO_ACCOUNTS.map((a) => a.email);

/** "Today" at the demo district on the seed's clock: every demo date counts from it. */
export function demoToday(nowMs: number): string {
  return todayIn(DEFAULT_TIME_ZONE, nowMs);
}

/**
 * Seeds the demo district into an empty database, dated from `nowMs` (the seed's clock): this season's
 * open market starting a month or so ahead, last season's finished contracts, one flock grazing now and
 * one contract to sign. Returns false when accounts already exist.
 */
export async function seedDemoOnce(ds: DataSource, nowMs: number = Date.now()): Promise<boolean> {
  if ((await ds.getRepository(Account).count()) > 0) return false;
  const today = demoToday(nowMs);
  const market = demoMarket(today);
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  // Checked before the transaction: a demo record the API would refuse stops the seed with its reason.
  const blocks = await Promise.all(market.blocks.map(async (b) => ({ ...b, record: await validBlockRecord(b.input) })));
  return inTransaction(ds, async (tx) => {
    // Counted again inside the queue, so two seeds started at once cannot both write.
    if ((await tx.count(Account)) > 0) return false;
    const ids = new Map<string, string>();
    for (const d of DEMO_ACCOUNTS) {
      const flock = 'flock' in d ? d.flock : undefined;
      const id = crypto.randomUUID();
      ids.set(d.email, id);
      await tx.getRepository(Account).save(
        tx.getRepository(Account).create({
          id,
          email: d.email,
          passwordHash,
          name: d.name,
          roles: d.roles,
          activeRole: d.roles.startsWith('admin') ? null : d.roles.split(',')[0],
          businessName: 'businessName' in d ? d.businessName : null,
          phone: 'phone' in d ? d.phone : null,
          homePlace: 'homePlace' in d ? d.homePlace : null,
          homeLatitude: 'homeLatitude' in d ? d.homeLatitude : null,
          homeLongitude: 'homeLongitude' in d ? d.homeLongitude : null,
          flockSpecies: flock?.species ?? null,
          flockClass: flock?.animalClass ?? null,
          flockHeadCount: flock?.headCount ?? null,
          flockBodyWeightLb: flock?.bodyWeightLb ?? null,
        }),
      );
    }
    // Last season's stays first, so the graziers' records (completed contracts) show beside their bids.
    for (const stay of demoStays(today)) await seedStay(tx, ids, stay, today, nowMs);

    const published = new Date(nowMs - 3 * 3_600_000);
    const blockByKey = new Map<string, Block>();
    for (const b of blocks) {
      const block = tx.create(Block, {
        id: crypto.randomUUID(),
        ownerId: ids.get(b.owner)!,
        status: b.status,
        publishedAt: b.status === 'open' ? published : null,
        ...b.record,
      });
      await tx.insert(Block, block);
      blockByKey.set(b.key, block);
    }
    for (const d of market.bids) {
      const block = blockByKey.get(d.block)!;
      const record = await validBidRecord(d.input, block, today);
      await tx.insert(Bid, { id: crypto.randomUUID(), blockId: block.id, grazierId: ids.get(d.grazier)!, status: 'live', ...record });
    }
    return true;
  });
}
