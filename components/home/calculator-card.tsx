import { Link } from 'expo-router';
import { View } from 'react-native';
import { Card, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';

export function CalculatorCard() {
  return (
    <Card>
      <Text variant="heading">Forage calculator</Text>
      <Text tone="muted">Clip a few frames or read the stand height, and see the head-days a block can carry at a safe take.</Text>
      <View style={{ marginTop: space.xs }}>
        <Link href="/calculator">
          <Text tone="cover" variant="bodyStrong">
            Open the calculator →
          </Text>
        </Link>
      </View>
    </Card>
  );
}
