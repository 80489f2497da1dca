import type { ReactNode } from 'react';
import { StyleSheet, View } from 'react-native';
import { useLayout } from '@/hooks/use-layout';
import { space } from './theme';

/** Main content and a side column: stacked on a phone, side by side from the wide breakpoint. */
export function TwoPane({ main, side }: { main: ReactNode; side: ReactNode }) {
  const { isWide } = useLayout();
  return (
    <View style={[styles.panes, isWide && styles.panesWide]}>
      <View style={[styles.main, isWide && styles.mainWide]}>{main}</View>
      <View style={[styles.side, isWide && styles.sideWide]}>{side}</View>
    </View>
  );
}

const styles = StyleSheet.create({
  panes: { gap: space.lg },
  panesWide: { flexDirection: 'row', alignItems: 'flex-start' },
  main: { gap: space.md },
  mainWide: { flex: 2 },
  side: { gap: space.md },
  sideWide: { flex: 1, minWidth: 280 },
});
