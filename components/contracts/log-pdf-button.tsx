import { useState } from 'react';
import { View } from 'react-native';
import { Button, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { downloadFromApi } from '@/hooks/api/download';
import { logPdfPath } from '@/hooks/api/contracts';

function slug(text: string): string {
  return text.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'contract';
}

/** Saves the grazing log as a PDF (for both parties' files): fetched with the session's token, then saved. */
export function LogPdfButton({ contractId, blockName, large }: { contractId: string; blockName: string; large?: boolean }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <View style={{ gap: space.xs }}>
      <Button
        title="Download the log (PDF)"
        variant="secondary"
        large={large}
        loading={busy}
        testID="download-log-pdf"
        onPress={async () => {
          setBusy(true);
          setError(null);
          try {
            await downloadFromApi(logPdfPath(contractId), `fieldfold-log-${slug(blockName)}.pdf`);
          } catch (err) {
            setError(err instanceof Error ? err.message : 'The PDF could not be downloaded.');
          } finally {
            setBusy(false);
          }
        }}
      />
      {error ? (
        <Text variant="caption" tone="danger" role="alert">
          {error}
        </Text>
      ) : null}
    </View>
  );
}
