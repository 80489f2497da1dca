// Which characters each web font file carries (the browser fetches a file only when the page shows one of its
// characters: CSS unicode-range). `core` is what every screen shows — English text, digits and the product's symbols
// (· — → × ² ≈ ✓ …); `latin` the accented letters of people's and places' names (Latin-1 and Latin Extended-A) and the rarer signs.
// The build (scripts/web/fonts.ts) cuts the WOFF2 files to these ranges and stops if a string in the app's code
// uses a character neither covers, so a new symbol on a screen is added here first. Ranges are [first, last].

export type FontSubset = 'core' | 'latin';

export const FONT_SUBSETS: Record<FontSubset, ReadonlyArray<readonly [number, number]>> = {
  core: [
    [0x0020, 0x007e], // Basic Latin
    [0x00a0, 0x00a0], // no-break space
    [0x00a7, 0x00a7], // §
    [0x00b0, 0x00b3], // ° ± ² ³
    [0x00b5, 0x00b5], // µ
    [0x00b7, 0x00b7], // ·
    [0x00b9, 0x00b9], // ¹
    [0x00bc, 0x00be], // ¼ ½ ¾
    [0x00d7, 0x00d7], // ×
    [0x00f7, 0x00f7], // ÷
    [0x2013, 0x2014], // – —
    [0x2018, 0x201d], // ‘ ’ ‚ ‛ “ ”
    [0x2022, 0x2022], // •
    [0x2026, 0x2026], // …
    [0x2032, 0x2033], // ′ ″
    [0x2070, 0x2070], // ⁰
    [0x2074, 0x2079], // ⁴ … ⁹
    [0x207b, 0x207b], // ⁻ (10⁻⁶)
    [0x2080, 0x2089], // ₀ … ₉
    [0x20ac, 0x20ac], // €
    [0x2122, 0x2122], // ™
    [0x2190, 0x2193], // ← ↑ → ↓
    [0x2212, 0x2212], // − (minus)
    [0x2248, 0x2248], // ≈
    [0x2264, 0x2265], // ≤ ≥
    [0x2713, 0x2713], // ✓
    [0x2715, 0x2715], // ✕
  ],
  latin: [
    [0x00a1, 0x00a6], // the other Latin-1 signs: ¡ ¢ £ ¤ ¥ ¦ ¨ © ª « ¬ ® ¯ ´ ¶ ¸ º » ¿
    [0x00a8, 0x00af],
    [0x00b4, 0x00b4],
    [0x00b6, 0x00b6],
    [0x00b8, 0x00b8],
    [0x00ba, 0x00bb],
    [0x00bf, 0x00d6],
    [0x00d8, 0x00f6],
    [0x00f8, 0x017f], // Latin-1 letters and Latin Extended-A (ñ, é, ø, ł, ş, ő …)
    [0x0192, 0x0192],
    [0x0218, 0x021b], // Ș ș Ț ț
    [0x02c6, 0x02c7],
    [0x02d8, 0x02dd],
  ],
};

/** CSS unicode-range value for a subset: U+20-7E,U+A0-BF,… */
export function unicodeRange(subset: FontSubset): string {
  const hex = (n: number) => n.toString(16).toUpperCase();
  return FONT_SUBSETS[subset].map(([a, b]) => (a === b ? `U+${hex(a)}` : `U+${hex(a)}-${hex(b)}`)).join(',');
}

export function subsetOf(codePoint: number): FontSubset | null {
  for (const subset of Object.keys(FONT_SUBSETS) as FontSubset[]) {
    if (FONT_SUBSETS[subset].some(([a, b]) => codePoint >= a && codePoint <= b)) return subset;
  }
  return null;
}
