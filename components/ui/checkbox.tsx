import { Pressable, StyleSheet, View } from 'react-native';
import { Text } from './text';
import { FieldMessage } from './field-message';
import { colors, radius, space } from './theme';

export interface CheckboxProps {
  label: string;
  checked: boolean;
  onChange: (checked: boolean) => void;
  error?: string | null;
  hint?: string;
  testID?: string;
}

/** A tick with its label, the whole row pressable (56 px tall: a gloved thumb finds it). */
export function Checkbox({ label, checked, onChange, error, hint, testID }: CheckboxProps) {
  return (
    <View style={styles.wrap}>
      <Pressable role="checkbox" aria-checked={checked} aria-label={label} aria-invalid={!!error} testID={testID} onPress={() => onChange(!checked)} style={[styles.row, !!error && styles.rowInvalid]}>
        <View style={[styles.box, checked && styles.boxOn, !!error && styles.boxInvalid]}>
          {checked ? (
            <Text variant="label" tone="onCover" style={styles.tick}>
              ✓
            </Text>
          ) : null}
        </View>
        <Text style={styles.label}>{label}</Text>
      </Pressable>
      <FieldMessage error={error} hint={hint} />
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.md, minHeight: 56, paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: colors.line, backgroundColor: colors.surface },
  rowInvalid: { borderColor: colors.danger },
  box: { width: 28, height: 28, borderRadius: radius.sm, borderWidth: 2, borderColor: colors.lineStrong, alignItems: 'center', justifyContent: 'center', backgroundColor: colors.surface },
  boxOn: { backgroundColor: colors.cover, borderColor: colors.cover },
  boxInvalid: { borderColor: colors.danger },
  tick: { fontSize: 18, lineHeight: 20 },
  label: { flex: 1 },
});
