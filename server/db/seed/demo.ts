import crypto from 'node:crypto';
import bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import { Account } from '../../modules/accounts/account.entity';

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

/** Seeds the demo district into an empty database. Returns false when accounts already exist. */
export async function seedDemoOnce(ds: DataSource): Promise<boolean> {
  const repo = ds.getRepository(Account);
  if ((await repo.count()) > 0) return false;
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  await ds.transaction(async (tx) => {
    for (const d of DEMO_ACCOUNTS) {
      const flock = 'flock' in d ? d.flock : undefined;
      await tx.getRepository(Account).save(
        tx.getRepository(Account).create({
          id: crypto.randomUUID(),
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
  });
  return true;
}
