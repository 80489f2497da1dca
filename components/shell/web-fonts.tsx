import { Asset } from 'expo-asset';
import { unicodeRange, type FontSubset } from '@/components/ui/font-subsets';
import { WEB_FONT_FILES, WEB_FONT_STYLE_ID } from './web-font-files';

/**
 * The @font-face rules every page's HTML carries (app/+html.tsx, rendered at build time), switched off
 * (`media="not all"`) until the app has taken over the page: on a slow link the first screen's scripts get the
 * whole bandwidth, the static HTML paints and becomes usable in the fallback face, and the faces swap in after.
 * No preload either: a preloaded font holds Chromium's first paint. Once on, the browser fetches a file when a
 * screen first shows one of its characters (unicode-range) and swaps (font-display: swap). Without JavaScript
 * the fallback face stays, which reads just as well.
 */
export function WebFontFaces() {
  const css = Object.entries(WEB_FONT_FILES)
    .flatMap(([family, files]) =>
      (Object.keys(files) as FontSubset[]).map(
        (subset) => `@font-face{font-family:"${family}";src:url(${Asset.fromModule(files[subset]).uri}) format("woff2");font-display:swap;unicode-range:${unicodeRange(subset)}}`,
      ),
    )
    .join('\n');
  return <style id={WEB_FONT_STYLE_ID} media="not all" dangerouslySetInnerHTML={{ __html: css }} />;
}
