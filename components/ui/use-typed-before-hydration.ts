import type { RefObject } from 'react';
import type { TextInput } from 'react-native';

/** Native screens are not rendered ahead of their code, so nothing can be typed before React runs (see the .web sibling). */
export function useTypedBeforeHydration(_ref: RefObject<TextInput | null>, _value: string | undefined, _onChangeText: ((text: string) => void) | undefined) {}
