import { Link, Stack } from 'expo-router';
import { Screen, Text } from '@/components/ui';

export default function NotFoundScreen() {
  return (
    <>
      <Stack.Screen options={{ title: 'Not found · Fieldfold' }} />
      <Screen title="Nothing grazes here" subtitle="This page does not exist, or the link is out of date." narrow>
        <Link href="/">
          <Text tone="cover" variant="bodyStrong">
            Go to your home screen
          </Text>
        </Link>
      </Screen>
    </>
  );
}
