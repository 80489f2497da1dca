import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { MarketResults } from '@/components/market/market-results';
import { emptyMarketFilters, marketQuery } from '@/components/market/market-query';
import type { BlockView } from '@/lib/schemas/block';
import { renderWithProviders } from '../helpers/render-app';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

const fetchMock = jest.fn();
beforeEach(() => {
  fetchMock.mockReset();
  global.fetch = fetchMock as unknown as typeof fetch;
});

function openBlock(i: number): BlockView {
  return {
    id: `blk-${i}`,
    status: 'open',
    owner: { id: 'g', name: 'Greta Olsen', businessName: 'Olsen Walnut Orchard' },
    name: `Walnut middles ${i}`,
    crop: 'orchard',
    acres: 40,
    placeName: 'Calder Valley',
    latitude: 39.7,
    longitude: -121.9,
    timeZone: 'America/Los_Angeles',
    forageMethod: 'direct',
    lbDmPerAcre: 2000,
    forageSamples: null,
    forageHeight: null,
    targetUtilizationPct: 45,
    residualHeightIn: null,
    windowStart: '2027-01-04',
    windowEnd: '2027-03-05',
    outBy: '2027-03-01',
    harvestDate: null,
    sprayRecords: [],
    waterOnSite: true,
    perimeterFence: 'full',
    truckAccess: true,
    speciesAllowed: ['sheep'],
    youngPlantings: false,
    notes: null,
    earliestSafeDate: null,
    grazeFrom: '2027-01-04',
    grazeUntil: '2027-03-01',
    distanceMiles: 5 + i,
    capacity: 9600,
    daysForMyFlock: 16.7,
    flockFit: { headCount: 600, bodyWeightLb: 150, intakePctBodyWeight: 2.5, intakeBasis: 'dry ewe', intakeSource: 'NCAT ATTRA' },
    cautions: [
      { key: 'spray-records-none', tone: 'caution', title: 'No spray records entered', text: 'Ask what was applied.' },
      { key: 'electric-fence-public', tone: 'info', title: 'Electric fence, people and predators', text: 'Post signs.' },
    ],
    photos: [],
    liveBidCount: null,
    viewer: { isOwner: false, canBid: true, myLiveBidId: null },
    publishedAt: null,
    awardedAt: null,
    createdAt: '2026-11-20T00:00:00.000Z',
    updatedAt: '2026-11-20T00:00:00.000Z',
  };
}

function page(items: BlockView[], total: number, pageNo: number, totalCapped = false) {
  return { ok: true, status: 200, json: async () => ({ items, total, totalCapped, page: pageNo, pageSize: 10 }) };
}

describe('Find grazing results', () => {
  it('shows a page of cards with the days of feed and the leading caution, and adds the next page on "Show more"', async () => {
    const all = Array.from({ length: 12 }, (_, i) => openBlock(i + 1));
    fetchMock.mockResolvedValueOnce(page(all.slice(0, 10), 12, 1)).mockResolvedValueOnce(page(all.slice(10), 12, 2));
    const filters = { view: 'market', sort: 'distance', maxMiles: '20' };
    const { queryClient } = await renderWithProviders(<MarketResults filters={filters} filtering onClear={jest.fn()} wide={false} />);

    expect(await screen.findByText('12 open blocks match')).toBeTruthy();
    expect(screen.getByText('Walnut middles 1')).toBeTruthy();
    expect(screen.getAllByText('Feeds your 600 head for 16 days')).toHaveLength(10);
    // The caution flag leads with the most serious note, never an info one.
    expect(screen.getAllByText('No spray records entered')).toHaveLength(10);
    expect(screen.queryByText(/Electric fence/)).toBeNull();
    expect(fetchMock.mock.calls[0][0]).toBe('/api/blocks?view=market&sort=distance&maxMiles=20&page=1&pageSize=10');

    fireEvent.press(screen.getByRole('button', { name: 'Show more (2 left)' }));
    expect(await screen.findByText('Walnut middles 12')).toBeTruthy();
    expect(fetchMock.mock.calls[1][0]).toBe('/api/blocks?view=market&sort=distance&maxMiles=20&page=2&pageSize=10');
    expect(screen.queryByRole('button', { name: /Show more/ })).toBeNull();
    queryClient.clear();
  });

  it('says "more than" when the server stopped counting, and offers more pages until one comes back short', async () => {
    const ten = (from: number) => Array.from({ length: 10 }, (_, i) => openBlock(from + i));
    fetchMock
      .mockResolvedValueOnce(page(ten(1), 1000, 1, true))
      .mockResolvedValueOnce(page(ten(11), 1000, 2, true))
      .mockResolvedValueOnce(page(ten(21).slice(0, 3), 1000, 3, true));
    const { queryClient } = await renderWithProviders(<MarketResults filters={{ view: 'market' }} filtering={false} onClear={jest.fn()} wide={false} />);
    expect(await screen.findByText('More than 1,000 open blocks')).toBeTruthy();
    fireEvent.press(screen.getByRole('button', { name: 'Show more' }));
    expect(await screen.findByText('Walnut middles 20')).toBeTruthy();
    fireEvent.press(screen.getByRole('button', { name: 'Show more' }));
    expect(await screen.findByText('Walnut middles 23')).toBeTruthy();
    await waitFor(() => expect(screen.queryByRole('button', { name: /Show more/ })).toBeNull());
    expect(screen.getByText('That is every open block that matches.')).toBeTruthy();
    queryClient.clear();
  });

  it('says honestly when no open block matches, and offers to clear the filters', async () => {
    fetchMock.mockResolvedValueOnce(page([], 0, 1));
    const onClear = jest.fn();
    const { queryClient } = await renderWithProviders(<MarketResults filters={{ view: 'market', minAcres: '5000' }} filtering onClear={onClear} wide={false} />);
    expect(await screen.findByText('No open blocks match')).toBeTruthy();
    fireEvent.press(screen.getByRole('button', { name: 'Clear the filters' }));
    await waitFor(() => expect(onClear).toHaveBeenCalled());
    queryClient.clear();
  });
});

describe('marketQuery', () => {
  it("checks the typed filters with the server's list schema: bad ones are named and left out of the query", () => {
    const typed = { ...emptyMarketFilters(true), from: '2027-13-01', to: '2027-02-01', minAcres: '50', maxAcres: '10', maxMiles: ' 25 ', species: 'goats' as const };
    const q = marketQuery(typed);
    expect(q.errors).toEqual({ from: 'From must be a real date like 2027-01-15', maxAcres: 'Maximum acres must be at least the minimum' });
    expect(q.filters).toEqual({ view: 'market', sort: 'distance', to: '2027-02-01', minAcres: '50', maxMiles: '25', species: 'goats' });
  });
});
