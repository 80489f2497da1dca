import { Link } from 'expo-router';
import { Notice, Text } from '@/components/ui';
import { useSession } from '@/hooks/auth/session';

/** Asks for what the market needs from this account: a home base (for distances) and, for graziers, the flock. */
export function ProfileNudge({ role }: { role: 'grower' | 'grazier' }) {
  const { user } = useSession();
  if (!user) return null;
  const missing: string[] = [];
  if (user.homeLatitude == null) missing.push('your home base');
  if (role === 'grazier' && !user.flock) missing.push('your flock');
  if (!missing.length) return null;
  return (
    <Notice tone="info" title={`Add ${missing.join(' and ')}`}>
      <Text variant="caption">
        {role === 'grazier'
          ? 'Fieldfold uses them to show the distance to each block and how many days it feeds your flock. '
          : 'Graziers see how far your blocks are from their yards. '}
        <Link href="/account">
          <Text variant="caption" tone="cover">
            Complete your profile →
          </Text>
        </Link>
      </Text>
    </Notice>
  );
}
