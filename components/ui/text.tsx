import { Text as RNText, type TextProps as RNTextProps } from 'react-native';
import { colors, type, type TypeVariant } from './theme';

export interface TextProps extends RNTextProps {
  variant?: TypeVariant;
  tone?: 'ink' | 'muted' | 'faint' | 'cover' | 'clay' | 'danger' | 'caution' | 'onCover' | 'ok';
}

const toneColor = {
  ink: colors.ink,
  muted: colors.inkMuted,
  faint: colors.inkFaint,
  cover: colors.cover,
  clay: colors.clay,
  danger: colors.danger,
  caution: colors.caution,
  onCover: colors.onCover,
  ok: colors.ok,
} as const;

export function Text({ variant = 'body', tone = 'ink', style, ...rest }: TextProps) {
  const role = variant === 'display' || variant === 'title' ? 'heading' : undefined;
  return <RNText role={role} style={[type[variant], { color: toneColor[tone] }, style]} {...rest} />;
}
