import { GrazierHome } from '@/components/home/grazier-home';
import { GrowerHome } from '@/components/home/grower-home';
import { useActiveRole } from '@/hooks/auth/session';

export default function HomeScreen() {
  return useActiveRole() === 'grazier' ? <GrazierHome /> : <GrowerHome />;
}
