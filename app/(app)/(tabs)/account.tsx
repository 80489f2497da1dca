import { Button, Card, LoadingState, Screen, Text, TwoPane } from '@/components/ui';
import { ProfileForm } from '@/components/account/profile-form';
import { RoleSwitch } from '@/components/account/role-switch';
import { useSession } from '@/hooks/auth/session';
import { ROLE_LABELS } from '@/lib/roles';

export default function AccountScreen() {
  const { user, signOut } = useSession();
  if (!user) return <LoadingState />;
  return (
    <Screen title="Account" subtitle={`${user.email} · ${user.roles.map((r) => ROLE_LABELS[r]).join(' and ')}`}>
      <TwoPane
        main={
          <Card>
            <ProfileForm user={user} />
          </Card>
        }
        side={
          <>
            <RoleSwitch />
            <Card>
              <Text variant="heading">Sign out</Text>
              <Text tone="muted">Signs this device out. Your blocks, bids and logs stay as they are.</Text>
              <Button title="Sign out" variant="secondary" onPress={() => void signOut()} testID="sign-out" />
            </Card>
          </>
        }
      />
    </Screen>
  );
}
