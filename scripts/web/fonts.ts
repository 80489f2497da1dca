// Web fonts: the TTFs in assets/fonts (kept whole for the PDF renderer) subset to WOFF2 at build time, to the
// characters the product can show: the "latin" range web font services ship (Basic Latin, Latin-1 with its accented
// letters for people's and places' names, general punctuation, €, ™, −) plus every other character written in the
// app's own source (· — → ² × ≈ ✓ …), so a symbol added to a screen is in the font on the next build.
import fs from 'node:fs';
import path from 'node:path';
import subsetFont from 'subset-font';

export const FONT_DIR = 'assets/fonts';
/** Generated, git-ignored; hooks/use-app-fonts.web.ts requires these files. */
export const WEB_FONT_DIR = 'assets/fonts/web';
const SOURCE_DIRS = ['app', 'components', 'hooks', 'lib'];

// The unicode-range of the "latin" subset of the common web font services.
const LATIN_RANGES: Array<[number, number]> = [
  [0x0020, 0x007e],
  [0x00a0, 0x00ff],
  [0x0131, 0x0131],
  [0x0152, 0x0153],
  [0x02bb, 0x02bc],
  [0x02c6, 0x02c6],
  [0x02da, 0x02da],
  [0x02dc, 0x02dc],
  [0x2000, 0x206f],
  [0x20ac, 0x20ac],
  [0x2122, 0x2122],
  [0x2191, 0x2191],
  [0x2193, 0x2193],
  [0x2212, 0x2212],
  [0x2215, 0x2215],
];

function sourceFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(p);
    return /\.tsx?$/.test(e.name) ? [p] : [];
  });
}

/** Every character above ASCII in the app's code, comments left out (they never reach a screen). */
export function charactersInSources(root: string): Set<string> {
  const chars = new Set<string>();
  for (const file of SOURCE_DIRS.flatMap((d) => sourceFiles(path.join(root, d)))) {
    const code = fs.readFileSync(file, 'utf8').replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`\\])\/\/.*$/gm, '$1');
    for (const ch of code) if (ch.codePointAt(0)! > 0x7e && !/\s/.test(ch)) chars.add(ch);
  }
  return chars;
}

export function webFontText(root: string): string {
  const chars = charactersInSources(root);
  for (const [from, to] of LATIN_RANGES) for (let c = from; c <= to; c++) chars.add(String.fromCodePoint(c));
  return [...chars].sort().join('');
}

/** Writes assets/fonts/web/<face>.woff2 for every TTF; leaves a file untouched when its bytes would not change. */
export async function buildWebFonts(root: string): Promise<Array<{ face: string; ttf: number; woff2: number }>> {
  const text = webFontText(root);
  const outDir = path.join(root, WEB_FONT_DIR);
  fs.mkdirSync(outDir, { recursive: true });
  const faces = fs.readdirSync(path.join(root, FONT_DIR)).filter((f) => f.endsWith('.ttf'));
  const written = [];
  for (const ttf of faces) {
    const source = fs.readFileSync(path.join(root, FONT_DIR, ttf));
    const woff2 = await subsetFont(source, text, { targetFormat: 'woff2' });
    const out = path.join(outDir, ttf.replace(/\.ttf$/, '.woff2'));
    if (!fs.existsSync(out) || !fs.readFileSync(out).equals(woff2)) fs.writeFileSync(out, woff2);
    written.push({ face: ttf.replace(/\.ttf$/, ''), ttf: source.length, woff2: woff2.length });
  }
  return written;
}
