/** On native a style names exactly the face registered with expo-font. */
export function withFallback(face: string, _fallback: 'sans' | 'slab'): string {
  return face;
}
