import { Image, ScrollView, StyleSheet } from 'react-native';
import type { BlockPhotoView } from '@/lib/schemas/block';
import { apiUrl } from '@/hooks/api/client';
import { colors, radius, space } from '@/components/ui/theme';

/** The block's photos; each URL carries its own short-lived access token (an <img> cannot send a bearer token). */
export function PhotoStrip({ photos, height = 140 }: { photos: BlockPhotoView[]; height?: number }) {
  if (!photos.length) return null;
  return (
    <ScrollView horizontal contentContainerStyle={styles.row} showsHorizontalScrollIndicator={false}>
      {photos.map((p, i) => (
        <Image key={p.id} source={{ uri: photoSrc(p.url) }} style={[styles.photo, { height, width: height * 1.4 }]} accessibilityLabel={`Block photo ${i + 1}`} />
      ))}
    </ScrollView>
  );
}

/** The view gives a path under the API origin ("/api/…"); in development the API runs on another port. */
export function photoSrc(url: string): string {
  return url.startsWith('/api/') ? apiUrl(url.slice(4)) : url;
}

const styles = StyleSheet.create({
  row: { gap: space.sm },
  photo: { borderRadius: radius.md, backgroundColor: colors.surfaceSunk },
});
