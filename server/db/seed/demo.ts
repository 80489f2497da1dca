import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { Account } from '../../modules/accounts/account.entity';
import { Block } from '../../modules/blocks/block.entity';
import { Bid } from '../../modules/bids/bid.entity';
import { validBlockRecord } from '../../modules/blocks/blocks.service';
import { validBidRecord } from '../../modules/bids/bids.service';
import { inTransaction } from '../../lib/db/transaction';
import type { BlockInput } from '../../../lib/schemas/block';
import type { BidInput } from '../../../lib/schemas/bid';

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

type DemoEmail = (typeof DEMO_ACCOUNTS)[number]['email'];

/**
 * The demo market is dated for the 2027 winter grazing season and checked as of this day (in the blocks'
 * zone), so it seeds the same whatever the machine's clock says. Run after spring 2027 and the windows lie in
 * the past: the market then hides them, and a fresh demo needs new dates here.
 */
export const DEMO_AS_OF = '2026-12-01';

interface DemoBlock {
  key: string;
  owner: DemoEmail;
  status: 'draft' | 'open';
  input: BlockInput;
}

// Every block and bid below passes the same checks as the API (validBlockRecord / validBidRecord), so the
// demo can never show something the product would refuse. Spray products are generic demo records, not
// real labels: their restriction days are invented.
export const DEMO_BLOCKS: DemoBlock[] = [
  {
    key: 'walnut-north-bench',
    owner: 'greta@calder.example',
    status: 'open',
    input: {
      name: 'North bench walnut middles',
      crop: 'orchard',
      acres: 80,
      placeName: 'Calder Valley, north bench',
      latitude: 39.7205,
      longitude: -121.9262,
      forageMethod: 'samples',
      // Five clips with a 50 × 50 cm quadrat: two weighed dry, three fresh with a measured dry matter %.
      forageSamples: {
        frameAreaM2: 0.25,
        samples: [{ dryGrams: 52 }, { dryGrams: 61 }, { freshGrams: 240, dryMatterPct: 22 }, { freshGrams: 265, dryMatterPct: 21 }, { freshGrams: 230, dryMatterPct: 24 }],
      },
      targetUtilizationPct: 45,
      residualHeightIn: 3,
      windowStart: '2027-01-04',
      windowEnd: '2027-03-05',
      outBy: '2027-03-01',
      harvestDate: '2027-09-20',
      sprayRecords: [{ product: 'Dormant oil (demo record)', appliedOn: '2026-12-08', grazingRestrictionDays: 14, containsCopper: false }],
      waterOnSite: true,
      perimeterFence: 'partial',
      truckAccess: true,
      speciesAllowed: ['sheep'],
      youngPlantings: false,
      notes: 'Middles only; the tree rows are berm-sprayed. Trough at the pump house. Gate code after award.',
    },
  },
  {
    key: 'almond-block-7',
    owner: 'greta@calder.example',
    status: 'open',
    input: {
      name: 'Almond block 7 middles',
      crop: 'orchard',
      acres: 42,
      placeName: 'Calder Valley, river road',
      latitude: 39.6981,
      longitude: -121.9547,
      forageMethod: 'height',
      forageHeight: { heightIn: 8, residualIn: 3, lbDmPerAcrePerInch: 275 },
      targetUtilizationPct: 40,
      residualHeightIn: 3,
      windowStart: '2027-01-11',
      windowEnd: '2027-02-12',
      // Out well before almond bloom.
      outBy: '2027-02-05',
      harvestDate: '2027-08-20',
      sprayRecords: [{ product: 'Orchard-floor herbicide (demo record)', appliedOn: '2026-12-28', grazingRestrictionDays: 30, containsCopper: false }],
      waterOnSite: false,
      perimeterFence: 'none',
      truckAccess: true,
      speciesAllowed: ['sheep', 'goats'],
      youngPlantings: false,
      notes: 'No water on the block: haul it. Bring portable electric net for the whole stay.',
    },
  },
  {
    key: 'vineyard-terrace-2',
    owner: 'tomas@calder.example',
    status: 'open',
    input: {
      name: 'Terrace 2 vineyard rows',
      crop: 'vineyard',
      acres: 36,
      placeName: 'Calder Valley, west slope',
      latitude: 39.6512,
      longitude: -122.0488,
      forageMethod: 'direct',
      lbDmPerAcre: 1800,
      targetUtilizationPct: 40,
      residualHeightIn: 3,
      windowStart: '2027-01-18',
      windowEnd: '2027-03-20',
      // Before bud break.
      outBy: '2027-03-10',
      harvestDate: '2027-09-01',
      sprayRecords: [{ product: 'Fixed copper fungicide (demo record)', appliedOn: '2026-12-15', grazingRestrictionDays: 21, containsCopper: true }],
      waterOnSite: true,
      perimeterFence: 'full',
      truckAccess: true,
      speciesAllowed: ['sheep'],
      youngPlantings: false,
      notes: 'Cover crop of barley and vetch between the rows. Trailer parks at the top gate.',
    },
  },
  {
    key: 'creekside-fallow',
    owner: 'tomas@calder.example',
    status: 'open',
    input: {
      name: 'Creekside fallow cover crop',
      crop: 'fallow',
      acres: 120,
      placeName: 'Calder Valley, creek flat',
      latitude: 39.6768,
      longitude: -122.0052,
      forageMethod: 'direct',
      lbDmPerAcre: 2600,
      targetUtilizationPct: 50,
      windowStart: '2027-01-25',
      windowEnd: '2027-03-31',
      outBy: '2027-03-31',
      sprayRecords: [],
      waterOnSite: false,
      perimeterFence: 'partial',
      truckAccess: true,
      speciesAllowed: ['sheep', 'goats'],
      youngPlantings: false,
      notes: 'Oat and pea cover going into a spring crop. The creek side is unfenced.',
    },
  },
  {
    key: 'upper-terrace-young-vines',
    owner: 'tomas@calder.example',
    status: 'draft',
    input: {
      name: 'Upper terrace young vines',
      crop: 'vineyard',
      acres: 20,
      placeName: 'Calder Valley, west slope',
      latitude: 39.6589,
      longitude: -122.0571,
      forageMethod: 'direct',
      lbDmPerAcre: 1200,
      targetUtilizationPct: 35,
      windowStart: '2027-02-01',
      windowEnd: '2027-03-01',
      outBy: '2027-02-25',
      harvestDate: '2027-09-10',
      sprayRecords: [],
      waterOnSite: true,
      perimeterFence: 'full',
      truckAccess: false,
      speciesAllowed: ['sheep'],
      youngPlantings: true,
      notes: 'Draft: second-leaf vines on the top rows need fencing off first.',
    },
  },
];

