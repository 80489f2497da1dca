import { fireEvent, screen } from '@testing-library/react-native';
import { ForageCalculator, EXAMPLE_VALUES } from '@/components/calculator/forage-calculator';
import { computeCalculator } from '@/lib/grazing/calculator';
import { capacity } from '@/lib/grazing/capacity';
import { renderWithProviders } from '../helpers/render-app';

const digits = (s: unknown) => Number(String(s).replace(/[^0-9.]/g, ''));
const textOf = (id: string) => {
  const children = screen.getByTestId(id).props.children;
  return Array.isArray(children) ? children.join('') : children;
};

describe('ForageCalculator', () => {
  it('shows the example figures computed by lib/grazing, and recomputes as acres are typed', async () => {
    const { queryClient } = await renderWithProviders(<ForageCalculator />);
    const example = computeCalculator(EXAMPLE_VALUES);
    expect(digits(textOf('calc-head-days'))).toBe(Math.floor(example.capacity!.headDays));

    fireEvent.changeText(screen.getByLabelText('Block size'), '80');
    const expected = capacity({
      acres: 80,
      lbDmPerAcre: example.forage!.lbDmPerAcre,
      utilizationPct: 45,
      animal: { bodyWeightLb: 150, intakePctBodyWeight: 2.5 },
    });
    expect(digits(textOf('calc-head-days'))).toBe(Math.floor(expected.headDays));
    expect(digits(textOf('calc-days'))).toBe(Math.floor(expected.headDays / 500));
    queryClient.clear();
  });

  it('puts the schema message beside a bad field and hides the figures', async () => {
    const { queryClient } = await renderWithProviders(<ForageCalculator />);
    fireEvent.changeText(screen.getByLabelText('Block size'), '-5');
    expect(await screen.findByText('Acres must be more than 0')).toBeTruthy();
    expect(screen.getByTestId('calc-incomplete')).toBeTruthy();
    queryClient.clear();
  });
});
