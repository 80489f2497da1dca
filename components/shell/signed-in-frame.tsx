import { StyleSheet, View } from 'react-native';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { LoadingState } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { useLayout } from '@/hooks/use-layout';
import { Wordmark } from './wordmark';

const PLACES = 5;

/**
 * The signed-in area's frame while the session restores: where the navigation will be (a bottom bar on a phone, a
 * rail on a wide screen) and a loading state where the screen will be. Every signed-in page's HTML is this frame,
 * rendered at build time, when nobody is signed in; the tabs appear once the account (and so its role) is known.
 */
export function SignedInFrame({ label }: { label: string }) {
  const { isWide } = useLayout();
  const insets = useSafeAreaInsets();
  const places = Array.from({ length: PLACES }, (_, i) => <View key={i} style={isWide ? styles.railPlace : styles.barPlace} />);
  return (
    <View style={[styles.root, isWide && styles.rootWide]}>
      {isWide ? (
        <View style={styles.rail}>
          <View style={styles.railHead}>
            <Wordmark />
          </View>
          <View style={styles.railPlaces}>{places}</View>
        </View>
      ) : null}
      <View style={styles.content}>
        {isWide ? null : (
          <View style={[styles.phoneHead, { paddingTop: Math.max(insets.top, space.lg) }]}>
            <Wordmark />
          </View>
        )}
        <View style={styles.loading}>
          <LoadingState label={label} />
        </View>
      </View>
      {isWide ? null : <View style={[styles.bar, { paddingBottom: Math.max(insets.bottom, space.xs) }]}>{places}</View>}
    </View>
  );
}

// The rail and bar measure as components/shell/nav-bar.tsx draws them, so nothing moves when the tabs arrive.
const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  rootWide: { flexDirection: 'row' },
  rail: { width: 248, backgroundColor: colors.surface, borderRightWidth: 1, borderRightColor: colors.line, paddingVertical: space.xl, paddingHorizontal: space.md, gap: space.xl },
  railHead: { paddingHorizontal: space.sm },
  railPlaces: { gap: space.xxs },
  railPlace: { height: 44, marginHorizontal: space.sm, marginVertical: 2, borderRadius: radius.md, backgroundColor: colors.surfaceSunk, opacity: 0.6 },
  content: { flex: 1 },
  phoneHead: { paddingHorizontal: space.lg },
  loading: { flex: 1, justifyContent: 'center' },
  bar: { flexDirection: 'row', backgroundColor: colors.surface, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs, gap: space.sm, paddingHorizontal: space.sm },
  barPlace: { flex: 1, height: 44, marginVertical: 4, borderRadius: radius.sm, backgroundColor: colors.surfaceSunk, opacity: 0.6 },
});
