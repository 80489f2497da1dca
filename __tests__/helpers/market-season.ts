import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { Account } from '../../server/modules/accounts/account.entity';
import { Block } from '../../server/modules/blocks/block.entity';
import { BlockPhoto } from '../../server/modules/blocks/block-photo.entity';
import { Bid } from '../../server/modules/bids/bid.entity';
import { validBlockRecord } from '../../server/modules/blocks/blocks.service';
import { addDays } from '../../lib/day-keys';
import type { BlockStatus } from '../../lib/schemas/block';

// An invented season of a few hundred varied blocks, written straight into the test database through the
// same record builder POST /api/blocks uses (so every stored figure is what the service stores). It is
// built to hit the market's edges: equal names in different cases and accents, equal acres, equal
// coordinates, equal creation times, windows that end today or tomorrow in zones from UTC−11 to UTC+14,
// spray restrictions that cover the whole window, points across the antimeridian and near a pole.

/** Deterministic pseudo-random numbers (mulberry32), so a failing case can be rerun. */
export function prng(seed: number) {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)];
  const int = (lo: number, hi: number) => lo + Math.floor(next() * (hi - lo + 1));
  return { next, pick, int };
}

const NAMES = [
  'North bench walnut',
  'north bench walnut',
  'North Bench Walnut',
  'Éclair orchard',
  'eclair orchard',
  'Eclair Orchard',
  'Zinfandel rows',
  'almond middles 3',
  'Almond middles 12',
  'Almond middles 2',
  "O'Neil fallow",
  'Oneil fallow',
  'river flat cover',
  'River-flat cover',
  'Ünterberg vines',
  'Apple block',
  'apple block',
  'terrace 9',
  'Terrace 10',
  'ßtraße pasture',
];

export const SEASON_ZONES = [
  'America/Los_Angeles',
  'America/Denver',
  'America/New_York',
  'Pacific/Pago_Pago', // UTC−11
  'Pacific/Honolulu',
  'Europe/London',
  'Asia/Tokyo',
  'Pacific/Auckland',
  'Pacific/Kiritimati', // UTC+14
] as const;

/** Where the season's graziers keep their flocks; the blocks cluster round the first. */
export const HOMES = {
  calder: { latitude: 39.801, longitude: -121.876 },
  // Fiji straddles the antimeridian: a distance filter there must look on both sides of ±180°.
  fiji: { latitude: -17.8, longitude: 179.95 },
  svalbard: { latitude: 78.2, longitude: 15.6 },
};

const FAR_POINTS = [
  { latitude: -17.75, longitude: -179.9 },
  { latitude: -17.9, longitude: 179.7 },
  { latitude: -18.2, longitude: 178.4 },
  { latitude: -41.3, longitude: 174.8 },
  { latitude: 64.84, longitude: -147.72 },
  { latitude: 79.9, longitude: -150.1 },
  { latitude: 78.9, longitude: 11.9 },
  { latitude: 39.801, longitude: -121.876 },
];

export interface SeasonPeople {
  growers: Account[];
  graziers: Account[];
  /** Graziers and the account with both roles, each with a different profile (home base, flock, or none). */
  viewers: Account[];
}

async function account(ds: DataSource, hash: string, n: number, over: Partial<Account>): Promise<Account> {
  const a = ds.getRepository(Account).create({
    id: crypto.randomUUID(),
    email: `season-${n}@test.example`,
    passwordHash: hash,
    name: `Season person ${n}`,
    roles: 'grazier',
    activeRole: null,
    businessName: null,
    phone: null,
    homePlace: null,
    homeLatitude: null,
    homeLongitude: null,
    flockSpecies: null,
    flockClass: null,
    flockHeadCount: null,
    flockBodyWeightLb: null,
    ...over,
  });
  await ds.getRepository(Account).insert(a);
  return ds.getRepository(Account).findOneByOrFail({ id: a.id });
}

