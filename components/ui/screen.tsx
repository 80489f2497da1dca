import type { ReactNode } from 'react';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';
import { useRouter, type Href } from 'expo-router';
import { useSafeAreaInsets } from 'react-native-safe-area-context';
import { useLayout } from '@/hooks/use-layout';
import { Text } from './text';
import { colors, contentMaxWidth, space } from './theme';

export interface ScreenProps {
  title?: string;
  subtitle?: string;
  actions?: ReactNode;
  children: ReactNode;
  /** Narrow forms read better at a measure than spread across a laptop screen. */
  narrow?: boolean;
  scroll?: boolean;
  /** Detail screens sit outside the tabs: a way back to where they belong. */
  back?: { label: string; href: Href };
}

export function Screen({ title, subtitle, actions, children, narrow, scroll = true, back }: ScreenProps) {
  const router = useRouter();
  const { isMedium } = useLayout();
  const insets = useSafeAreaInsets();
  const body = (
    <View style={[styles.inner, { maxWidth: narrow ? 560 : contentMaxWidth, paddingHorizontal: isMedium ? space.xxl : space.lg, paddingTop: Math.max(insets.top, space.lg) }]}>
      {back ? (
        <Pressable role="link" onPress={() => (router.canGoBack() ? router.back() : router.replace(back.href))} style={styles.back}>
          <Text variant="label" tone="cover">
            ← {back.label}
          </Text>
        </Pressable>
      ) : null}
      {title ? (
        <View style={[styles.header, isMedium && styles.headerWide]}>
          <View style={styles.headerText}>
            <Text variant={isMedium ? 'display' : 'title'}>{title}</Text>
            {subtitle ? <Text tone="muted">{subtitle}</Text> : null}
          </View>
          {actions ? <View style={styles.actions}>{actions}</View> : null}
        </View>
      ) : null}
      {children}
    </View>
  );
  if (!scroll) return <View style={styles.root}>{body}</View>;
  return (
    <ScrollView style={styles.root} contentContainerStyle={[styles.content, { paddingBottom: space.xxxl + insets.bottom }]} keyboardShouldPersistTaps="handled">
      {body}
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  content: { flexGrow: 1 },
  inner: { width: '100%', alignSelf: 'center', gap: space.lg },
  header: { gap: space.md, marginBottom: space.xs },
  back: { alignSelf: 'flex-start', paddingVertical: space.xs },
  headerWide: { flexDirection: 'row', alignItems: 'flex-end', justifyContent: 'space-between' },
  headerText: { gap: space.xs, flexShrink: 1 },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
});
