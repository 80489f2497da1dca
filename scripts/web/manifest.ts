// The installable-app part of the export: a web app manifest and its icons, written into the exported folder.
// Name and colours come from app.json (the same values Expo uses), the mark from the wordmark's three furrows
// (components/shell/wordmark.tsx) in the theme's colours, rasterised with sharp, so nothing here is hand-copied.
import fs from 'node:fs';
import path from 'node:path';
import sharp from 'sharp';
import { colors } from '../../components/ui/theme';

interface ExpoWebConfig {
  name: string;
  web: { name?: string; shortName?: string; themeColor: string; backgroundColor: string };
}

export const MANIFEST_FILE = 'manifest.webmanifest';

/** The wordmark's furrows (widths 18, 24, 14; 4 high, 3 apart; outer rows set in by 5), centred in a 512 square. */
function iconSvg(background: string, rounded: boolean): string {
  const unit = 11;
  const rows = [
    { x: 5, w: 18, fill: colors.coverWash },
    { x: 0, w: 24, fill: colors.clay },
    { x: 5, w: 14, fill: colors.coverWash },
  ];
  const left = (512 - 24 * unit) / 2;
  const top = (512 - 18 * unit) / 2;
  const bars = rows.map((r, i) => `<rect x="${left + r.x * unit}" y="${top + i * 7 * unit}" width="${r.w * unit}" height="${4 * unit}" rx="${2 * unit}" fill="${r.fill}"/>`).join('');
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512"><rect width="512" height="512" rx="${rounded ? 112 : 0}" fill="${background}"/>${bars}</svg>`;
}

export async function writeManifest(root: string, webDir: string): Promise<string[]> {
  const { expo } = JSON.parse(fs.readFileSync(path.join(root, 'app.json'), 'utf8')) as { expo: ExpoWebConfig };
  const { description } = JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')) as { description: string };
  const iconDir = path.join(webDir, 'icons');
  fs.mkdirSync(iconDir, { recursive: true });
  // "any" icons keep rounded corners; the maskable one is full-bleed with the mark inside the 80 % safe circle.
  const icons = [
    { file: 'icon-192.png', size: 192, purpose: 'any', rounded: true },
    { file: 'icon-512.png', size: 512, purpose: 'any', rounded: true },
    { file: 'icon-maskable-512.png', size: 512, purpose: 'maskable', rounded: false },
    { file: 'apple-touch-icon.png', size: 180, purpose: null, rounded: false },
    { file: 'favicon-32.png', size: 32, purpose: null, rounded: true },
  ];
  for (const icon of icons) {
    await sharp(Buffer.from(iconSvg(expo.web.themeColor, icon.rounded)))
      .resize(icon.size, icon.size)
      .png({ compressionLevel: 9 })
      .toFile(path.join(iconDir, icon.file));
  }
  const manifest = {
    name: expo.web.name ?? expo.name,
    short_name: expo.web.shortName ?? expo.name,
    description,
    id: '/',
    start_url: '/',
    scope: '/',
    display: 'standalone',
    orientation: 'any',
    theme_color: expo.web.themeColor,
    background_color: expo.web.backgroundColor,
    icons: icons.filter((i) => i.purpose).map((i) => ({ src: `/icons/${i.file}`, sizes: `${i.size}x${i.size}`, type: 'image/png', purpose: i.purpose })),
  };
  fs.writeFileSync(path.join(webDir, MANIFEST_FILE), `${JSON.stringify(manifest, null, 2)}\n`);
  return [MANIFEST_FILE, ...icons.map((i) => `icons/${i.file}`)];
}
