import { useWindowDimensions } from 'react-native';
import { breakpoints } from '@/components/ui/theme';

/** Phone-first: one column below `medium`; from `wide` the shell shows side navigation and screens may use two panes. */
export function useLayout() {
  const { width } = useWindowDimensions();
  return { width, isWide: width >= breakpoints.wide, isMedium: width >= breakpoints.medium };
}
