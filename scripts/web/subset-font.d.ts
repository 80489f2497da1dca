// subset-font ships no types; the part Fieldfold calls (subset-font 2.9 README).
declare module 'subset-font' {
  export default function subsetFont(
    font: Buffer,
    text: string,
    options?: { targetFormat?: 'sfnt' | 'woff' | 'woff2' | 'truetype'; noLayoutClosure?: boolean; noHinting?: boolean; preserveNameIds?: number[] },
  ): Promise<Buffer>;
}
