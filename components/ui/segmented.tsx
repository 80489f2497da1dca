import { Pressable, StyleSheet, View } from 'react-native';
import { Text } from './text';
import { colors, radius, space } from './theme';

export interface SegmentedProps<T extends string> {
  label: string;
  value: T;
  options: ReadonlyArray<{ value: T; label: string }>;
  onChange: (value: T) => void;
}

/** A row of mutually exclusive choices (a radio group drawn as joined buttons). */
export function Segmented<T extends string>({ label, value, options, onChange }: SegmentedProps<T>) {
  return (
    <View style={{ gap: space.xs }}>
      <Text variant="label">{label}</Text>
      <View style={styles.row} role="radiogroup" aria-label={label}>
        {options.map((o, i) => {
          const on = o.value === value;
          return (
            <Pressable
              key={o.value}
              role="radio"
              aria-checked={on}
              aria-label={o.label}
              onPress={() => onChange(o.value)}
              style={[styles.item, i === 0 && styles.first, i === options.length - 1 && styles.last, on && styles.on]}
            >
              <Text variant="label" tone={on ? 'onCover' : 'ink'} style={styles.text}>
                {o.label}
              </Text>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row' },
  item: { flex: 1, minHeight: 40, alignItems: 'center', justifyContent: 'center', paddingHorizontal: space.sm, borderWidth: 1, borderColor: colors.lineStrong, marginLeft: -1, backgroundColor: colors.surface },
  first: { borderTopLeftRadius: radius.md, borderBottomLeftRadius: radius.md, marginLeft: 0 },
  last: { borderTopRightRadius: radius.md, borderBottomRightRadius: radius.md },
  on: { backgroundColor: colors.cover, borderColor: colors.cover, zIndex: 1 },
  text: { textAlign: 'center', fontSize: 14 },
});
