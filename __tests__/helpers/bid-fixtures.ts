import { normaliseBid } from '../../lib/grazing/bid-compare';
import type { BidView } from '../../lib/schemas/bid';
import type { BlockView } from '../../lib/schemas/block';

// A block and bids on it as the API answers them, for the bid screens' tests (invented, like the demo).

/** Copper-sprayed vineyard rows, open Jan 18 – Mar 10 2027 (animals out by Mar 10), 40 % target take. */
export const block: BlockView = {
  id: 'blk-1',
  status: 'open',
  owner: { id: 'grower-1', name: 'Tomás Reyes', businessName: 'Three Terraces Vineyard' },
  name: 'Terrace 2 vineyard rows',
  crop: 'vineyard',
  acres: 36,
  placeName: 'Calder Valley, west slope',
  latitude: 39.6512,
  longitude: -122.0488,
  timeZone: 'America/Los_Angeles',
  forageMethod: 'direct',
  lbDmPerAcre: 1800,
  forageSamples: null,
  forageHeight: null,
  targetUtilizationPct: 40,
  residualHeightIn: 3,
  windowStart: '2027-01-18',
  windowEnd: '2027-03-20',
  outBy: '2027-03-10',
  harvestDate: '2027-09-01',
  sprayRecords: [{ product: 'Fixed copper fungicide', appliedOn: '2026-12-15', grazingRestrictionDays: 21, containsCopper: true }],
  waterOnSite: true,
  perimeterFence: 'full',
  truckAccess: true,
  speciesAllowed: ['sheep'],
  youngPlantings: false,
  notes: null,
  earliestSafeDate: '2027-01-05',
  grazeFrom: '2027-01-18',
  grazeUntil: '2027-03-10',
  distanceMiles: 13.8,
  capacity: 6912,
  daysForMyFlock: 11.52,
  flockFit: { headCount: 600, bodyWeightLb: 150, intakePctBodyWeight: 2.5, intakeBasis: 'dry ewe', intakeSource: 'NCAT ATTRA' },
  cautions: [{ key: 'copper-sheep', tone: 'danger', title: 'Copper sprays: a risk for sheep', text: 'Ask your vet before grazing sheep here.' }],
  photos: [],
  liveBidCount: null,
  viewer: { isOwner: false, canBid: true, myLiveBidId: null },
  publishedAt: '2026-11-20T00:00:00.000Z',
  awardedAt: null,
  createdAt: '2026-11-20T00:00:00.000Z',
  updatedAt: '2026-11-20T00:00:00.000Z',
};

/** A live bid on `on` (by default the vineyard above) as the API answers it, with `over` on top. */
export function bidView(over: Partial<BidView> = {}, on: BlockView = block): BidView {
  const terms = { basis: 'head-day' as const, rate: '0.20', headCount: 600, species: 'sheep' as const, animalClass: 'dry ewes' as const, bodyWeightLb: 150, startDate: '2027-01-20', endDate: '2027-01-30' };
  return {
    id: 'bid-1',
    blockId: on.id,
    status: 'live',
    grazier: { id: 'wade', name: 'Wade Kellner', businessName: 'Kellner Range Sheep', completedContracts: 0 },
    ...terms,
    services: ['guardian dogs'],
    note: null,
    normalised: normaliseBid(terms, on),
    conflicts: [],
    cautions: [],
    block: { id: on.id, name: on.name, status: 'open', crop: on.crop, acres: on.acres, placeName: on.placeName, timeZone: on.timeZone },
    createdAt: '2026-12-01T18:00:00.000Z',
    updatedAt: '2026-12-01T18:00:00.000Z',
    decidedAt: null,
    ...over,
  };
}

