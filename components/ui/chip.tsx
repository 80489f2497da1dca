import { Pressable, StyleSheet } from 'react-native';
import { Text } from './text';
import { colors, radius, space } from './theme';

/** A small pressable preset ("45 %", "0.25 m² quadrat"); `on` when it matches the current value. */
export function Chip({ label, on, onPress }: { label: string; on?: boolean; onPress: () => void }) {
  return (
    <Pressable role="button" aria-pressed={!!on} aria-label={label} onPress={onPress} style={[styles.chip, on && styles.on]}>
      <Text variant="caption" tone={on ? 'cover' : 'ink'}>
        {label}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  chip: { alignSelf: 'flex-start', paddingHorizontal: space.md, paddingVertical: space.xs + 2, borderRadius: radius.pill, borderWidth: 1, borderColor: colors.lineStrong, backgroundColor: colors.surface },
  on: { borderColor: colors.cover, backgroundColor: colors.coverWash },
});