export const DEMO_BIDS: Array<{ block: string; grazier: DemoEmail; input: BidInput }> = [
  {
    block: 'walnut-north-bench',
    grazier: 'wade@calder.example',
    input: {
      basis: 'head-day',
      rate: '0.18',
      headCount: 600,
      species: 'sheep',
      animalClass: 'dry ewes',
      bodyWeightLb: 150,
      startDate: '2027-01-10',
      endDate: '2027-01-28',
      services: ['fencing', 'herding', 'guardian dogs'],
      note: 'Two guardian dogs stay with the flock; we move the net every three days.',
    },
  },
  {
    block: 'creekside-fallow',
    grazier: 'wade@calder.example',
    input: {
      basis: 'head-day',
      rate: '0.16',
      headCount: 600,
      species: 'sheep',
      animalClass: 'dry ewes',
      bodyWeightLb: 150,
      startDate: '2027-02-01',
      endDate: '2027-02-21',
      services: ['fencing', 'water hauling', 'guardian dogs'],
    },
  },
  {
    block: 'creekside-fallow',
    grazier: 'mirela@calder.example',
    input: {
      basis: 'acre',
      rate: '18.00',
      headCount: 240,
      species: 'goats',
      animalClass: 'wethers',
      bodyWeightLb: 120,
      startDate: '2027-02-01',
      endDate: '2027-03-15',
      services: ['fencing', 'water hauling', 'herding'],
      note: 'Goats will also clear the blackberry along the creek if you want it.',
    },
  },
  {
    block: 'almond-block-7',
    grazier: 'mirela@calder.example',
    input: {
      basis: 'head-day',
      rate: '0.22',
      headCount: 240,
      species: 'goats',
      animalClass: 'wethers',
      bodyWeightLb: 120,
      startDate: '2027-01-28',
      endDate: '2027-02-05',
      services: ['fencing', 'water hauling'],
    },
  },
];

/** Seeds the demo district into an empty database. Returns false when accounts already exist. */
export async function seedDemoOnce(ds: DataSource): Promise<boolean> {
  if ((await ds.getRepository(Account).count()) > 0) return false;
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  // Checked before the transaction: a demo record the API would refuse stops the seed with its reason.
  const blocks = await Promise.all(DEMO_BLOCKS.map(async (b) => ({ ...b, record: await validBlockRecord(b.input) })));
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
    const published = new Date(`${DEMO_AS_OF}T16:00:00Z`);
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
    for (const d of DEMO_BIDS) {
      const block = blockByKey.get(d.block)!;
      const record = await validBidRecord(d.input, block, DEMO_AS_OF);
      await tx.insert(Bid, { id: crypto.randomUUID(), blockId: block.id, grazierId: ids.get(d.grazier)!, status: 'live', ...record });
    }
    return true;
  });
}
