import { useEffect, useState } from 'react';
import { Pressable, StyleSheet, TextInput, View } from 'react-native';
import { Text } from './text';
import { FieldMessage } from './field-message';
import { colors, fonts, radius, space } from './theme';

export interface StepperProps {
  label: string;
  value: number | null;
  onChange: (value: number | null) => void;
  min?: number;
  max?: number;
  /** The buttons either side, smallest first: [1, 10] gives −10 −1 … +1 +10. */
  steps?: readonly number[];
  unit?: string;
  error?: string | null;
  hint?: string;
}

/**
 * A whole number with big − and + either side (56 px, for gloves and a bouncing truck) and the number
 * itself typeable in the middle for a count that is far from the prefilled one.
 */
export function Stepper({ label, value, onChange, min = 0, max = 20_000, steps = [1, 10], unit, error, hint }: StepperProps) {
  const [text, setText] = useState(value == null ? '' : String(value));
  useEffect(() => {
    if ((text.trim() === '' ? null : Number(text)) !== value) setText(value == null ? '' : String(value));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  const clamp = (n: number) => Math.min(max, Math.max(min, n));
  const bump = (by: number) => onChange(clamp((value ?? 0) + by));
  const ordered = [...steps].sort((a, b) => a - b);
  const side = (sign: 1 | -1) =>
    (sign < 0 ? [...ordered].reverse() : ordered).map((s) => {
      const name = `${sign < 0 ? '−' : '+'}${s}`;
      return (
        <Pressable key={name} role="button" aria-label={`${sign < 0 ? 'Minus' : 'Plus'} ${s} ${label.toLowerCase()}`} onPress={() => bump(sign * s)} style={(st) => [styles.step, st.pressed && styles.pressed]}>
          <Text variant="label" tone="cover" style={styles.stepText}>
            {name}
          </Text>
        </Pressable>
      );
    });
  return (
    <View style={styles.wrap}>
      <Text variant="label">{label}</Text>
      <View style={styles.row}>
        {side(-1)}
        <View style={[styles.box, !!error && styles.invalid]}>
          <TextInput
            aria-label={label}
            aria-invalid={!!error}
            value={text}
            inputMode="numeric"
            keyboardType="number-pad"
            selectTextOnFocus
            onChangeText={(t) => {
              setText(t);
              const clean = t.trim();
              if (clean === '') onChange(null);
              else if (/^\d+$/.test(clean)) onChange(Number(clean));
            }}
            style={styles.input}
          />
          {unit ? (
            <Text variant="caption" tone="muted" style={styles.unit}>
              {unit}
            </Text>
          ) : null}
        </View>
        {side(1)}
      </View>
      <FieldMessage error={error} hint={hint} />
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  row: { flexDirection: 'row', alignItems: 'stretch', gap: space.xs },
  step: { minWidth: 52, minHeight: 56, alignItems: 'center', justifyContent: 'center', borderRadius: radius.md, borderWidth: 1, borderColor: colors.lineStrong, backgroundColor: colors.coverWash },
  pressed: { opacity: 0.7 },
  stepText: { fontSize: 17 },
  box: { flex: 1, minWidth: 72, flexDirection: 'row', alignItems: 'center', borderWidth: 1, borderColor: colors.lineStrong, borderRadius: radius.md, backgroundColor: colors.surface },
  invalid: { borderColor: colors.danger },
  input: { flex: 1, minWidth: 0, minHeight: 56, textAlign: 'center', fontFamily: fonts.bodyBold, fontSize: 22, color: colors.ink, outlineStyle: 'none' } as object,
  unit: { paddingRight: space.sm },
});
