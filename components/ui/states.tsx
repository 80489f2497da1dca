import type { ReactNode } from 'react';
import { ActivityIndicator, StyleSheet, View } from 'react-native';
import { Button } from './button';
import { Text } from './text';
import { colors, radius, space } from './theme';

export function LoadingState({ label = 'Loading…' }: { label?: string }) {
  return (
    <View style={styles.center} role="progressbar" aria-label={label}>
      <ActivityIndicator color={colors.cover} />
      <Text tone="muted">{label}</Text>
    </View>
  );
}

export function ErrorState({ message, onRetry }: { message: string; onRetry?: () => void }) {
  return (
    <View style={[styles.center, styles.box, { borderColor: colors.danger }]} role="alert">
      <Text variant="heading" tone="danger">
        That did not load
      </Text>
      <Text tone="muted" style={styles.centerText}>
        {message}
      </Text>
      {onRetry ? <Button title="Try again" variant="secondary" onPress={onRetry} /> : null}
    </View>
  );
}

/** An empty list says what will appear here and what to do first. */
export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <View style={[styles.center, styles.box]}>
      <View style={styles.furrows}>
        {[0, 1, 2].map((i) => (
          <View key={i} style={[styles.furrow, { width: 56 - i * 12 }]} />
        ))}
      </View>
      <Text variant="heading" style={styles.centerText}>
        {title}
      </Text>
      {typeof children === 'string' ? (
        <Text tone="muted" style={styles.centerText}>
          {children}
        </Text>
      ) : (
        children
      )}
      {action}
    </View>
  );
}

const styles = StyleSheet.create({
  center: { alignItems: 'center', justifyContent: 'center', gap: space.md, padding: space.xl },
  centerText: { textAlign: 'center', maxWidth: 460 },
  box: { borderWidth: 1, borderStyle: 'dashed', borderColor: colors.lineStrong, borderRadius: radius.lg, backgroundColor: colors.surface },
  furrows: { alignItems: 'center', gap: 5 },
  furrow: { height: 5, borderRadius: 3, backgroundColor: colors.coverWash },
});
