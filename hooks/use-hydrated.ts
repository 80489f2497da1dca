import { useSyncExternalStore } from 'react';

const never = () => () => {};

/**
 * False while React hydrates a page rendered at build time (there was no window to measure), true afterwards and
 * on every render that is not a hydration. A component that reads the window uses the build's value until then,
 * so the first client render matches the HTML instead of discarding it.
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    never,
    () => true,
    () => false,
  );
}
