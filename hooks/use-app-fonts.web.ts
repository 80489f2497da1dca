import { useEffect } from 'react';
import { WEB_FONT_FILES, WEB_FONT_STYLE_ID } from '@/components/shell/web-font-files';

// In the browser the faces are @font-face rules in every page's HTML (components/shell/web-fonts.tsx, through
// app/+html.tsx): WOFF2 subsets cut at build time, font-display swap, so text shows at once in the fallback face
// (components/ui/font-family.web.ts) and nothing waits for a font; the rules are switched on once the app runs. The TTFs stay for native and the PDF renderer.
// Requiring the files here is what makes Metro export them: it copies only assets the browser bundle asks for.
const FACES = Object.keys(WEB_FONT_FILES).length;

export function useAppFonts(): [boolean, Error | null] {
  // After hydration, never before: the page's @font-face rules wait (components/shell/web-fonts.tsx).
  useEffect(() => {
    document.getElementById(WEB_FONT_STYLE_ID)?.removeAttribute('media');
  }, []);
  return [FACES > 0, null];
}
