import { addDaysToKey } from '../../../lib/dates';
import type { BlockInput } from '../../../lib/schemas/block';
import type { BidInput } from '../../../lib/schemas/bid';

// This season's open market in the invented Calder Valley: four blocks taking bids, one draft, and live
// bids on them. Every date is a number of days from the seed's "today" at the district, so a demo seeded
// on any day opens a market that starts a month or so ahead — it never lies in the past. (Seeded on
// 1 Dec 2026 it is the 2027 winter season the first demo was written for.) Spray products are generic demo
// records, not real labels: their restriction days are invented.

export type DemoEmail = 'greta@calder.example' | 'tomas@calder.example' | 'wade@calder.example' | 'mirela@calder.example' | 'ops@calder.example';

export interface DemoBlock {
  key: string;
  owner: DemoEmail;
  status: 'draft' | 'open';
  input: BlockInput;
}

export interface DemoBid {
  block: string;
  grazier: DemoEmail;
  input: BidInput;
}

export function demoMarket(today: string): { blocks: DemoBlock[]; bids: DemoBid[] } {
  const d = (n: number) => addDaysToKey(today, n);
  const blocks: DemoBlock[] = [
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
        windowStart: d(34),
        windowEnd: d(94),
        outBy: d(90),
        harvestDate: d(293),
        sprayRecords: [{ product: 'Dormant oil (demo record)', appliedOn: d(7), grazingRestrictionDays: 14, containsCopper: false }],
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
        windowStart: d(41),
        windowEnd: d(73),
        // Out well before almond bloom.
        outBy: d(66),
        harvestDate: d(262),
        sprayRecords: [{ product: 'Orchard-floor herbicide (demo record)', appliedOn: d(27), grazingRestrictionDays: 30, containsCopper: false }],
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
        windowStart: d(48),
        windowEnd: d(109),
        // Before bud break.
        outBy: d(99),
        harvestDate: d(274),
        sprayRecords: [{ product: 'Fixed copper fungicide (demo record)', appliedOn: d(14), grazingRestrictionDays: 21, containsCopper: true }],
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
        windowStart: d(55),
        windowEnd: d(120),
        outBy: d(120),
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
        windowStart: d(62),
        windowEnd: d(90),
        outBy: d(86),
        harvestDate: d(283),
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

  const bids: DemoBid[] = [
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
        startDate: d(40),
        endDate: d(58),
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
        startDate: d(62),
        endDate: d(82),
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
        startDate: d(62),
        endDate: d(104),
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
        startDate: d(58),
        endDate: d(66),
        services: ['fencing', 'water hauling'],
      },
    },
  ];
  return { blocks, bids };
}
