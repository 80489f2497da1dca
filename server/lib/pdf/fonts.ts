import fs from 'node:fs';
import path from 'node:path';
import { fonts as themeFonts } from '../../../components/ui/theme';

// Fieldfold prints in its own typefaces, the same TTFs the web app ships (assets/fonts, SIL OFL): Public
// Sans 400/600/700 for text and figures, Bitter 600/700 for headings. No standard-14 font is ever used and
// nothing is fetched. The fonts are registered under the theme's names so the PDF and the screens say the
// same thing ("PublicSans_600SemiBold").
//
// fontkit is pdfkit's own font engine (a dependency of pdfkit 0.20). Parsing a TTF is the slow part of a
// small document, so each file is parsed once per process and pdfkit is handed the parsed font: its
// font factory accepts any font object with a layout() method, and keeps per-document subsets itself.

export const PDF_FONTS = {
  body: themeFonts.body,
  strong: themeFonts.bodyStrong,
  bold: themeFonts.bodyBold,
  heading: themeFonts.heading,
  display: themeFonts.display,
} as const;

export type PdfFontName = (typeof PDF_FONTS)[keyof typeof PDF_FONTS];

/** The parts of a fontkit font the renderer touches (fontkit ships no types). */
export interface ParsedFont {
  layout(text: string, features?: unknown): unknown;
  /** Every Unicode code point the font maps to a glyph. */
  characterSet: number[];
  postscriptName: string;
}

interface Fontkit {
  create(bytes: Buffer): ParsedFont;
}

function fontsDir(): string {
  // Sources run from server/lib/pdf, the build from build/server/lib/pdf: walk up to the folder holding assets/.
  let dir = __dirname;
  for (let i = 0; i < 6; i++) {
    const candidate = path.join(dir, 'assets', 'fonts');
    if (fs.existsSync(path.join(candidate, `${PDF_FONTS.body}.ttf`))) return candidate;
    dir = path.dirname(dir);
  }
  throw new Error('Fieldfold fonts not found: expected assets/fonts/*.ttf above server/lib/pdf');
}

let loaded: Map<PdfFontName, ParsedFont> | null = null;

/** The five parsed fonts, by theme name; parsed on first use. */
export function pdfFonts(): Map<PdfFontName, ParsedFont> {
  if (!loaded) {
    // eslint-disable-next-line @typescript-eslint/no-require-imports
    const fontkit = require('fontkit') as Fontkit;
    const dir = fontsDir();
    loaded = new Map(Object.values(PDF_FONTS).map((name) => [name, fontkit.create(fs.readFileSync(path.join(dir, `${name}.ttf`)))] as const));
  }
  return loaded;
}

let bodyChars: Set<number> | null = null;

/**
 * Text safe to print in Public Sans: characters the font has no glyph for (emoji, narrow no-break spaces
 * that Intl puts before "PM", symbols from other scripts) become a plain space or "?" rather than an empty box.
 */
export function printable(text: string): string {
  if (/^[\x20-\x7e]*$/.test(text)) return text;
  if (!bodyChars) bodyChars = new Set(pdfFonts().get(PDF_FONTS.body)!.characterSet);
  const chars = bodyChars;
  let out = '';
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    if (chars.has(cp) || cp === 10) out += ch;
    else if (/\s/u.test(ch)) out += ' ';
    else out += '?';
  }
  return out;
}
