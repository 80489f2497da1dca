import { StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, space } from '@/components/ui/theme';

/** Fieldfold's mark: three offset furrows folding into a field, then the name in the slab serif. */
export function Wordmark({ inverse, size = 'small' }: { inverse?: boolean; size?: 'small' | 'large' }) {
  const s = size === 'large' ? 1.4 : 1;
  const stripe = inverse ? colors.coverWash : colors.cover;
  return (
    <View style={styles.row} aria-label="Fieldfold">
      <View style={{ gap: 3 * s }}>
        {[18, 24, 14].map((w, i) => (
          <View key={i} style={{ width: w * s, height: 4 * s, borderRadius: 2, marginLeft: i === 1 ? 0 : 5 * s, backgroundColor: i === 1 ? colors.clay : stripe }} />
        ))}
      </View>
      <Text variant={size === 'large' ? 'display' : 'heading'} tone={inverse ? 'onCover' : 'ink'}>
        Fieldfold
      </Text>
    </View>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', alignItems: 'center', gap: space.sm } });
