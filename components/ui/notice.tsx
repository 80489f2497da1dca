import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { Text } from './text';
import { colors, radius, space } from './theme';

const tones = {
  caution: { bg: colors.cautionWash, line: colors.cautionLine, text: 'caution' as const, mark: '!' },
  danger: { bg: colors.dangerWash, line: colors.danger, text: 'danger' as const, mark: '×' },
  info: { bg: colors.skyWash, line: colors.sky, text: 'ink' as const, mark: 'i' },
  ok: { bg: colors.coverWash, line: colors.cover, text: 'ink' as const, mark: '✓' },
};

/** A boxed message: cautions that protect people, animals and crops, and errors that need the reader. */
export function Notice({ tone = 'info', title, children }: { tone?: keyof typeof tones; title?: string; children?: ReactNode }) {
  const t = tones[tone];
  return (
    <View style={[styles.box, { backgroundColor: t.bg, borderLeftColor: t.line }]} role={tone === 'danger' ? 'alert' : undefined}>
      <View style={[styles.mark, { borderColor: t.line }]}>
        <Text variant="label" tone={t.text}>
          {t.mark}
        </Text>
      </View>
      <View style={styles.body}>
        {title ? (
          <Text variant="label" tone={t.text}>
            {title}
          </Text>
        ) : null}
        {typeof children === 'string' ? <Text variant="caption">{children}</Text> : children}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  box: { flexDirection: 'row', gap: space.md, padding: space.md, borderRadius: radius.md, borderLeftWidth: 4 },
  mark: { width: 22, height: 22, borderRadius: 11, borderWidth: 1.5, alignItems: 'center', justifyContent: 'center', marginTop: 1 },
  body: { flex: 1, gap: space.xxs },
});
