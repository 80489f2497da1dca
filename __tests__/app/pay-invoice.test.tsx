import { act, fireEvent, screen, waitFor } from '@testing-library/react-native';
import { InvoiceDetail } from '@/components/invoices/invoice-detail';
import { useInvoice } from '@/hooks/api/invoices';
import type { InvoiceView } from '@/lib/schemas/invoice';
import { renderWithProviders } from '../helpers/render-app';

// The grower's invoice screen against a mocked API: choose a test card, see progress while it runs, read a
// decline in plain words, then pay and get the receipt.

const WORDS = 'The card was declined because it does not have enough funds. Try another card, or pay once funds are available.';

const sent: InvoiceView = {
  id: 'inv-1',
  number: 7,
  numberLabel: 'KRS-0007',
  contractId: 'con-1',
  block: { id: 'blk-1', name: 'North bench walnut middles', status: 'awarded', crop: 'orchard', acres: 80, placeName: 'Calder Valley', timeZone: 'America/Los_Angeles' },
  grower: { id: 'greta', name: 'Greta Olsen', businessName: 'Olsen Walnut Orchard' },
  grazier: { id: 'wade', name: 'Wade Kellner', businessName: 'Kellner Range Sheep' },
  viewerSide: 'payable',
  status: 'sent',
  displayStatus: 'sent',
  issueDate: '2027-02-01',
  dueDate: '2027-02-15',
  paymentTermsDays: 14,
  currency: 'usd',
  basis: 'head-day',
  rate: '0.18',
  quantity: 10_800,
  agreedHeadDays: 10_800,
  stay: { startDate: '2027-01-10', endDate: '2027-01-28', headCount: 600, species: 'sheep', animalClass: 'dry ewes' },
  servicesIncluded: ['fencing'],
  lines: [{ kind: 'grazing', label: 'Grazing (head-days)', quantity: 10_800, rate: '0.18', amountCents: 194_400, description: 'Grazing: 10,800 head-days × $0.18 per head-day' }],
  subtotalCents: 194_400,
  totalCents: 194_400,
  payment: { ready: true, inProgress: false, lastFailure: null },
  receipt: null,
  pdf: { url: '/api/invoices/inv-1/pdf?access=t', sha256: 'a'.repeat(64), version: 1 },
  createdAt: '2027-02-01T17:00:00.000Z',
};

const paid: InvoiceView = {
  ...sent,
  status: 'paid',
  displayStatus: 'paid',
  payment: { ready: false, inProgress: false, lastFailure: null },
  receipt: { paidAt: '2027-02-03T18:00:00.000Z', paidDay: '2027-02-03', amountCents: 194_400, method: 'Test card that pays (Visa ending 4242, for testing)', reference: 'AB12CD34-0001' },
};

const fetchMock = jest.fn();
/** What the pay route answers, one entry per request (an entry may wait, to look at the screen meanwhile). */
let payAnswers: Array<() => Promise<{ status: number; body: unknown }>> = [];
let current: InvoiceView = sent;
const payBodies: unknown[] = [];

beforeEach(() => {
  payAnswers = [];
  payBodies.length = 0;
  current = sent;
  fetchMock.mockReset();
  fetchMock.mockImplementation(async (url: string, init: { method?: string; body?: string }) => {
    let status = 200;
    let body: unknown = { invoice: current };
    if (url.endsWith('/invoices/inv-1/pay')) {
      payBodies.push(JSON.parse(init.body ?? '{}'));
      ({ status, body } = await payAnswers.shift()!());
    }
    return { ok: status < 400, status, json: async () => body };
  });
  global.fetch = fetchMock as unknown as typeof fetch;
});

function Screen() {
  const q = useInvoice('inv-1');
  return q.data ? <InvoiceDetail invoice={q.data} /> : null;
}

test('When the grower pays with the test card without funds, then progress shows, then the decline in plain words; with the card that pays, the receipt', async () => {
  await renderWithProviders(<Screen />);
  await screen.findByTestId('pay-panel');
  expect(screen.getByText('Sent — awaiting payment')).toBeTruthy();

  // The three choices are the payments service's test methods, each marked as a test.
  for (const name of ['Test card that pays', 'Test card that is declined', 'Test card without enough funds']) expect(screen.getByRole('radio', { name })).toBeTruthy();
  expect(screen.getAllByRole('radio')).toHaveLength(3);
  expect(screen.getAllByText('Test')).toHaveLength(3);

  let release: () => void = () => {};
  const declined = new Promise<void>((r) => (release = r)).then(() => ({ status: 402, body: { error: { code: 'payment_declined', message: WORDS } } }));
  payAnswers.push(() => declined);
  fireEvent.press(screen.getByRole('radio', { name: 'Test card without enough funds' }));
  fireEvent.press(screen.getByTestId('pay-button'));
  await screen.findByText(/Paying… waiting for the payments service/);
  expect(payBodies).toEqual([{ paymentMethod: 'pm_card_chargeDeclinedInsufficientFunds' }]);
  await act(async () => release());
  await screen.findByText('Payment declined');
  expect(screen.getByTestId('pay-error').props.children).toBe(WORDS);
  expect(screen.queryByTestId('receipt')).toBeNull();

  current = paid;
  payAnswers.push(async () => ({ status: 200, body: { invoice: paid } }));
  fireEvent.press(screen.getByRole('radio', { name: 'Test card that pays' }));
  fireEvent.press(screen.getByTestId('pay-button'));
  await waitFor(() => expect(screen.getByTestId('receipt')).toBeTruthy());
  expect(payBodies[1]).toEqual({ paymentMethod: 'pm_card_visa' });
  expect(screen.getByText('$1,944.00 paid')).toBeTruthy();
  expect(screen.getByText('Paid with: Test card that pays (Visa ending 4242, for testing)')).toBeTruthy();
  expect(screen.queryByTestId('pay-panel')).toBeNull();
});
