import { Stack, useLocalSearchParams, useRouter } from 'expo-router';
import { ErrorState, LoadingState, Screen } from '@/components/ui';
import { BlockForm } from '@/components/blocks/block-form';
import { blockFormFromView } from '@/components/blocks/block-form-values';
import { useBlock, useUpdateBlock } from '@/hooks/api/blocks';

export default function EditBlockScreen() {
  const { blockId } = useLocalSearchParams<{ blockId: string }>();
  const router = useRouter();
  const block = useBlock(blockId);
  const update = useUpdateBlock(blockId);
  if (block.isPending) return <LoadingState />;
  if (block.isError) return <ErrorState message={block.error.message} onRetry={() => block.refetch()} />;
  return (
    <>
      <Stack.Screen options={{ title: `Edit ${block.data.name} · Fieldfold` }} />
      <Screen back={{ label: 'Back to the block', href: `/blocks/${blockId}` }} title={`Edit ${block.data.name}`} subtitle="Changes to an open block are checked against the bids already placed.">
        <BlockForm
          initialValues={blockFormFromView(block.data)}
          submitLabel="Save changes"
          onSubmit={async (input) => {
            await update.mutateAsync(input);
            router.replace(`/blocks/${blockId}`);
          }}
        />
      </Screen>
    </>
  );
}
