import { StyleSheet, View } from 'react-native';
import { colors } from '@/components/ui/theme';
import type { TabName } from '@/lib/navigation';

/**
 * Small drawn glyphs for the navigation, made of Views so no icon font ships:
 * blocks = a field of rows, bids = a raised hand of bars, contracts = a page, invoices = a receipt, account = a head.
 */
export function TabGlyph({ name, active }: { name: TabName; active: boolean }) {
  const c = active ? colors.cover : colors.inkFaint;
  switch (name) {
    case 'index':
      return (
        <View style={[styles.box, { borderColor: c }]}>
          {[0, 1, 2].map((i) => (
            <View key={i} style={[styles.row, { backgroundColor: c }]} />
          ))}
        </View>
      );
    case 'bids':
      return (
        <View style={styles.bars}>
          {[8, 14, 11].map((h, i) => (
            <View key={i} style={{ width: 4, height: h, borderRadius: 1, backgroundColor: c }} />
          ))}
        </View>
      );
    case 'contracts':
      return (
        <View style={[styles.page, { borderColor: c }]}>
          <View style={[styles.line, { backgroundColor: c, width: 8 }]} />
          <View style={[styles.line, { backgroundColor: c, width: 6 }]} />
        </View>
      );
    case 'invoices':
      return (
        <View style={[styles.page, { borderColor: c, borderStyle: 'dashed' }]}>
          <View style={[styles.line, { backgroundColor: c, width: 8 }]} />
        </View>
      );
    case 'account':
      return (
        <View style={styles.person}>
          <View style={[styles.head, { borderColor: c }]} />
          <View style={[styles.shoulders, { borderColor: c }]} />
        </View>
      );
  }
}

const styles = StyleSheet.create({
  box: { width: 20, height: 16, borderWidth: 1.5, borderRadius: 3, justifyContent: 'space-evenly', paddingHorizontal: 3 },
  row: { height: 1.5, borderRadius: 1 },
  bars: { width: 20, height: 16, flexDirection: 'row', alignItems: 'flex-end', justifyContent: 'center', gap: 2 },
  page: { width: 15, height: 18, borderWidth: 1.5, borderRadius: 2, padding: 2.5, gap: 2.5 },
  line: { height: 1.5 },
  person: { width: 20, height: 18, alignItems: 'center' },
  head: { width: 8, height: 8, borderRadius: 4, borderWidth: 1.5 },
  shoulders: { width: 16, height: 8, borderTopLeftRadius: 8, borderTopRightRadius: 8, borderWidth: 1.5, borderBottomWidth: 0, marginTop: 1 },
});
