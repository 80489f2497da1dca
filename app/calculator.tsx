import { Link, Stack } from 'expo-router';
import { Screen, Text } from '@/components/ui';
import { ForageCalculator } from '@/components/calculator/forage-calculator';
import { useSession } from '@/hooks/auth/session';

// Public: reachable signed out, and linked from every role's home.
export default function CalculatorScreen() {
  const { status } = useSession();
  return (
    <>
      <Stack.Screen options={{ title: 'Forage calculator · Fieldfold' }} />
      <Screen
        title="Forage calculator"
        subtitle="Standing forage, a safe take, and the head-days a block carries."
        actions={
          <Link href={status === 'signed-in' ? '/' : '/sign-in'}>
            <Text tone="cover" variant="bodyStrong">
              {status === 'signed-in' ? '← Back to Fieldfold' : 'Sign in to Fieldfold →'}
            </Text>
          </Link>
        }
      >
        <ForageCalculator />
      </Screen>
    </>
  );
}
