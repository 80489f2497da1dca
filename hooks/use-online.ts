import { useSyncExternalStore } from 'react';
import { onlineManager } from '@tanstack/react-query';

/** Whether the device says it has a connection (react-query follows the browser's online/offline events). */
export function useOnline(): boolean {
  return useSyncExternalStore(
    (onChange) => onlineManager.subscribe(onChange),
    () => onlineManager.isOnline(),
    () => true,
  );
}