export async function seedSeasonPeople(ds: DataSource): Promise<SeasonPeople> {
  const hash = await bcrypt.hash('season-password', 4);
  let n = 0;
  const make = (over: Partial<Account>) => account(ds, hash, ++n, over);
  const growers = [];
  for (let i = 0; i < 6; i++) growers.push(await make({ roles: 'grower', name: `Season grower ${i}` }));
  const home = (h: { latitude: number; longitude: number }) => ({ homeLatitude: h.latitude, homeLongitude: h.longitude, homePlace: 'Yards' });
  const flock = (species: string, animalClass: string, headCount: number, bodyWeightLb: number) => ({
    flockSpecies: species,
    flockClass: animalClass,
    flockHeadCount: headCount,
    flockBodyWeightLb: bodyWeightLb,
  });
  const graziers = [
    await make({ ...home(HOMES.calder), ...flock('sheep', 'dry ewes', 600, 150) }),
    await make({ ...home(HOMES.calder), ...flock('sheep', 'ewes with lambs', 350, 165.5) }),
    await make({ ...home({ latitude: 38.9, longitude: -121.2 }), ...flock('goats', 'wethers', 240, 120) }),
    await make({ ...home({ latitude: 40.6, longitude: -122.7 }), ...flock('mixed', 'mixed', 1, 95) }),
    await make({ ...home(HOMES.fiji), ...flock('sheep', 'weaned lambs', 7, 80) }),
    await make({ ...home(HOMES.svalbard), ...flock('goats', 'does', 19999, 400) }),
    await make({ ...home(HOMES.calder) }), // a home base and no flock
    await make({ ...flock('sheep', 'dry ewes', 1200, 140) }), // a flock and no home base
    await make({}), // neither
  ];
  // Both roles: owns blocks and browses the market as whichever role is active.
  const both = await make({ roles: 'grazier,grower', activeRole: 'grazier', ...home(HOMES.calder), ...flock('goats', 'does with kids', 180, 110) });
  const bothAsGrower = await make({ roles: 'grazier,grower', activeRole: 'grower', ...home(HOMES.calder), ...flock('sheep', 'dry ewes', 500, 150) });
  growers.push(both, bothAsGrower);
  return { growers, graziers, viewers: [...graziers, both, bothAsGrower, growers[0]] };
}

/** One varied block body, valid by the shared schema. */
export function seasonBlockBody(r: ReturnType<typeof prng>, i: number): Record<string, unknown> {
  // Windows from October to April round the tests' clock (1 Dec 2026); one in five ends within a day of it.
  const nearToday = r.next() < 0.2;
  let windowStart: string;
  let windowEnd: string;
  let outBy: string;
  if (nearToday) {
    windowStart = addDays('2026-11-20', r.int(0, 9));
    const last = r.pick(['2026-11-30', '2026-12-01', '2026-12-02', '2026-12-03']);
    if (r.next() < 0.5) {
      windowEnd = last;
      outBy = addDays(last, r.int(0, 20));
    } else {
      outBy = last;
      windowEnd = addDays(last, r.int(0, 20));
    }
    if (windowEnd <= windowStart) windowEnd = addDays(windowStart, 1);
    if (outBy <= windowStart) outBy = addDays(windowStart, 1);
  } else {
    windowStart = addDays('2026-10-01', r.int(0, 180));
    windowEnd = addDays(windowStart, r.int(1, 120));
    outBy = addDays(windowStart, r.int(1, 130));
  }
  const harvestDate = r.next() < 0.3 ? null : addDays(outBy, r.int(1, 200));
  const sprayRecords = Array.from({ length: r.pick([0, 0, 0, 1, 1, 2, 3]) }, (_, k) => ({
    product: `Spray ${k}`,
    appliedOn: addDays(windowStart, r.int(-60, 30)),
    grazingRestrictionDays: r.pick([0, 7, 14, 21, 30, 45, 60, 120]),
    containsCopper: r.next() < 0.2,
  }));
  const far = r.next() < 0.12;
  const point = far
    ? r.pick(FAR_POINTS)
    : r.next() < 0.1
      ? { latitude: 39.7205, longitude: -121.9262 } // many blocks on one spot: equal distances
      : { latitude: Number((39.8 + (r.next() - 0.5) * 6).toFixed(4)), longitude: Number((-121.9 + (r.next() - 0.5) * 8).toFixed(4)) };
  const forage = r.pick(['direct', 'direct', 'samples', 'height'] as const);
  const forageFields =
    forage === 'direct'
      ? { lbDmPerAcre: r.pick([800, 1500, 2000, 2000, 2600, 3100.5, 29_000]) }
      : forage === 'samples'
        ? { forageSamples: { frameAreaM2: r.pick([0.1, 0.25, 1]), samples: Array.from({ length: r.int(1, 4) }, () => ({ dryGrams: r.int(5, 90) + r.pick([0, 0.5]) })) } }
        : { forageHeight: { heightIn: r.int(5, 18), residualIn: r.int(1, 4), lbDmPerAcrePerInch: r.pick([150, 200, 250.5]) } };
  return {
    name: r.next() < 0.7 ? r.pick(NAMES) : `${r.pick(NAMES)} ${i}`,
    crop: r.pick(['orchard', 'vineyard', 'row-crop cover', 'fallow', 'pasture', 'other']),
    acres: r.pick([5, 10, 12.5, 20, 36, 40, 80, 80, 120, 300.25, 1000, 0.5]),
    placeName: r.next() < 0.5 ? null : 'Somewhere invented',
    ...point,
    timeZone: r.pick(SEASON_ZONES),
    forageMethod: forage,
    ...forageFields,
    targetUtilizationPct: r.pick([35, 40, 45, 50, 60, 100]),
    windowStart,
    windowEnd,
    outBy,
    harvestDate,
    sprayRecords,
    waterOnSite: r.next() < 0.5,
    perimeterFence: r.pick(['none', 'partial', 'full']),
    truckAccess: r.next() < 0.7,
    speciesAllowed: r.pick([['sheep'], ['goats'], ['sheep', 'goats'], ['goats', 'sheep']]),
    youngPlantings: r.next() < 0.2,
  };
}

