import type { FontSubset } from '@/components/ui/font-subsets';

/** The WOFF2 files scripts/web/fonts.ts cuts from assets/fonts at build time; Metro gives them content-hashed URLs. */
export const WEB_FONT_FILES: Record<string, Record<FontSubset, number>> = {
  PublicSans_400Regular: { core: require('../../assets/fonts/web/PublicSans_400Regular.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_400Regular.latin.woff2') },
  PublicSans_600SemiBold: { core: require('../../assets/fonts/web/PublicSans_600SemiBold.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_600SemiBold.latin.woff2') },
  PublicSans_700Bold: { core: require('../../assets/fonts/web/PublicSans_700Bold.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_700Bold.latin.woff2') },
  Bitter_600SemiBold: { core: require('../../assets/fonts/web/Bitter_600SemiBold.core.woff2'), latin: require('../../assets/fonts/web/Bitter_600SemiBold.latin.woff2') },
  Bitter_700Bold: { core: require('../../assets/fonts/web/Bitter_700Bold.core.woff2'), latin: require('../../assets/fonts/web/Bitter_700Bold.latin.woff2') },
};
