import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';
import { Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { useLayout } from '@/hooks/use-layout';
import { Wordmark } from './wordmark';

/** Sign-in and sign-up: a story panel beside the form on a wide screen, a short band above it on a phone. */
export function AuthFrame({ title, children }: { title: string; children: ReactNode }) {
  const { isWide } = useLayout();
  return (
    <ScrollView style={styles.root} contentContainerStyle={[styles.content, isWide && styles.contentWide]} keyboardShouldPersistTaps="handled">
      <View style={[styles.story, isWide ? styles.storyWide : styles.storyPhone]}>
        <Wordmark inverse size={isWide ? 'large' : 'small'} />
        <Text variant={isWide ? 'title' : 'bodyStrong'} tone="onCover" style={styles.lede}>
          Winter cover grazed down, not grazed out.
        </Text>
        {isWide ? (
          <Text tone="onCover" style={styles.storyBody}>
            Growers post blocks of orchard, vineyard and cover crop. Graziers bid head-days for their flocks. Both sides keep one grazing log,
            sign it off, and the invoice writes itself.
          </Text>
        ) : null}
      </View>
      <View style={[styles.formCol, isWide && styles.formColWide]}>
        <View style={styles.form}>
          <Text variant="title">{title}</Text>
          {children}
        </View>
      </View>
    </ScrollView>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: colors.paper },
  content: { flexGrow: 1 },
  contentWide: { flexDirection: 'row' },
  story: { backgroundColor: colors.coverDeep, gap: space.md },
  storyPhone: { paddingHorizontal: space.lg, paddingTop: space.xl, paddingBottom: space.lg },
  storyWide: { width: '42%', padding: space.xxxl, justifyContent: 'center' },
  lede: { maxWidth: 420 },
  storyBody: { opacity: 0.9, maxWidth: 420 },
  formCol: { flex: 1, padding: space.lg, alignItems: 'center' },
  formColWide: { justifyContent: 'center', padding: space.xxxl },
  form: { width: '100%', maxWidth: 420, gap: space.lg, backgroundColor: colors.surface, padding: space.xl, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.line },
});
