import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { BidForm } from '@/components/bids/bid-form';
import { normaliseBid } from '@/lib/grazing/bid-compare';
import { formatCents } from '@/lib/money';
import { renderWithProviders } from '../helpers/render-app';
import { bidView, block } from '../helpers/bid-fixtures';

// The clock the form reads "today at the block" from: 1 Dec 2026, before the block's window.
const NOW = Date.parse('2026-12-01T18:00:00Z');

const wade = { flock: { species: 'sheep' as const, animalClass: 'dry ewes' as const, headCount: 600, bodyWeightLb: 150 } };

const fetchMock = jest.fn();
function answer(status: number, body: unknown) {
  fetchMock.mockResolvedValueOnce({ ok: status < 400, status, json: async () => body });
}

beforeEach(() => {
  fetchMock.mockReset();
  global.fetch = fetchMock as unknown as typeof fetch;
  jest.spyOn(Date, 'now').mockReturnValue(NOW);
});
afterEach(() => jest.restoreAllMocks());

const textOf = (id: string) => {
  const children = screen.getByTestId(id).props.children;
  return Array.isArray(children) ? children.join('') : String(children);
};
const input = (label: string) => screen.getByLabelText(label);

describe('BidForm', () => {
  it('starts from my flock and a stay that fits, previews the bid with lib/ figures, warns of overgrazing and sends the bid', async () => {
    const onDone = jest.fn();
    const { queryClient } = await renderWithProviders(<BidForm block={block} user={wade} onDone={onDone} />);

    // Prefilled: my 600 head at 150 lb, in on the first grazeable day, out after the 11 whole days the block feeds them.
    expect(input('Head count').props.value).toBe('600');
    expect(input('Typical body weight').props.value).toBe('150');
    expect(input('Start date').props.value).toBe('2027-01-18');
    expect(input('End date').props.value).toBe('2027-01-29');
    expect(screen.getByTestId('preview-incomplete')).toBeTruthy();

    fireEvent.changeText(input('Rate'), '0.2');
    const fits = normaliseBid(
      { basis: 'head-day', rate: '0.2', headCount: 600, bodyWeightLb: 150, species: 'sheep', animalClass: 'dry ewes', startDate: '2027-01-18', endDate: '2027-01-29' },
      block,
    );
    expect(textOf('preview-total')).toBe(formatCents(fits.estimatedTotalCents));
    expect(textOf('preview-head-days')).toBe('6,600');
    expect(textOf('preview-per-acre')).toBe(formatCents(fits.costPerAcreCents));
    expect(textOf('preview-per-head-day')).toBe(`$${fits.costPerHeadDayRate}`);
    expect(fits.overgrazes).toBe(false);
    expect(screen.queryByTestId('overgraze-warning')).toBeNull();

    // Three weeks eats more than the grower's 40 %: the warning says so and how long fits.
    fireEvent.changeText(input('End date'), '2027-02-08');
    const over = normaliseBid(
      { basis: 'head-day', rate: '0.2', headCount: 600, bodyWeightLb: 150, species: 'sheep', animalClass: 'dry ewes', startDate: '2027-01-18', endDate: '2027-02-08' },
      block,
    );
    expect(over.overgrazes).toBe(true);
    expect(textOf('preview-utilisation')).toBe(`Takes ${Math.round(over.predictedUtilizationPct)} % of the standing forage`);
    expect(screen.getByTestId('overgraze-warning')).toBeTruthy();
    expect(screen.getByText(/leave by Jan 29, 2027, or bring fewer head/)).toBeTruthy();

    // Per acre instead: the same stay costs acres × rate.
    fireEvent.press(screen.getByRole('radio', { name: 'Per acre' }));
    fireEvent.changeText(input('Rate'), '25');
    expect(textOf('preview-total')).toBe('$900.00');

    fireEvent.changeText(input('End date'), '2027-01-28');
    fireEvent.press(screen.getByRole('button', { name: 'guardian dogs' }));
    fireEvent.changeText(input('Note to the grower'), 'Two dogs stay with the flock.');
    const placed = bidView({ basis: 'acre', rate: '25.00', endDate: '2027-01-28', startDate: '2027-01-18' });
    answer(201, { bid: placed });
    fireEvent.press(screen.getByRole('button', { name: 'Place bid' }));

    await waitFor(() => expect(onDone).toHaveBeenCalledWith(placed));
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/blocks/blk-1/bids');
    expect(init.method).toBe('POST');
    expect(JSON.parse(init.body)).toEqual({
      basis: 'acre',
      rate: '25',
      headCount: 600,
      species: 'sheep',
      animalClass: 'dry ewes',
      bodyWeightLb: 150,
      startDate: '2027-01-18',
      endDate: '2027-01-28',
      services: ['guardian dogs'],
      note: 'Two dogs stay with the flock.',
    });
    queryClient.clear();
  });

  it("refuses a stay past the out-by date and a missing rate before sending, with the schema's and the block's own words", async () => {
    const { queryClient } = await renderWithProviders(<BidForm block={block} user={wade} onDone={jest.fn()} />);
    fireEvent.changeText(input('End date'), '2027-03-15');
    fireEvent.press(screen.getByRole('button', { name: 'Place bid' }));
    expect(await screen.findByText('Rate is required')).toBeTruthy();
    expect(screen.getByText(/End date must be on or before the animals-out-by date, 2027-03-10/)).toBeTruthy();
    expect(fetchMock).not.toHaveBeenCalled();
    queryClient.clear();
  });

  it("puts the server's 400 for the start date beside the field", async () => {
    const message = 'Start date is inside a pesticide grazing restriction: the earliest safe date is 2027-01-25.';
    answer(400, { error: { code: 'invalid', message: 'The bid does not fit this block', fields: { startDate: message } } });
    const onDone = jest.fn();
    const { queryClient } = await renderWithProviders(<BidForm block={block} user={wade} onDone={onDone} />);
    fireEvent.changeText(input('Rate'), '0.18');
    fireEvent.press(screen.getByRole('button', { name: 'Place bid' }));
    expect(await screen.findByText(message)).toBeTruthy();
    expect(screen.getByText('The bid does not fit this block')).toBeTruthy();
    expect(fetchMock).toHaveBeenCalledTimes(1);
    expect(onDone).not.toHaveBeenCalled();
    queryClient.clear();
  });

  it('changes my live bid with PATCH, and withdraws it after confirming', async () => {
    const bid = bidView();
    const onDone = jest.fn();
    const { queryClient } = await renderWithProviders(<BidForm block={{ ...block, viewer: { ...block.viewer, canBid: false, myLiveBidId: bid.id } }} user={wade} bid={bid} onDone={onDone} />);
    expect(input('Rate').props.value).toBe('0.20');
    expect(input('Start date').props.value).toBe('2027-01-20');

    fireEvent.changeText(input('Head count'), '500');
    expect(textOf('preview-total')).toBe('$1,000.00');
    const saved = bidView({ headCount: 500 });
    answer(200, { bid: saved });
    fireEvent.press(screen.getByRole('button', { name: 'Save my bid' }));
    await waitFor(() => expect(onDone).toHaveBeenCalledWith(saved));
    expect(fetchMock.mock.calls[0][0]).toBe('/api/bids/bid-1');
    expect(fetchMock.mock.calls[0][1].method).toBe('PATCH');
    expect(JSON.parse(fetchMock.mock.calls[0][1].body)).toMatchObject({ headCount: 500, rate: '0.20', startDate: '2027-01-20', endDate: '2027-01-30' });

    fireEvent.press(screen.getByRole('button', { name: 'Withdraw my bid' }));
    expect(screen.getByText('Withdraw this bid?')).toBeTruthy();
    const withdrawn = bidView({ status: 'withdrawn' });
    answer(200, { bid: withdrawn });
    fireEvent.press(screen.getByRole('button', { name: 'Withdraw bid' }));
    await waitFor(() => expect(onDone).toHaveBeenLastCalledWith(withdrawn));
    expect(fetchMock.mock.calls[1][0]).toBe('/api/bids/bid-1/withdraw');
    expect(fetchMock.mock.calls[1][1].method).toBe('POST');
    queryClient.clear();
  });
});
