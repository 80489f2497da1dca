import PDFDocument from 'pdfkit';
import { colors } from '../../../components/ui/theme';
import { PDF_FONTS, pdfFonts, printable, type PdfFontName } from './fonts';

// A small drawing kit over pdfkit for Fieldfold's records: US Letter pages with one margin, text styles from
// the app's theme, measured cells, page breaks the caller controls, and "page N of M" footers written once
// every page exists. Colours are the theme's; every meaning also has words or a shape, so a black-and-white
// print loses nothing (flags say "Flagged", status boxes say "Paid").
//
// Speed: pdfkit's LineWrapper runs whenever a width is given, and is several times slower than drawing a
// line of text at a point. Cells that fit on one line (nearly all of them) are therefore measured and placed
// by hand; only text that needs wrapping goes through the wrapper.

export const PAGE = { width: 612, height: 792 } as const; // US Letter in points (1/72 in)
export const MARGIN = { x: 50, top: 50, bottom: 62 } as const;
export const CONTENT_WIDTH = PAGE.width - 2 * MARGIN.x;
export const LEFT = MARGIN.x;
export const RIGHT = PAGE.width - MARGIN.x;

/** A column of a table on the sheet; widths in points. */
export interface TableColumn {
  label: string;
  width: number;
  align: 'left' | 'right';
}

/** The x of each column's left edge, the columns laid side by side from the left margin. */
export function columnStarts(columns: readonly TableColumn[]): number[] {
  const starts: number[] = [];
  let x = LEFT;
  for (const c of columns) {
    starts.push(x);
    x += c.width;
  }
  return starts;
}

export interface TextStyle {
  font: PdfFontName;
  size: number;
  color: string;
}

export const STYLE = {
  wordmark: { font: PDF_FONTS.display, size: 17, color: colors.cover },
  title: { font: PDF_FONTS.display, size: 19, color: colors.ink },
  section: { font: PDF_FONTS.heading, size: 11.5, color: colors.coverDeep },
  body: { font: PDF_FONTS.body, size: 9, color: colors.ink },
  bodyStrong: { font: PDF_FONTS.strong, size: 9, color: colors.ink },
  muted: { font: PDF_FONTS.body, size: 8, color: colors.inkMuted },
  label: { font: PDF_FONTS.strong, size: 7, color: colors.inkMuted },
  cell: { font: PDF_FONTS.body, size: 7.5, color: colors.ink },
  cellStrong: { font: PDF_FONTS.strong, size: 7.5, color: colors.ink },
  head: { font: PDF_FONTS.strong, size: 7, color: colors.coverDeep },
  figure: { font: PDF_FONTS.bold, size: 15, color: colors.ink },
  flag: { font: PDF_FONTS.bold, size: 7.5, color: colors.danger },
  footer: { font: PDF_FONTS.body, size: 7, color: colors.inkMuted },
} satisfies Record<string, TextStyle>;

export { colors };

export interface SheetMeta {
  title: string;
  subject: string;
  /** The document's own date (from the data, never the clock), so the bytes are the same each time. */
  createdAt: Date;
}

// pdfkit shapes every word with fontkit (GSUB/GPOS) and keeps the result in a cache that lives and dies with
// one document. A log repeats the same few hundred words (dates, counts, "Observation") in every file, so the
// sheets share one shaping cache per font for the whole process, plus a cache of measured widths. The cached
// runs are only read by pdfkit (it concatenates them into new arrays), so sharing them is safe. Both caches
// are bounded: past the limit they start again empty, as pdfkit's own would for a new document.
const CACHE_LIMIT = 50_000;
const layoutCaches = new Map<PdfFontName, Record<string, unknown>>();
let widthCache = new Map<string, number>();

function sharedLayoutCache(name: PdfFontName): Record<string, unknown> {
  let cache = layoutCaches.get(name);
  if (!cache || Object.keys(cache).length > CACHE_LIMIT) {
    cache = Object.create(null) as Record<string, unknown>;
    layoutCaches.set(name, cache);
  }
  return cache;
}

export interface CellOptions {
  width: number;
  align?: 'left' | 'right' | 'center';
  /** Lines beyond this are cut with an ellipsis (default: no limit). */
  maxLines?: number;
}

