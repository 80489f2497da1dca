import { useState } from 'react';
import { Image, StyleSheet, View } from 'react-native';
import { MAX_PHOTOS_PER_BLOCK, type BlockView } from '@/lib/schemas/block';
import { Button, Card, Notice, Text } from '@/components/ui';
import { colors, radius, space } from '@/components/ui/theme';
import { useDeletePhoto, useUploadPhoto } from '@/hooks/api/blocks';
import { ApiError } from '@/hooks/api/client';
import { PhotoPicker } from './photo-picker';
import { photoSrc } from './photo-strip';

/** The owner's photos of a block: upload one at a time (each checked by the server), remove any. */
export function BlockPhotos({ block }: { block: BlockView }) {
  const upload = useUploadPhoto(block.id);
  const remove = useDeletePhoto(block.id);
  const [problems, setProblems] = useState<string[]>([]);
  const room = MAX_PHOTOS_PER_BLOCK - block.photos.length;
  const editable = block.status === 'draft' || block.status === 'open';

  async function add(files: File[]) {
    const errors: string[] = [];
    for (const f of files.slice(0, Math.max(0, room))) {
      try {
        await upload.mutateAsync(f);
      } catch (err) {
        errors.push(`${f.name}: ${err instanceof ApiError ? (Object.values(err.fields)[0] ?? err.message) : 'upload failed'}`);
      }
    }
    if (files.length > room) errors.push(`Only ${MAX_PHOTOS_PER_BLOCK} photos per block; ${files.length - room} not added.`);
    setProblems(errors);
  }

  return (
    <Card>
      <Text variant="heading">Photos</Text>
      <Text variant="caption" tone="muted">
        Up to {MAX_PHOTOS_PER_BLOCK} JPEG, PNG or WebP photos, 8 MB each: the cover, gates, water, hazards. Only people who may see the block see them.
      </Text>
      <View style={styles.grid}>
        {block.photos.map((p, i) => (
          <View key={p.id} style={styles.tile}>
            <Image source={{ uri: photoSrc(p.url) }} style={styles.img} accessibilityLabel={`Block photo ${i + 1}`} />
            {editable ? <Button title="Remove" variant="quiet" compact loading={remove.isPending && remove.variables === p.id} onPress={() => remove.mutate(p.id)} /> : null}
          </View>
        ))}
      </View>
      {problems.length ? (
        <Notice tone="danger" title="Some photos were not added">
          {problems.join('\n')}
        </Notice>
      ) : null}
      {editable && room > 0 ? <PhotoPicker label={upload.isPending ? 'Uploading…' : 'Add photos'} disabled={upload.isPending} onPick={(f) => void add(f)} /> : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
  tile: { width: 132, gap: 2 },
  img: { width: 132, height: 96, borderRadius: radius.md, backgroundColor: colors.surfaceSunk },
});
