import { useFonts } from 'expo-font';

// Native apps register the TTFs in assets/fonts (copied from the OFL-licensed @expo-google-fonts packages) — the same
// files the PDF renderer uses. The browser loads WOFF2 subsets instead: see use-app-fonts.web.ts.
export function useAppFonts() {
  return useFonts({
    PublicSans_400Regular: require('../assets/fonts/PublicSans_400Regular.ttf'),
    PublicSans_600SemiBold: require('../assets/fonts/PublicSans_600SemiBold.ttf'),
    PublicSans_700Bold: require('../assets/fonts/PublicSans_700Bold.ttf'),
    Bitter_600SemiBold: require('../assets/fonts/Bitter_600SemiBold.ttf'),
    Bitter_700Bold: require('../assets/fonts/Bitter_700Bold.ttf'),
  });
}
