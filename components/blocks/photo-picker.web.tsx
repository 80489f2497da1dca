import { useRef } from 'react';
import { Button } from '@/components/ui';
import { PHOTO_TYPES } from '@/lib/schemas/block';

// A hidden <input type="file"> behind our own button: phones offer the camera or the library.
// The server checks each file's content (JPEG, PNG or WebP by its magic bytes), not its name.
export function PhotoPicker({ onPick, disabled, label }: { onPick: (files: File[]) => void; disabled?: boolean; label: string }) {
  const input = useRef<HTMLInputElement>(null);
  return (
    <>
      <input
        ref={input}
        type="file"
        accept={PHOTO_TYPES.join(',')}
        multiple
        aria-label={label}
        data-testid="photo-input"
        style={{ display: 'none' }}
        onChange={(e) => {
          const files = Array.from(e.currentTarget.files ?? []);
          e.currentTarget.value = '';
          if (files.length) onPick(files);
        }}
      />
      <Button title={label} variant="secondary" compact disabled={disabled} onPress={() => input.current?.click()} />
    </>
  );
}
