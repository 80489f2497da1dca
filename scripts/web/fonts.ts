// Web fonts: the TTFs in assets/fonts (kept whole for the PDF renderer and native) cut at build time into small WOFF2
// files, one per face and character subset (components/ui/font-subsets.ts), written to assets/fonts/web (git-ignored)
// where components/shell/web-fonts.tsx picks them up. Before cutting, every string and JSX text in the app's code is
// read (TypeScript's parser, so comments and identifiers do not count): a character no subset covers stops the build.
import fs from 'node:fs';
import path from 'node:path';
import subsetFont from 'subset-font';
import ts from 'typescript';
import { FONT_SUBSETS, subsetOf, type FontSubset } from '../../components/ui/font-subsets';

export const FONT_DIR = 'assets/fonts';
export const WEB_FONT_DIR = 'assets/fonts/web';
const SOURCE_DIRS = ['app', 'components', 'hooks', 'lib'];

function sourceFiles(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(p);
    return /\.tsx?$/.test(e.name) && !e.name.endsWith('.d.ts') ? [p] : [];
  });
}

/** The text a screen can show: string literals, template text and JSX text, with the file each character is first in. */
export function charactersOnScreens(root: string): Map<string, string> {
  const found = new Map<string, string>();
  for (const file of SOURCE_DIRS.flatMap((d) => sourceFiles(path.join(root, d)))) {
    const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, false, file.endsWith('x') ? ts.ScriptKind.TSX : ts.ScriptKind.TS);
    const visit = (node: ts.Node) => {
      if (ts.isStringLiteralLike(node) || ts.isTemplateLiteralToken(node) || ts.isJsxText(node)) {
        for (const ch of node.text) if (!found.has(ch) && ch.codePointAt(0)! > 0x7e && !/\s/.test(ch)) found.set(ch, path.relative(root, file));
      }
      ts.forEachChild(node, visit);
    };
    visit(source);
  }
  return found;
}

function subsetText(subset: FontSubset): string {
  let text = '';
  for (const [from, to] of FONT_SUBSETS[subset]) for (let c = from; c <= to; c++) text += String.fromCodePoint(c);
  return text;
}

export const webFontFile = (face: string, subset: FontSubset) => `${face}.${subset}.woff2`;

/** Writes assets/fonts/web/<face>.<subset>.woff2 for every TTF; a file whose bytes would not change is left alone. */
export async function buildWebFonts(root: string): Promise<Array<{ file: string; bytes: number }>> {
  const uncovered = [...charactersOnScreens(root)].filter(([ch]) => !subsetOf(ch.codePointAt(0)!));
  if (uncovered.length) {
    const list = uncovered.map(([ch, file]) => `'${ch}' (U+${ch.codePointAt(0)!.toString(16).toUpperCase()}, ${file})`).join(', ');
    throw new Error(`No web font subset covers ${list}: add it to FONT_SUBSETS in components/ui/font-subsets.ts`);
  }
  const outDir = path.join(root, WEB_FONT_DIR);
  fs.mkdirSync(outDir, { recursive: true });
  const written: Array<{ file: string; bytes: number }> = [];
  for (const ttf of fs.readdirSync(path.join(root, FONT_DIR)).filter((f) => f.endsWith('.ttf'))) {
    const source = fs.readFileSync(path.join(root, FONT_DIR, ttf));
    for (const subset of Object.keys(FONT_SUBSETS) as FontSubset[]) {
      // noLayoutClosure: leave out glyphs only reachable through substitutions (ligatures, alternates, small caps),
      // which the screens do not use; it halves the slab serif.
      const woff2 = await subsetFont(source, subsetText(subset), { targetFormat: 'woff2', noLayoutClosure: true });
      const out = path.join(outDir, webFontFile(ttf.replace(/\.ttf$/, ''), subset));
      if (!fs.existsSync(out) || !fs.readFileSync(out).equals(woff2)) fs.writeFileSync(out, woff2);
      written.push({ file: path.basename(out), bytes: woff2.length });
    }
  }
  for (const f of fs.readdirSync(outDir)) if (!written.some((w) => w.file === f)) fs.rmSync(path.join(outDir, f));
  return written;
}
