import { FontDisplay, useFonts } from 'expo-font';

// The browser gets WOFF2 subsets of the TTFs (scripts/web/fonts.ts writes assets/fonts/web at build time; the TTFs
// stay whole for the PDF renderer and native). With static rendering, expo-font writes these @font-face rules and
// their preloads into each page's HTML, so useFonts reports them loaded on the first render and hydration matches.
// `swap`: text paints at once in the fallback face (components/ui/font-family.web.ts) and changes face on arrival.
const face = (uri: number) => ({ uri, display: FontDisplay.SWAP });

export function useAppFonts() {
  return useFonts({
    PublicSans_400Regular: face(require('../assets/fonts/web/PublicSans_400Regular.woff2')),
    PublicSans_600SemiBold: face(require('../assets/fonts/web/PublicSans_600SemiBold.woff2')),
    PublicSans_700Bold: face(require('../assets/fonts/web/PublicSans_700Bold.woff2')),
    Bitter_600SemiBold: face(require('../assets/fonts/web/Bitter_600SemiBold.woff2')),
    Bitter_700Bold: face(require('../assets/fonts/web/Bitter_700Bold.woff2')),
  });
}
