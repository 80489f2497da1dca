import { Pressable, StyleSheet, View } from 'react-native';
import type { BottomTabBarProps } from 'expo-router/tabs';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { Link } from 'expo-router';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { useSession } from '@/hooks/auth/session';
import { TABS_BY_ROLE } from '@/lib/navigation';
import { ROLE_LABELS, type SignupRole } from '@/lib/roles';
import { Wordmark } from './wordmark';
import { TabGlyph } from './tab-glyph';

type Props = BottomTabBarProps & { role: SignupRole; wide: boolean };

/** One navigation, two shapes: a bottom bar on a phone, a side rail with the account on a wide screen. */
export function NavBar({ state, navigation, role, wide }: Props) {
  const insets = useSafeAreaInsets();
  const { user } = useSession();
  const tabs = TABS_BY_ROLE[role];
  const current = state.routes[state.index]?.name;

  const items = tabs.map((tab) => {
    const focused = current === tab.name;
    const route = state.routes.find((r) => r.name === tab.name);
    return (
      <Pressable
        key={tab.name}
        role="tab"
        aria-selected={focused}
        aria-label={tab.label}
        testID={`nav-${tab.name}`}
        onPress={() => {
          if (!route) return;
          const event = navigation.emit({ type: 'tabPress', target: route.key, canPreventDefault: true });
          if (!focused && !event.defaultPrevented) navigation.navigate(route.name);
        }}
        style={(s) => [wide ? styles.railItem : styles.barItem, focused && (wide ? styles.railItemOn : styles.barItemOn), (s as { hovered?: boolean }).hovered && !focused && styles.hover]}
      >
        <TabGlyph name={tab.name} active={focused} />
        <Text variant={wide ? 'bodyStrong' : 'caption'} tone={focused ? 'cover' : 'muted'} numberOfLines={1} style={!wide && styles.barLabel}>
          {tab.label}
        </Text>
      </Pressable>
    );
  });

  if (!wide) {
    return (
      <View role="tablist" aria-label={`${ROLE_LABELS[role]} navigation`} style={[styles.bar, { paddingBottom: Math.max(insets.bottom, space.xs) }]}>
        {items}
      </View>
    );
  }
  return (
    <View role="tablist" aria-label={`${ROLE_LABELS[role]} navigation`} style={styles.rail}>
      <View style={styles.railHead}>
        <Wordmark />
        <View style={styles.rolePill}>
          <Text variant="caption" tone="cover">
            {ROLE_LABELS[role]}
          </Text>
        </View>
      </View>
      <View style={styles.railItems}>{items}</View>
      <View style={styles.railFoot}>
        <Link href="/calculator">
          <Text tone="cover" variant="label">
            Forage calculator
          </Text>
        </Link>
        {user ? (
          <Text variant="caption" tone="muted" numberOfLines={1}>
            {user.name}
            {user.businessName ? ` · ${user.businessName}` : ''}
          </Text>
        ) : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: { flexDirection: 'row', backgroundColor: colors.surface, borderTopWidth: 1, borderTopColor: colors.line, paddingTop: space.xs },
  barItem: { flex: 1, alignItems: 'center', gap: 3, paddingVertical: space.xs, minHeight: 52, justifyContent: 'center', borderRadius: radius.sm },
  barItemOn: {},
  barLabel: { fontSize: 12 },
  rail: { width: 248, backgroundColor: colors.surface, borderRightWidth: 1, borderRightColor: colors.line, paddingVertical: space.xl, paddingHorizontal: space.md, gap: space.xl },
  railHead: { gap: space.sm, paddingHorizontal: space.sm },
  rolePill: { alignSelf: 'flex-start', backgroundColor: colors.coverWash, paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.pill },
  railItems: { gap: space.xxs, flex: 1 },
  railItem: { flexDirection: 'row', alignItems: 'center', gap: space.md, paddingHorizontal: space.md, minHeight: 44, borderRadius: radius.md },
  railItemOn: { backgroundColor: colors.coverWash },
  hover: { backgroundColor: colors.surfaceSunk },
  railFoot: { gap: space.sm, paddingHorizontal: space.sm },
});