export class Sheet {
  readonly doc: PDFKit.PDFDocument;
  private readonly chunks: Buffer[] = [];
  private readonly done: Promise<void>;
  private current: TextStyle | null = null;
  private readonly opened = new Set<PdfFontName>();
  /** Top of the next content, kept apart from pdfkit's own text cursor (every draw here is positioned). */
  private cursor: number = MARGIN.top;

  constructor(meta: SheetMeta) {
    if (Number.isNaN(meta.createdAt.getTime())) throw new Error('PDF: the document date is not a valid instant');
    this.doc = new PDFDocument({
      size: 'LETTER',
      margins: { top: MARGIN.top, bottom: MARGIN.bottom, left: MARGIN.x, right: MARGIN.x },
      bufferPages: true,
      // pdfkit opens Helvetica unless told otherwise. With no default font it opens none, and every piece of
      // text below names one of Fieldfold's registered fonts, so no standard-14 font is ever in the file.
      // (Passing a parsed font here instead would make pdfkit re-open the registered twin on every switch.)
      font: null as unknown as string,
      info: {
        Title: printable(meta.title),
        Subject: printable(meta.subject),
        Author: 'Fieldfold',
        Creator: 'Fieldfold',
        Producer: 'Fieldfold (pdfkit)',
        CreationDate: meta.createdAt,
        ModDate: meta.createdAt,
      },
      lang: 'en-US',
      displayTitle: true,
    });
    for (const [name, font] of pdfFonts()) this.doc.registerFont(name, font as unknown as PDFKit.Mixins.PDFFontSource);
    this.doc.on('data', (c: Buffer) => this.chunks.push(c));
    this.done = new Promise((resolve, reject) => {
      this.doc.on('end', () => resolve());
      this.doc.on('error', reject);
    });
  }

  get y(): number {
    return this.cursor;
  }
  set y(value: number) {
    this.cursor = value;
  }

  /** Lowest y a line of content may reach on this page. */
  get bottom(): number {
    return PAGE.height - MARGIN.bottom;
  }

  addPage(): void {
    this.doc.addPage();
    this.cursor = MARGIN.top;
    // A new page starts with PDF's default graphics state (black fill): set the style again on next use.
    this.current = null;
  }

  /** Starts a new page when `height` does not fit below y; returns whether it did. */
  ensure(height: number): boolean {
    if (this.cursor + height <= this.bottom) return false;
    this.addPage();
    return true;
  }

  use(style: TextStyle): this {
    const c = this.current;
    if (!c || c.font !== style.font) {
      this.doc.font(style.font);
      if (!this.opened.has(style.font)) {
        this.opened.add(style.font);
        // pdfkit's EmbeddedFont keeps its shaping cache in `layoutCache` (absent if the cache is turned off);
        // if a later pdfkit renames it, this does nothing and each document shapes its own words again.
        const font = (this.doc as unknown as { _font?: { layoutCache?: unknown } })._font;
        if (font && typeof font.layoutCache === 'object' && font.layoutCache !== null) font.layoutCache = sharedLayoutCache(style.font);
      }
    }
    if (!c || c.size !== style.size) this.doc.fontSize(style.size);
    if (!c || c.color !== style.color) this.doc.fillColor(style.color);
    this.current = style;
    return this;
  }

  /** Height of one line of `style`, the step pdfkit's wrapper uses too. */
  lineHeight(style: TextStyle): number {
    this.use(style);
    return this.doc.currentLineHeight(true);
  }

  widthOf(text: string, style: TextStyle): number {
    this.use(style);
    return this.width(printable(text));
  }

  /** Width of already printable text in the current style. */
  private width(t: string): number {
    const c = this.current!;
    const key = `${c.font}|${c.size}|${t}`;
    let w = widthCache.get(key);
    if (w === undefined) {
      w = this.doc.widthOfString(t);
      if (widthCache.size >= CACHE_LIMIT) widthCache = new Map();
      widthCache.set(key, w);
    }
    return w;
  }

  /** Height `text` takes in a cell of `width`, honouring maxLines. */
  measure(text: string, style: TextStyle, opts: CellOptions): number {
    const t = printable(text);
    const line = this.lineHeight(style);
    if (t === '' || (!t.includes('\n') && this.width(t) <= opts.width)) return line;
    const h = this.doc.heightOfString(t, { width: opts.width });
    return opts.maxLines ? Math.min(h, opts.maxLines * line) : h;
  }