/** Inserts `count` blocks (mostly open) owned by the season's growers, with a few photos and live bids. */
export async function seedSeasonBlocks(ds: DataSource, people: SeasonPeople, count: number, seed = 20261201): Promise<Block[]> {
  const r = prng(seed);
  const repo = ds.getRepository(Block);
  const base = Date.parse('2026-11-01T08:00:00Z');
  const ids: string[] = [];
  for (let i = 0; i < count; i++) {
    const body = seasonBlockBody(r, i);
    const record = await validBlockRecord(body).catch((err) => {
      throw new Error(`season block ${i} is invalid: ${JSON.stringify(err.fields ?? err.message)} ${JSON.stringify(body)}`);
    });
    const status: BlockStatus = r.next() < 0.8 ? 'open' : r.pick(['draft', 'awarded', 'withdrawn', 'closed'] as const);
    // Creation times on whole minutes now and then, so "newest" meets ties.
    const createdAt = new Date(r.next() < 0.3 ? base + r.int(0, 40) * 60_000 : base + r.int(0, 2_400_000) * 1000 + r.int(0, 999));
    const id = crypto.randomUUID();
    await repo.insert({
      id,
      ownerId: r.pick(people.growers).id,
      status,
      ...record,
      publishedAt: status === 'draft' ? null : createdAt,
      createdAt,
      updatedAt: createdAt,
    });
    ids.push(id);
  }
  const blocks = await repo.find();
  for (const b of blocks.slice(0, 12)) {
    await ds.getRepository(BlockPhoto).insert({ id: crypto.randomUUID(), blockId: b.id, fileName: `${crypto.randomUUID()}.jpg`, mimeType: 'image/jpeg', sizeBytes: 1000, position: 0 });
  }
  // A few live bids, so "my live bid" and the owner's live-bid count show in the views.
  const open = blocks.filter((b) => b.status === 'open');
  for (let k = 0; k < 40 && k < open.length; k++) {
    const block = open[(k * 7) % open.length];
    const grazier = people.graziers[k % people.graziers.length];
    await ds
      .getRepository(Bid)
      .createQueryBuilder()
      .insert()
      .values({
        id: crypto.randomUUID(),
        blockId: block.id,
        grazierId: grazier.id,
        status: 'live',
        basis: 'head-day',
        rate: '0.18',
        headCount: 100,
        species: 'sheep',
        animalClass: 'dry ewes',
        bodyWeightLb: 150,
        startDate: block.windowStart,
        endDate: addDays(block.windowStart, 1),
        services: [],
        note: null,
      })
      .orIgnore()
      .execute();
  }
  return blocks;
}
