import { FontDisplay, useFonts } from 'expo-font';

// The TTFs live in assets/fonts (copied from the OFL-licensed @expo-google-fonts packages) and ship in the bundle:
// no font is fetched from outside. The PDF renderer registers the same files.
// `swap` lets the browser paint text in a fallback face at once instead of hiding it until the TTF arrives.
const face = (uri: number) => ({ uri, display: FontDisplay.SWAP });

export function useAppFonts() {
  return useFonts({
    PublicSans_400Regular: face(require('../assets/fonts/PublicSans_400Regular.ttf')),
    PublicSans_600SemiBold: face(require('../assets/fonts/PublicSans_600SemiBold.ttf')),
    PublicSans_700Bold: face(require('../assets/fonts/PublicSans_700Bold.ttf')),
    Bitter_600SemiBold: face(require('../assets/fonts/Bitter_600SemiBold.ttf')),
    Bitter_700Bold: face(require('../assets/fonts/Bitter_700Bold.ttf')),
  });
}
