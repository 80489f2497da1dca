import { forwardRef, useImperativeHandle, useRef, useState } from 'react';
import { StyleSheet, TextInput, View, type TextInputProps } from 'react-native';
import { Text } from './text';
import { FieldMessage } from './field-message';
import { colors, fonts, radius, space } from './theme';
import { useTypedBeforeHydration } from './use-typed-before-hydration';

export interface TextFieldProps extends TextInputProps {
  label: string;
  error?: string | null;
  hint?: string;
  unit?: string;
}

export const TextField = forwardRef<TextInput, TextFieldProps>(function TextField({ label, error, hint, unit, style, onFocus, onBlur, ...rest }, ref) {
  const [focused, setFocused] = useState(false);
  const input = useRef<TextInput>(null);
  useImperativeHandle(ref, () => input.current as TextInput);
  useTypedBeforeHydration(input, rest.value, rest.onChangeText);
  return (
    <View style={styles.wrap}>
      <Text variant="label" nativeID={rest.nativeID ? `${rest.nativeID}-label` : undefined}>
        {label}
      </Text>
      <View style={[styles.box, focused && styles.focused, !!error && styles.invalid]}>
        <TextInput
          ref={input}
          aria-label={label}
          aria-invalid={!!error}
          placeholderTextColor={colors.inkFaint}
          style={[styles.input, style]}
          onFocus={(e) => {
            setFocused(true);
            onFocus?.(e);
          }}
          onBlur={(e) => {
            setFocused(false);
            onBlur?.(e);
          }}
          {...rest}
        />
        {unit ? (
          <Text variant="caption" tone="muted" style={styles.unit}>
            {unit}
          </Text>
        ) : null}
      </View>
      <FieldMessage error={error} hint={hint} />
    </View>
  );
});

const styles = StyleSheet.create({
  wrap: { gap: space.xs },
  box: {
    flexDirection: 'row',
    alignItems: 'center',
    borderWidth: 1,
    borderColor: colors.lineStrong,
    borderRadius: radius.sm,
    backgroundColor: colors.surface,
  },
  focused: { borderColor: colors.cover, borderWidth: 2, marginVertical: -1, marginHorizontal: -1 },
  invalid: { borderColor: colors.danger },
  input: {
    flex: 1,
    minWidth: 0, // web inputs have an intrinsic width; without this a unit label is pushed out of a narrow box
    minHeight: 44,
    paddingHorizontal: space.md,
    fontFamily: fonts.body,
    fontSize: 16,
    color: colors.ink,
    outlineStyle: 'none',
  } as object,
  unit: { paddingRight: space.md },
});
