import { Text } from './text';

/** Under an input: its error (announced), else its hint. */
export function FieldMessage({ error, hint }: { error?: string | null; hint?: string }) {
  if (error) {
    return (
      <Text variant="caption" tone="danger" role="alert">
        {error}
      </Text>
    );
  }
  return hint ? (
    <Text variant="caption" tone="muted">
      {hint}
    </Text>
  ) : null;
}
