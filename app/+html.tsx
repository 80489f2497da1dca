import type { PropsWithChildren } from 'react';
import { ScrollViewStyleReset } from 'expo-router/html';
import appConfig from '../app.json';
import { colors } from '@/components/ui/theme';
import { WebFontFaces } from '@/components/shell/web-fonts';

// The page around every statically rendered route. Runs in Node at build time only (no window, no DOM):
// Expo Router puts the rendered screen, its styles and the route's scripts inside.
// The manifest and icons are written by scripts/web/manifest.ts after the export.
export default function Root({ children }: PropsWithChildren) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta httpEquiv="X-UA-Compatible" content="IE=edge" />
        <meta name="viewport" content="width=device-width, initial-scale=1, shrink-to-fit=no" />
        <meta name="theme-color" content={appConfig.expo.web.themeColor} />
        <meta name="description" content="Contract grazing: growers post blocks, graziers bid head-days, both sides keep one grazing log." />
        <link rel="manifest" href="/manifest.webmanifest" />
        <link rel="icon" type="image/png" sizes="32x32" href="/icons/favicon-32.png" />
        <link rel="apple-touch-icon" href="/icons/apple-touch-icon.png" />
        {/* React Native Web's full-height root, with body scrolling left to the screens' ScrollViews. */}
        <ScrollViewStyleReset />
        <style dangerouslySetInnerHTML={{ __html: `body{background-color:${colors.paper}}` }} />
        <WebFontFaces />
      </head>
      <body>{children}</body>
    </html>
  );
}
