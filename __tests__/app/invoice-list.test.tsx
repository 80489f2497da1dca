import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { InvoiceList } from '@/components/invoices/invoice-list';
import type { InvoiceListView, InvoiceView } from '@/lib/schemas/invoice';
import { renderWithProviders } from '../helpers/render-app';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

// The grower's payables against a mocked API that answers a page at a time: the first page and the totals over
// every invoice, then "Show more invoices" fetches the next page from the cursor the first one gave.

function invoice(n: number, dueDate: string): InvoiceView {
  return {
    id: `inv-${n}`,
    number: n,
    numberLabel: `KRS-000${n}`,
    contractId: `con-${n}`,
    block: { id: `blk-${n}`, name: `Block ${n}`, status: 'awarded', crop: 'orchard', acres: 40, placeName: 'Calder Valley', timeZone: 'America/Los_Angeles' },
    grower: { id: 'greta', name: 'Greta Olsen', businessName: 'Olsen Walnut Orchard' },
    grazier: { id: 'wade', name: 'Wade Kellner', businessName: 'Kellner Range Sheep' },
    viewerSide: 'payable',
    status: 'sent',
    displayStatus: 'sent',
    issueDate: '2027-02-01',
    dueDate,
    paymentTermsDays: 14,
    currency: 'usd',
    basis: 'flat',
    rate: '100',
    quantity: 1,
    agreedHeadDays: 1000,
    stay: { startDate: '2027-01-10', endDate: '2027-01-28', headCount: 600, species: 'sheep', animalClass: 'dry ewes' },
    servicesIncluded: [],
    lines: [{ kind: 'grazing', label: 'Grazing (flat)', quantity: 1, rate: '100', amountCents: n * 10_000, description: 'Grazing, flat' }],
    subtotalCents: n * 10_000,
    totalCents: n * 10_000,
    payment: { ready: true, inProgress: false, lastFailure: null },
    receipt: null,
    pdf: { url: `/api/invoices/inv-${n}/pdf?access=t`, sha256: null, version: null },
    createdAt: '2027-02-01T17:00:00.000Z',
  };
}

const totals = { outstandingCents: 60_000, outstandingCount: 3, overdueCents: 0, overdueCount: 0, paidThisSeasonCents: 0, paidThisSeasonCount: 0, season: '2027' };
const pages: Record<string, InvoiceListView> = {
  first: { side: 'payable', items: [invoice(1, '2027-02-15'), invoice(2, '2027-02-16')], totals, total: 3, nextCursor: 'page-2' },
  'page-2': { side: 'payable', items: [invoice(3, '2027-02-20')], totals, total: 3, nextCursor: null },
};

const fetchMock = jest.fn();
beforeEach(() => {
  fetchMock.mockReset();
  fetchMock.mockImplementation(async (url: string) => {
    const cursor = new URL(url, 'http://app.test').searchParams.get('cursor');
    return { ok: true, status: 200, json: async () => pages[cursor ?? 'first'] };
  });
  global.fetch = fetchMock as unknown as typeof fetch;
});

test('When the grower has more invoices than a page, then the first page shows with the totals of all, and Show more fetches the next page from its cursor', async () => {
  await renderWithProviders(<InvoiceList side="payable" />);
  await screen.findByLabelText('Invoice KRS-0001, $100.00');
  expect(screen.getByLabelText('Invoice KRS-0002, $200.00')).toBeTruthy();
  expect(screen.queryByLabelText('Invoice KRS-0003, $300.00')).toBeNull();
  const first = new URL(fetchMock.mock.calls[0][0], 'http://app.test');
  expect(first.pathname).toBe('/api/invoices');
  expect(Object.fromEntries(first.searchParams)).toEqual({ side: 'payable', limit: '25' });

  fireEvent.press(screen.getByRole('button', { name: 'Show more invoices (2 of 3 shown)' }));
  await screen.findByLabelText('Invoice KRS-0003, $300.00');
  const second = new URL(fetchMock.mock.calls.at(-1)![0], 'http://app.test');
  expect(Object.fromEntries(second.searchParams)).toEqual({ side: 'payable', limit: '25', cursor: 'page-2' });
  // The last page gave no cursor: nothing more to show.
  await waitFor(() => expect(screen.queryByRole('button', { name: /Show more invoices/ })).toBeNull());
  expect(screen.getAllByLabelText(/^Invoice KRS-/)).toHaveLength(3);
});
