import { screen, within } from '@testing-library/react-native';
import { BidComparison } from '@/components/bids/bid-comparison';
import type { BlockView, CautionFlagView } from '@/lib/schemas/block';
import { renderWithProviders } from '../helpers/render-app';
import { bidView, block } from '../helpers/bid-fixtures';

// The grower's comparison of the bids on a copper-sprayed vineyard open to sheep and goats: each bid shows the
// cautions its own species brings (copper is a danger for sheep, a caution for goats); the block-wide ones (the
// spray restriction, water and heat) are beside the comparison on the block page, not repeated on every bid.

const mine: BlockView = { ...block, speciesAllowed: ['sheep', 'goats'], viewer: { isOwner: true, canBid: false, myLiveBidId: null }, liveBidCount: 2 };
const restriction: CautionFlagView = { key: 'pesticide-restriction', tone: 'danger', title: 'No grazing before Jan 5, 2027' };
const water: CautionFlagView = { key: 'water-and-heat', tone: 'info', title: 'Water and heat' };
const sheep = bidView({ id: 'bid-sheep', cautions: [restriction, { key: 'copper-sheep', tone: 'danger', title: 'Copper sprays: a risk for sheep' }, water] }, mine);
const goats = bidView(
  { id: 'bid-goats', species: 'goats', animalClass: 'wethers', grazier: { id: 'mirela', name: 'Mirela Haas', businessName: 'Haas Brush Goats', completedContracts: 3 }, cautions: [restriction, { key: 'copper', tone: 'caution', title: 'Copper sprays on this block' }, water] },
  mine,
);

beforeEach(() => {
  global.fetch = jest.fn(async () => ({ ok: true, status: 200, json: async () => ({ items: [sheep, goats], total: 2, page: 1, pageSize: 50 }) })) as unknown as typeof fetch;
});

test('When a sheep bid and a goat bid are compared on a copper-sprayed block, then each shows its own species’ copper caution and neither repeats the block-wide ones', async () => {
  await renderWithProviders(<BidComparison block={mine} />);
  const onSheep = within(await screen.findByTestId('bid-cautions-bid-sheep'));
  const onGoats = within(screen.getByTestId('bid-cautions-bid-goats'));
  expect(onSheep.getByLabelText('Caution: Copper sprays: a risk for sheep')).toBeTruthy();
  expect(onGoats.getByLabelText('Caution: Copper sprays on this block')).toBeTruthy();
  for (const on of [onSheep, onGoats]) {
    expect(on.queryByText(/No grazing before/)).toBeNull();
    expect(on.queryByText(/Water and heat/)).toBeNull();
  }
});

test('When a bid’s species brings no caution of its own, then it shows none', async () => {
  global.fetch = jest.fn(async () => ({ ok: true, status: 200, json: async () => ({ items: [bidView({ id: 'bid-plain', cautions: [restriction, water] }, mine)], total: 1, page: 1, pageSize: 50 }) })) as unknown as typeof fetch;
  await renderWithProviders(<BidComparison block={mine} />);
  expect(await screen.findByTestId('bid-card-bid-plain')).toBeTruthy();
  expect(screen.queryByTestId('bid-cautions-bid-plain')).toBeNull();
});
