import type { FontSubset } from '@/components/ui/font-subsets';

/** The id of the page's @font-face style element (web-fonts.tsx); hooks/use-app-fonts.web.ts switches it on. */
export const WEB_FONT_STYLE_ID = 'fieldfold-fonts';

/** The WOFF2 files scripts/web/fonts.ts cuts from assets/fonts at build time; Metro gives them content-hashed URLs. */
export const WEB_FONT_FILES: Record<string, Record<FontSubset, number>> = {
  PublicSans_400Regular: { core: require('../../assets/fonts/web/PublicSans_400Regular.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_400Regular.latin.woff2') },
  PublicSans_600SemiBold: { core: require('../../assets/fonts/web/PublicSans_600SemiBold.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_600SemiBold.latin.woff2') },
  PublicSans_700Bold: { core: require('../../assets/fonts/web/PublicSans_700Bold.core.woff2'), latin: require('../../assets/fonts/web/PublicSans_700Bold.latin.woff2') },
  Bitter_600SemiBold: { core: require('../../assets/fonts/web/Bitter_600SemiBold.core.woff2'), latin: require('../../assets/fonts/web/Bitter_600SemiBold.latin.woff2') },
  Bitter_700Bold: { core: require('../../assets/fonts/web/Bitter_700Bold.core.woff2'), latin: require('../../assets/fonts/web/Bitter_700Bold.latin.woff2') },
};
