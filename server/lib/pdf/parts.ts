import { CONTENT_WIDTH, LEFT, MARGIN, PAGE, RIGHT, STYLE, Sheet, colors, type TextStyle } from './sheet';
import type { PdfCaution, PdfParty } from './types';

// Pieces both records share: the title block, a two-column list of terms, figure tiles and the cautions.

export function partyLine(p: PdfParty): string {
  return p.businessName ? `${p.name}, ${p.businessName}` : p.name;
}

export interface TitleBlock {
  /** "Grazing log", "Invoice". */
  kind: string;
  title: string;
  subtitle?: string | null;
  /** Label, value and relative width, printed in a row under the title. */
  meta: Array<[string, string, number?]>;
}

export function drawTitleBlock(s: Sheet, t: TitleBlock): void {
  // A band of cover green across the top of the first page: the one large area of colour on the record.
  s.box(0, 0, PAGE.width, 7, colors.cover);
  let y = MARGIN.top - 14;
  s.cell('Fieldfold', LEFT, y, STYLE.wordmark, { width: 200 });
  const kind = t.kind.toUpperCase();
  const kindStyle: TextStyle = { ...STYLE.section, color: colors.clay };
  const kw = s.widthOf(kind, kindStyle);
  s.cell(kind, RIGHT - kw, y + 4, kindStyle, { width: kw + 1 });
  y += s.lineHeight(STYLE.wordmark) + 8;
  y += s.cell(t.title, LEFT, y, STYLE.title, { width: CONTENT_WIDTH });
  if (t.subtitle) y += s.cell(t.subtitle, LEFT, y, { ...STYLE.body, color: colors.inkMuted }, { width: CONTENT_WIDTH }) + 2;
  y += 6;

  const gap = 14;
  const weights = t.meta.map((m) => m[2] ?? 1);
  const unit = (CONTENT_WIDTH - gap * (t.meta.length - 1)) / weights.reduce((a, b) => a + b, 0);
  let bottom = y;
  let x = LEFT;
  t.meta.forEach(([label, value], i) => {
    const w = weights[i] * unit;
    const ly = y + s.cell(label.toUpperCase(), x, y, STYLE.label, { width: w }) + 1;
    bottom = Math.max(bottom, ly + s.cell(value, x, ly, STYLE.bodyStrong, { width: w }));
    x += w + gap;
  });
  s.y = bottom + 8;
  s.rule(s.y, colors.lineStrong, 1);
  s.y += 12;
}

/** Rows of [label, value, wide?]: two columns, a wide row across both. */
export function drawKeyValues(s: Sheet, rows: Array<[string, string, boolean?]>): void {
  const gap = 18;
  const colW = (CONTENT_WIDTH - gap) / 2;
  const labelW = 82;
  const rowGap = 4;
  let i = 0;
  while (i < rows.length) {
    const pair = rows[i][2] ? [rows[i]] : rows[i + 1] && !rows[i + 1][2] ? [rows[i], rows[i + 1]] : [rows[i]];
    const widths = pair.length === 1 && pair[0][2] ? [CONTENT_WIDTH - labelW] : [colW - labelW, colW - labelW];
    const h = Math.max(...pair.map(([label, value], k) => Math.max(s.measure(label, STYLE.label, { width: labelW - 6 }), s.measure(value, STYLE.body, { width: widths[k] }))));
    s.ensure(h + rowGap);
    const y = s.y;
    pair.forEach(([label, value], k) => {
      const x = LEFT + k * (colW + gap);
      s.cell(label.toUpperCase(), x, y + 1.5, STYLE.label, { width: labelW - 6 });
      s.cell(value, x + labelW, y, STYLE.body, { width: widths[k] });
    });
    s.y = y + h + rowGap;
    s.rule(s.y - rowGap / 2, colors.surfaceSunk, 0.5);
    i += pair.length;
  }
  s.y += 8;
}

export interface Figure {
  label: string;
  value: string;
  unit: string;
}

/** Figure tiles in a row: the label small, the number large, its unit named beside it. */
export function drawFigures(s: Sheet, figures: Figure[]): void {
  const gap = 10;
  const w = (CONTENT_WIDTH - gap * (figures.length - 1)) / figures.length;
  const h = 46;
  s.ensure(h + 6);
  const y = s.y;
  figures.forEach((f, i) => {
    const x = LEFT + i * (w + gap);
    s.box(x, y, w, h, colors.surface, colors.line, 0.8);
    s.cell(f.label.toUpperCase(), x + 9, y + 7, STYLE.label, { width: w - 18 });
    const vy = y + 19;
    s.cell(f.value, x + 9, vy, STYLE.figure, { width: w - 18 });
    const vw = s.widthOf(f.value, STYLE.figure);
    s.cell(f.unit, x + 9 + vw + 4, vy + 7, STYLE.muted, { width: Math.max(10, w - 22 - vw) });
  });
  s.y = y + h + 6;
}

const TONE: Record<PdfCaution['tone'], { word: string; bar: string }> = {
  danger: { word: 'Danger', bar: colors.danger },
  caution: { word: 'Caution', bar: colors.cautionLine },
  info: { word: 'Note', bar: colors.sky },
};

export function drawCautions(s: Sheet, cautions: readonly PdfCaution[]): void {
  s.section('Cautions', 60);
  const x = LEFT + 10;
  const w = CONTENT_WIDTH - 10;
  for (const c of cautions) {
    const title = `${TONE[c.tone].word}: ${c.title}`;
    const th = s.measure(title, STYLE.bodyStrong, { width: w });
    const bh = s.measure(c.text, STYLE.body, { width: w });
    s.ensure(th + bh + 8);
    const y = s.y;
    s.box(LEFT, y, 3, th + bh + 1, TONE[c.tone].bar);
    s.cell(title, x, y, STYLE.bodyStrong, { width: w });
    s.cell(c.text, x, y + th + 1, STYLE.body, { width: w });
    s.y = y + th + bh + 8;
  }
  s.paragraph(
    'These cautions inform; they do not replace the pesticide label (which is the law), local rules, your veterinarian, or licensed pest-control and food-safety advice. Where they differ, the label, the rules and that advice come first.',
    STYLE.muted,
  );
}
