import { useEffect, type RefObject } from 'react';
import type { TextInput } from 'react-native';

/**
 * On a slow phone the statically rendered form is on screen seconds before React hydrates it, and people type.
 * React leaves that text in the DOM while hydrating but not in its state, so the next render of the controlled
 * field would wipe it. Right after hydration, hand whatever is already in the field to its onChangeText once.
 */
export function useTypedBeforeHydration(ref: RefObject<TextInput | null>, value: string | undefined, onChangeText: ((text: string) => void) | undefined) {
  useEffect(() => {
    // react-native-web's TextInput ref is the <input> or <textarea> itself.
    const typed = (ref.current as unknown as HTMLInputElement | null)?.value;
    if (typed && typed !== (value ?? '')) onChangeText?.(typed);
    // Once, at mount: afterwards every keystroke goes through onChangeText.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);
}
