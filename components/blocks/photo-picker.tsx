import { Text } from '@/components/ui';

// Photo upload ships on the web first; the native app will use the system picker.
export function PhotoPicker(_props: { onPick: (files: File[]) => void; disabled?: boolean; label: string }) {
  return (
    <Text variant="caption" tone="muted">
      Add photos from the web app for now.
    </Text>
  );
}
