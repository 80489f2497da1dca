import { normaliseBid } from '@/lib/grazing/bid-compare';
import type { ContractDetailView, LogEntryRecord, LogFiguresView } from '@/hooks/api/contracts';
import type { AccountView } from '@/lib/schemas/account';

// An invented contract for the component tests: Kellner Range Sheep's 600 dry ewes on the Olsen walnut
// middles in the Calder Valley demo district, Jan 20 – Jan 30 2027, $0.18 per head-day.

export const TERMS_HASH = '3f9ac2d1e04b7a6c5d8e9f0a1b2c3d4e5f60718293a4b5c6d7e8f90a1b2c3d4e';

export const greta: AccountView = {
  id: 'acct-greta',
  email: 'greta@calder.example',
  name: 'Greta Olsen',
  roles: ['grower'],
  activeRole: 'grower',
  businessName: 'Olsen Walnut Orchard',
  phone: null,
  homePlace: null,
  homeLatitude: null,
  homeLongitude: null,
  flock: null,
  createdAt: '2026-11-01T00:00:00.000Z',
};

export const wade: AccountView = {
  ...greta,
  id: 'acct-wade',
  email: 'wade@calder.example',
  name: 'Wade Kellner',
  roles: ['grazier'],
  activeRole: 'grazier',
  businessName: 'Kellner Range Sheep',
  flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 } as AccountView['flock'],
};

export function contractFixture(over: Partial<ContractDetailView> = {}): ContractDetailView {
  const terms = { basis: 'head-day' as const, rate: '0.18', headCount: 600, species: 'sheep' as const, animalClass: 'dry ewes' as const, bodyWeightLb: 150, startDate: '2027-01-20', endDate: '2027-01-30' };
  const block = { acres: 40, lbDmPerAcre: 2000, targetUtilizationPct: 45 };
  return {
    id: 'contract-olsen-1',
    status: 'grazing',
    blockId: 'blk-olsen',
    bidId: 'bid-wade',
    block: { id: 'blk-olsen', name: 'North bench walnut middles', status: 'awarded', crop: 'orchard', acres: 40, placeName: 'Calder Valley, north bench', timeZone: 'America/Los_Angeles' },
    grower: { id: greta.id, name: greta.name, businessName: greta.businessName },
    grazier: { id: wade.id, name: wade.name, businessName: wade.businessName },
    ...terms,
    services: ['guardian dogs'],
    outBy: '2027-02-20',
    ...block,
    timeZone: 'America/Los_Angeles',
    normalised: normaliseBid(terms, block),
    createdAt: '2026-12-10T18:00:00.000Z',
    termsVersion: 1,
    termsHash: TERMS_HASH,
    signatures: [
      { party: 'grower', accountId: greta.id, typedName: 'Greta Olsen', signedAt: '2026-12-11T17:00:00.000Z', termsHash: TERMS_HASH },
      { party: 'grazier', accountId: wade.id, typedName: 'Wade Kellner', signedAt: '2026-12-12T16:30:00.000Z', termsHash: TERMS_HASH },
    ],
    cautions: [
      { key: 'spray-records-none', tone: 'caution', title: 'No spray records entered', text: 'Ask what was applied to the block in the last 18 months and read each label.' },
      { key: 'food-safety-harvest', tone: 'caution', title: 'Food safety before harvest', text: 'Animals must be out by Feb 20, 2027.' },
    ],
    agreedHeadDays: null,
    signOff: null,
    pendingAmendment: null,
    ...over,
  };
}

export function entryFixture(over: Partial<LogEntryRecord> & Pick<LogEntryRecord, 'clientId' | 'kind' | 'at'>): LogEntryRecord {
  return {
    id: `srv-${over.clientId}`,
    change: null,
    count: null,
    paddock: null,
    residualHeightIn: null,
    takenPct: null,
    trampledPct: null,
    bareGroundPct: null,
    waterChecked: null,
    fenceChecked: null,
    losses: null,
    note: null,
    author: 'grazier',
    flags: [],
    recordedAt: over.at,
    ...over,
  };
}

/** Figures as the server would give them for 600 head in since Jan 20 07:30, counted to Jan 22 08:00 (48.5 h). */
export function figuresFixture(over: Partial<LogFiguresView> = {}): LogFiguresView {
  return {
    headNow: 600,
    headDaysSoFar: 1212.5,
    byDay: [
      { date: '2027-01-20', headDays: 412.5 },
      { date: '2027-01-21', headDays: 600 },
      { date: '2027-01-22', headDays: 200 },
    ],
    // 1 212.5 head-days × 150 lb × 2.5 % = 4 546.875 lb
    eatenLb: 4546.875,
    // 40 ac × 2 000 lb × 45 %
    targetTakeLb: 36000,
    projectedUtilizationPct: 45,
    daysLeftInWindow: 8,
    daysToOutBy: 29,
    warnings: [],
    ...over,
  };
}

/** A fetch stand-in answering by method and path; unknown requests fail the test loudly. */
export function routeFetch(routes: Record<string, (init: RequestInit | undefined) => { status: number; body?: unknown } | Promise<{ status: number; body?: unknown }>>) {
  return jest.fn(async (url: RequestInfo | URL, init?: RequestInit) => {
    const key = `${init?.method ?? 'GET'} ${String(url)}`;
    const route = routes[key];
    if (!route) throw new Error(`Unexpected request in test: ${key}`);
    const { status, body } = await route(init);
    return { ok: status < 400, status, json: async () => body } as Response;
  });
}
