import type { ErrorBoundaryProps } from 'expo-router';
import { View } from 'react-native';
import { Button, Text } from '@/components/ui';
import { colors, space } from '@/components/ui/theme';

/** Shown by Expo Router when a screen throws while rendering. */
export function ErrorBoundary({ error, retry }: ErrorBoundaryProps) {
  return (
    <View style={{ flex: 1, alignItems: 'center', justifyContent: 'center', gap: space.md, padding: space.xl, backgroundColor: colors.paper }} role="alert">
      <Text variant="title">This screen stopped working</Text>
      <Text tone="muted" style={{ textAlign: 'center', maxWidth: 480 }}>
        Nothing you saved is lost. Try again; if it keeps happening, tell us what you were doing. ({error.message})
      </Text>
      <Button title="Try again" onPress={retry} />
    </View>
  );
}