  /** Draws text with its top at (x, y); returns the height used. */
  cell(text: string, x: number, y: number, style: TextStyle, opts: CellOptions): number {
    const t = printable(text);
    const line = this.lineHeight(style);
    if (t === '') return line;
    if (!t.includes('\n')) {
      const w = this.width(t);
      if (w <= opts.width) {
        const dx = opts.align === 'right' ? opts.width - w : opts.align === 'center' ? (opts.width - w) / 2 : 0;
        this.doc.text(t, x + dx, y, { lineBreak: false });
        return line;
      }
    }
    const height = opts.maxLines ? Math.min(this.doc.heightOfString(t, { width: opts.width }), opts.maxLines * line) : undefined;
    this.doc.text(t, x, y, { width: opts.width, align: opts.align ?? 'left', height, ellipsis: height !== undefined });
    return this.doc.y - y;
  }

  /** A paragraph across `width` from x at the current y; moves y below it. */
  paragraph(text: string, style: TextStyle, opts: { x?: number; width?: number; gapAfter?: number } = {}): void {
    const x = opts.x ?? LEFT;
    const width = opts.width ?? CONTENT_WIDTH;
    const h = this.measure(text, style, { width });
    this.ensure(h);
    const y = this.y;
    this.cell(text, x, y, style, { width });
    this.y = y + h + (opts.gapAfter ?? 0);
  }

  rule(y: number, color: string = colors.line, width = 0.6, x1: number = LEFT, x2: number = RIGHT): void {
    this.doc.save().lineWidth(width).strokeColor(color).moveTo(x1, y).lineTo(x2, y).stroke().restore();
  }

  box(x: number, y: number, w: number, h: number, fill: string | null, stroke: string | null = null, lineWidth = 0.8): void {
    const d = this.doc.save().rect(x, y, w, h);
    if (fill && stroke) d.lineWidth(lineWidth).fillAndStroke(fill, stroke);
    else if (fill) d.fill(fill);
    else if (stroke) d.lineWidth(lineWidth).stroke(stroke);
    // restore() puts the text colour set before save() back in force, so the current style still holds.
    d.restore();
  }

  /** A flag marker: a small filled triangle with a "!" cut out, readable in grey as in colour. */
  flagMark(x: number, y: number, size = 7): void {
    const d = this.doc.save();
    d.polygon([x + size / 2, y], [x + size, y + size], [x, y + size]).fill(colors.danger);
    d.rect(x + size / 2 - 0.45, y + size * 0.32, 0.9, size * 0.38).fill(colors.onCover);
    d.rect(x + size / 2 - 0.45, y + size * 0.78, 0.9, size * 0.1).fill(colors.onCover);
    d.restore();
  }

  /** Section heading with a rule under it; keeps `keepWith` points of what follows on the same page. */
  section(title: string, keepWith = 40): void {
    const h = this.lineHeight(STYLE.section) + 6;
    // Air above a section, except at the top of a page.
    if (!this.ensure(h + keepWith + 8) && this.y > MARGIN.top) this.y += 8;
    const y = this.y;
    this.cell(title, LEFT, y, STYLE.section, { width: CONTENT_WIDTH });
    this.rule(y + h - 3, colors.lineStrong, 0.8);
    this.y = y + h + 2;
  }

  /** Writes each page's footer (the same left text, "page N of M" on the right) and returns the file. */
  async finish(footerLeft: string): Promise<Buffer> {
    const range = this.doc.bufferedPageRange();
    const total = range.count;
    for (let i = 0; i < total; i++) {
      this.doc.switchToPage(range.start + i);
      // The footer sits in the bottom margin; with the margin at 0 pdfkit never starts a page for it.
      this.doc.page.margins.bottom = 0;
      this.current = null;
      const y = PAGE.height - MARGIN.bottom + 20;
      this.rule(y - 5, colors.line, 0.5);
      const right = `page ${i + 1} of ${total}`;
      const rw = this.widthOf(right, STYLE.footer);
      this.cell(footerLeft, LEFT, y, STYLE.footer, { width: CONTENT_WIDTH - rw - 12 });
      this.cell(right, RIGHT - rw, y, STYLE.footer, { width: rw + 1 });
    }
    this.doc.end();
    await this.done;
    return Buffer.concat(this.chunks);
  }
}
