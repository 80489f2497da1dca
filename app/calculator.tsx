import { Screen, Text } from '@/components/ui';

// The public forage and capacity calculator (issue 3) replaces this placeholder.
export default function CalculatorScreen() {
  return (
    <Screen title="Forage calculator" narrow>
      <Text tone="muted">Coming with the grazing arithmetic.</Text>
    </Screen>
  );
}
