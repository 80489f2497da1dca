import { useFonts } from 'expo-font';

// The TTFs live in assets/fonts (copied from the OFL-licensed @expo-google-fonts packages) and ship in the bundle:
// no font is fetched at run time. The PDF renderer registers the same files.
export function useAppFonts() {
  return useFonts({
    PublicSans_400Regular: require('../assets/fonts/PublicSans_400Regular.ttf'),
    PublicSans_600SemiBold: require('../assets/fonts/PublicSans_600SemiBold.ttf'),
    PublicSans_700Bold: require('../assets/fonts/PublicSans_700Bold.ttf'),
    Bitter_600SemiBold: require('../assets/fonts/Bitter_600SemiBold.ttf'),
    Bitter_700Bold: require('../assets/fonts/Bitter_700Bold.ttf'),
  });
}
