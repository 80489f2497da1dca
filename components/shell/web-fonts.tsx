import { Asset } from 'expo-asset';
import { unicodeRange, type FontSubset } from '@/components/ui/font-subsets';
import { WEB_FONT_FILES } from './web-font-files';

/**
 * The @font-face rules every page's HTML carries (app/+html.tsx, rendered at build time). No preload: a preloaded
 * font holds Chromium's first paint and takes bandwidth from the scripts; declared this way, the browser fetches a
 * file when a screen first shows one of its characters (unicode-range), paints the fallback face at once and swaps.
 */
export function WebFontFaces() {
  const css = Object.entries(WEB_FONT_FILES)
    .flatMap(([family, files]) =>
      (Object.keys(files) as FontSubset[]).map(
        (subset) => `@font-face{font-family:"${family}";src:url(${Asset.fromModule(files[subset]).uri}) format("woff2");font-display:swap;unicode-range:${unicodeRange(subset)}}`,
      ),
    )
    .join('\n');
  return <style id="fieldfold-fonts" dangerouslySetInnerHTML={{ __html: css }} />;
}
