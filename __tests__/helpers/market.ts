import request from 'supertest';
import type { makeTestApp } from './test-app';

// Builders for the marketplace tests: a valid block and bid to vary one field at a time, and the steps a
// grower and a grazier take to reach a state.

type TestApp = Awaited<ReturnType<typeof makeTestApp>>;
export type Person = Awaited<ReturnType<TestApp['signUp']>>;

/** An 80-acre walnut block near the invented Calder Valley, open Jan–Mar 2027 (the tests' clock is 1 Dec 2026). */
export function blockBody(over: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    name: 'North bench walnut middles',
    crop: 'orchard',
    acres: 80,
    placeName: 'Calder Valley, north bench',
    latitude: 39.7205,
    longitude: -121.9262,
    forageMethod: 'direct',
    lbDmPerAcre: 2000,
    targetUtilizationPct: 45,
    windowStart: '2027-01-04',
    windowEnd: '2027-03-05',
    outBy: '2027-03-01',
    harvestDate: '2027-09-20',
    sprayRecords: [],
    waterOnSite: true,
    perimeterFence: 'partial',
    truckAccess: true,
    speciesAllowed: ['sheep', 'goats'],
    youngPlantings: false,
    ...over,
  };
}

export function bidBody(over: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    basis: 'head-day',
    rate: '0.18',
    headCount: 600,
    species: 'sheep',
    animalClass: 'dry ewes',
    bodyWeightLb: 150,
    startDate: '2027-01-10',
    endDate: '2027-01-28',
    services: ['fencing', 'guardian dogs'],
    ...over,
  };
}

export function market(t: TestApp) {
  const api = () => request(t.app);

  async function grower(name = 'Greta Grower') {
    return t.signUp(['grower'], name);
  }

  /** A grazier with a home base (default near Calder Valley) and a flock, as the profile screen saves them. */
  async function grazier(
    name = 'Wade Grazier',
    profile: Record<string, unknown> = {
      homePlace: 'Pine Hollow corrals',
      homeLatitude: 39.801,
      homeLongitude: -121.876,
      flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 },
    },
  ) {
    const p = await t.signUp(['grazier'], name);
    const res = await api().patch('/api/me').set(p.auth).send(profile);
    if (res.status !== 200) throw new Error(`profile failed: ${res.status} ${JSON.stringify(res.body)}`);
    return p;
  }

  async function draft(owner: Person, over: Record<string, unknown> = {}) {
    const res = await api().post('/api/blocks').set(owner.auth).send(blockBody(over));
    if (res.status !== 201) throw new Error(`create failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.block as { id: string } & Record<string, any>;
  }

  async function openBlock(owner: Person, over: Record<string, unknown> = {}) {
    const b = await draft(owner, over);
    const res = await api().post(`/api/blocks/${b.id}/publish`).set(owner.auth);
    if (res.status !== 200) throw new Error(`publish failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.block as { id: string } & Record<string, any>;
  }

  async function bid(who: Person, blockId: string, over: Record<string, unknown> = {}) {
    const res = await api().post(`/api/blocks/${blockId}/bids`).set(who.auth).send(bidBody(over));
    if (res.status !== 201) throw new Error(`bid failed: ${res.status} ${JSON.stringify(res.body)}`);
    return res.body.bid as { id: string } & Record<string, any>;
  }

  return { api, grower, grazier, draft, openBlock, bid };
}
