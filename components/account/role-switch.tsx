import { View } from 'react-native';
import { Button, Card, Text } from '@/components/ui';
import { space } from '@/components/ui/theme';
import { useUpdateProfile } from '@/hooks/api/account';
import { useActiveRole, useSession } from '@/hooks/auth/session';
import { ROLE_LABELS } from '@/lib/roles';

/** Accounts that both own land and run a flock switch which side they are working on. */
export function RoleSwitch() {
  const { user } = useSession();
  const active = useActiveRole();
  const update = useUpdateProfile();
  const both = user?.roles.includes('grower') && user?.roles.includes('grazier');
  if (!both || !active) return null;
  const other = active === 'grower' ? 'grazier' : 'grower';
  return (
    <Card>
      <Text variant="heading">Working as a {ROLE_LABELS[active].toLowerCase()}</Text>
      <Text tone="muted">Your account is both a grower and a grazier. Switch to see the other side's blocks, bids and contracts.</Text>
      <View style={{ marginTop: space.xs, alignSelf: 'flex-start' }}>
        <Button title={`Switch to ${ROLE_LABELS[other].toLowerCase()}`} variant="secondary" loading={update.isPending} onPress={() => update.mutate({ activeRole: other })} />
      </View>
    </Card>
  );
}
