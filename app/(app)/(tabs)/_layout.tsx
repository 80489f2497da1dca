import { Tabs } from 'expo-router';
import { NavBar } from '@/components/shell/nav-bar';
import { useActiveRole } from '@/hooks/auth/session';
import { useLayout } from '@/hooks/use-layout';
import { TABS_BY_ROLE } from '@/lib/navigation';

export default function TabsLayout() {
  const role = useActiveRole() ?? 'grower';
  const { isWide } = useLayout();
  const visible = new Set(TABS_BY_ROLE[role].map((t) => t.name));
  const labels = Object.fromEntries(TABS_BY_ROLE[role].map((t) => [t.name, t.label]));
  return (
    <Tabs
      tabBar={(props) => <NavBar {...props} role={role} wide={isWide} />}
      screenOptions={{ headerShown: false, tabBarPosition: isWide ? 'left' : 'bottom' }}
    >
      {(['index', 'bids', 'contracts', 'invoices', 'account'] as const).map((name) => (
        <Tabs.Screen
          key={name}
          name={name}
          options={{ title: `${labels[name] ?? name} · Fieldfold`, href: visible.has(name) ? undefined : null }}
        />
      ))}
    </Tabs>
  );
}
