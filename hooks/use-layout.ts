import { useWindowDimensions } from 'react-native';
import { breakpoints } from '@/components/ui/theme';
import { useHydrated } from './use-hydrated';

/** Phone-first: one column below `medium`; from `wide` the shell shows side navigation and screens may use two panes. */
export function useLayout() {
  const window = useWindowDimensions();
  // The static HTML is rendered phone-first (no window at build time); a wide screen switches right after hydrating.
  const width = useHydrated() ? window.width : 0;
  return { width, isWide: width >= breakpoints.wide, isMedium: width >= breakpoints.medium };
}
