import { Stack, useRouter } from 'expo-router';
import { Screen } from '@/components/ui';
import { BlockForm } from '@/components/blocks/block-form';
import { emptyBlockForm } from '@/components/blocks/block-form-values';
import { useCreateBlock } from '@/hooks/api/blocks';
import { useSession } from '@/hooks/auth/session';

export default function NewBlockScreen() {
  const router = useRouter();
  const { user } = useSession();
  const create = useCreateBlock();
  const home = { latitude: user?.homeLatitude ?? null, longitude: user?.homeLongitude ?? null, place: user?.homePlace ?? null };
  return (
    <>
      <Stack.Screen options={{ title: 'Post a block · Fieldfold' }} />
      <Screen back={{ label: 'My blocks', href: '/' }} title="Post a block" subtitle="Describe the ground, the forage on it and the dates. It stays a draft until you open it for bids.">
        <BlockForm
          initialValues={emptyBlockForm(home)}
          home={home}
          submitLabel="Save draft"
          onSubmit={async (input) => {
            const block = await create.mutateAsync(input);
            router.replace(`/blocks/${block.id}`);
          }}
        />
      </Screen>
    </>
  );
}
