import { ActivityIndicator, Pressable, StyleSheet, View, type PressableProps } from 'react-native';
import { Text } from './text';
import { colors, radius, space } from './theme';

export interface ButtonProps extends Omit<PressableProps, 'children'> {
  title: string;
  variant?: 'primary' | 'secondary' | 'quiet' | 'danger';
  loading?: boolean;
  compact?: boolean;
  /** Gloves-on size for the field screens (the grazing log): at least 56 px tall. */
  large?: boolean;
}

export function Button({ title, variant = 'primary', loading, disabled, compact, large, style, ...rest }: ButtonProps) {
  const inactive = disabled || loading;
  return (
    <Pressable
      role="button"
      accessibilityState={{ disabled: !!inactive, busy: !!loading }}
      disabled={inactive}
      style={(state) => [
        styles.base,
        compact && styles.compact,
        large && styles.large,
        styles[variant],
        (state as { hovered?: boolean }).hovered && !inactive && styles[`${variant}Hover`],
        state.pressed && !inactive && styles.pressed,
        inactive && styles.inactive,
        typeof style === 'function' ? style(state) : style,
      ]}
      {...rest}
    >
      <View style={styles.row}>
        {loading ? <ActivityIndicator size="small" color={variant === 'primary' || variant === 'danger' ? colors.onCover : colors.cover} /> : null}
        <Text variant="label" style={[styles.label, large && styles.largeLabel, { color: labelColor[variant] }]}>
          {title}
        </Text>
      </View>
    </Pressable>
  );
}

const labelColor = { primary: colors.onCover, secondary: colors.coverDeep, quiet: colors.cover, danger: colors.onCover } as const;

const styles = StyleSheet.create({
  base: {
    minHeight: 44,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    borderRadius: radius.md,
    alignItems: 'center',
    justifyContent: 'center',
    borderWidth: 1,
    borderColor: 'transparent',
  },
  compact: { minHeight: 36, paddingHorizontal: space.md },
  large: { minHeight: 56, paddingHorizontal: space.xl },
  largeLabel: { fontSize: 17 },
  row: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
  label: { fontSize: 15 },
  primary: { backgroundColor: colors.cover },
  primaryHover: { backgroundColor: colors.coverDeep },
  secondary: { backgroundColor: colors.surface, borderColor: colors.lineStrong },
  secondaryHover: { backgroundColor: colors.coverWash },
  quiet: { backgroundColor: 'transparent' },
  quietHover: { backgroundColor: colors.coverWash },
  danger: { backgroundColor: colors.danger },
  dangerHover: { backgroundColor: '#7E2021' },
  pressed: { opacity: 0.85 },
  inactive: { opacity: 0.55 },
});
