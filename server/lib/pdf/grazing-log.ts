import { AU_CONVENTION } from '../../../lib/grazing/capacity';
import { intakeForFlock } from '../../../lib/grazing/flock-intake';
import { GENERAL_GRAZING_CAUTIONS } from '../../../lib/grazing/general-cautions';
import { HEAD_DAY_DECIMALS } from '../../../lib/grazing/head-days';
import type { LogDay, LogDayEntry } from '../../../lib/grazing/log-days';
import { daysBetween } from '../../../lib/day-keys';
import { parseIsoInstant } from '../../../lib/dates';
import { formatDay, formatDayRange, formatNumber } from '../../../lib/format';
import { formatRate } from '../../../lib/terms';
import { formatClock, formatMoment, shortId } from './format';
import { CONTENT_WIDTH, LEFT, RIGHT, STYLE, Sheet, colors, columnStarts, type TableColumn, type TextStyle } from './sheet';
import { drawCautions, drawFigures, drawKeyValues, drawTitleBlock, partyLine } from './parts';
import type { GrazingLogPdfData, PdfSignature } from './types';

// The grazing log as a record for both parties' files: the agreed terms, who signed them and the hash of
// what they signed, the totals in head-days and animal-unit days (the convention named beside them), the
// flagged entries, every day of the log, and the cautions. The figures are the caller's (lib/ computed
// them); this file only lays them out, after checking that the days add up to the total it prints.

const UNITS = 10 ** HEAD_DAY_DECIMALS;

// Widths in points; they add up to CONTENT_WIDTH (512).
const COLUMNS: TableColumn[] = [
  { label: 'Date', width: 58, align: 'left' },
  { label: 'Head on\nblock', width: 38, align: 'right' },
  { label: 'Head-days', width: 46, align: 'right' },
  { label: 'Time', width: 30, align: 'left' },
  { label: 'Entry and notes', width: 200, align: 'left' },
  { label: 'Residual', width: 36, align: 'right' },
  { label: 'Taken', width: 30, align: 'right' },
  { label: 'Water\nchecked', width: 37, align: 'right' },
  { label: 'Fence\nchecked', width: 37, align: 'right' },
];
const PAD_X = 3;
const PAD_Y = 2.2;
const NOTES_MAX_LINES = 6;

const COL_X = columnStarts(COLUMNS);

// Head-days are kept to 0.0001 (lib/grazing/head-days) and billed at that precision: print all of it, so the
// days on paper add up exactly to the total on paper.
function headDaysText(v: number): string {
  return formatNumber(v, HEAD_DAY_DECIMALS);
}

function yesNo(v: boolean | null | undefined): string {
  return v === true ? 'yes' : v === false ? 'no' : '';
}

function entryText(e: LogDayEntry): string {
  let what: string;
  if (e.kind === 'move') {
    const n = e.change ?? 0;
    what = n >= 0 ? `Moved in ${formatNumber(n)} head` : `Moved out ${formatNumber(-n)} head`;
  } else if (e.kind === 'tally') {
    what = `Counted ${formatNumber(e.count ?? 0)} head`;
  } else {
    what = 'Observation';
  }
  const note = e.note?.trim();
  const by = e.by ? ` (${e.by})` : '';
  return note ? `${what}${by}. ${note}` : `${what}${by}`;
}

function entryCells(e: LogDayEntry, timeZone: string): string[] {
  return [
    '',
    '',
    '',
    formatClock(e.at, timeZone),
    entryText(e),
    e.residualHeightIn == null ? '' : `${formatNumber(e.residualHeightIn, 1)} in`,
    e.takenPct == null ? '' : `${formatNumber(e.takenPct, 0)} %`,
    yesNo(e.waterChecked),
    yesNo(e.fenceChecked),
  ];
}

class LogTable {
  private band = false;

  constructor(
    private readonly s: Sheet,
    private readonly timeZone: string,
  ) {}

  header(): void {
    const s = this.s;
    const line = s.lineHeight(STYLE.head);
    const h = line * 2 + PAD_Y * 2;
    const y = s.y;
    s.box(LEFT, y, CONTENT_WIDTH, h, colors.coverWash);
    COLUMNS.forEach((c, i) => {
      const lines = c.label.split('\n');
      // Single-line labels sit on the lower line so every label ends on one baseline.
      const top = y + PAD_Y + (lines.length === 1 ? line : 0);
      lines.forEach((l, j) => s.cell(l, COL_X[i] + PAD_X, top + j * line, STYLE.head, { width: c.width - 2 * PAD_X, align: c.align }));
    });
    s.rule(y + h, colors.cover, 0.9);
    s.y = y + h;
  }

  private cellHeight(text: string, i: number, style: TextStyle): number {
    return this.s.measure(text, style, { width: COLUMNS[i].width - 2 * PAD_X, maxLines: NOTES_MAX_LINES });
  }

  private rowHeight(cells: string[], styles: TextStyle[]): number {
    let h = 0;
    cells.forEach((t, i) => {
      if (t !== '') h = Math.max(h, this.cellHeight(t, i, styles[i]));
    });
    return (h || this.s.lineHeight(STYLE.cell)) + PAD_Y * 2;
  }

  private drawRow(cells: string[], styles: TextStyle[], h: number): void {
    const s = this.s;
    const y = s.y;
    if (this.band) s.box(LEFT, y, CONTENT_WIDTH, h, colors.paper);
    cells.forEach((t, i) => {
      if (t !== '') s.cell(t, COL_X[i] + PAD_X, y + PAD_Y, styles[i], { width: COLUMNS[i].width - 2 * PAD_X, align: COLUMNS[i].align, maxLines: NOTES_MAX_LINES });
    });
    s.y = y + h;
  }

  private flagHeight(text: string): number {
    return this.s.measure(text, STYLE.flag, { width: this.flagWidth() }) + PAD_Y * 2;
  }

  private flagWidth(): number {
    return RIGHT - COL_X[3] - 2 * PAD_X - 12;
  }

  private drawFlag(text: string, h: number): void {
    const s = this.s;
    const y = s.y;
    const x = COL_X[3];
    s.box(x, y, RIGHT - x, h, colors.dangerWash);
    s.box(x, y, 2, h, colors.danger);
    s.flagMark(x + PAD_X + 2, y + PAD_Y + 0.6, 7);
    s.cell(text, x + PAD_X + 12, y + PAD_Y, STYLE.flag, { width: this.flagWidth() });
    s.y = y + h;
  }

  /** One day: its first row carries date, head and head-days; later rows only the entry. */
  day(day: LogDay): void {
    const s = this.s;
    const dayCells = [formatDay(day.date), formatNumber(day.headAtEnd), headDaysText(day.headDays)];
    const entryStyles = [STYLE.cellStrong, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell];

    // Each unit (an entry with its flags, or the day's own flags) stays together on one page.
    const units: Array<{ cells: string[]; flags: string[] }> = day.entries.map((e) => ({ cells: entryCells(e, this.timeZone), flags: e.flags }));
    if (units.length === 0) units.push({ cells: ['', '', '', '', '—', '', '', '', ''], flags: [] });
    if (day.flags.length > 0) units.push({ cells: [], flags: day.flags });

    const mutedEntry = [...entryStyles.slice(0, 4), STYLE.muted, ...entryStyles.slice(5)];

    this.band = !this.band;
    units.forEach((u, k) => {
      const first = k === 0;
      let cells = u.cells.length === 0 ? [] : first ? [...dayCells, ...u.cells.slice(3)] : u.cells;
      const styles = cells[4] === '—' ? mutedEntry : entryStyles;
      let rowH = cells.length > 0 ? this.rowHeight(cells, styles) : 0;
      const flagTexts = u.flags.map((f) => `Flagged: ${f}`);
      const flagHs = flagTexts.map((f) => this.flagHeight(f));
      if (s.ensure(rowH + flagHs.reduce((a, b) => a + b, 0))) {
        this.header();
        // A day carried over to a new page says which day it is.
        if (!first) {
          const label = `${formatDay(day.date)}\n(cont.)`;
          if (cells.length > 0) {
            cells = [label, ...cells.slice(1)];
            rowH = this.rowHeight(cells, styles);
          } else {
            const cont = [label, '', '', '', '', '', '', '', ''];
            this.drawRow(cont, entryStyles, this.rowHeight(cont, entryStyles));
          }
        }
      }
      if (cells.length > 0) this.drawRow(cells, styles, rowH);
      flagTexts.forEach((f, i) => this.drawFlag(f, flagHs[i]));
    });
    s.rule(s.y, colors.line, 0.4);
  }

  total(headAtEnd: number, headDays: number): void {
    const s = this.s;
    const cells = ['Total', formatNumber(headAtEnd), headDaysText(headDays), '', 'head-days from the moves in this log', '', '', '', ''];
    const styles = [STYLE.bodyStrong, STYLE.cellStrong, STYLE.cellStrong, STYLE.cell, STYLE.muted, STYLE.cell, STYLE.cell, STYLE.cell, STYLE.cell];
    const h = this.rowHeight(cells, styles) + 2;
    if (s.ensure(h)) this.header();
    s.rule(s.y, colors.ink, 0.9);
    this.band = false;
    this.drawRow(cells, styles, h);
    s.rule(s.y, colors.ink, 0.9);
  }
}

function assertDaysAddUp(data: GrazingLogPdfData): void {
  const sum = data.log.days.reduce((n, d) => n + Math.round(d.headDays * UNITS), 0);
  if (sum !== Math.round(data.log.headDays * UNITS)) {
    throw new Error(`Grazing log PDF: the days add up to ${sum / UNITS} head-days, not the total ${data.log.headDays}`);
  }
}

function signatureLines(sig: PdfSignature | undefined, timeZone: string): Array<[string, TextStyle]> {
  if (!sig) return [['Not signed yet', STYLE.muted]];
  const lines: Array<[string, TextStyle]> = [
    [sig.typedName, STYLE.bodyStrong],
    [`Signed ${formatMoment(sig.signedAt, timeZone)}`, STYLE.body],
  ];
  if (sig.ip) lines.push([`from ${sig.ip}`, STYLE.muted]);
  return lines;
}

function drawSignatures(s: Sheet, data: GrazingLogPdfData): void {
  s.section('Signatures', 90);
  const colW = (CONTENT_WIDTH - 16) / 2;
  const parties: Array<['grower' | 'grazier', string]> = [
    ['grower', `Grower — ${partyLine(data.grower)}`],
    ['grazier', `Grazier — ${partyLine(data.grazier)}`],
  ];
  const y0 = s.y;
  let bottom = y0;
  parties.forEach(([role, heading], i) => {
    const x = LEFT + i * (colW + 16);
    let y = y0;
    y += s.cell(heading.toUpperCase(), x, y, STYLE.label, { width: colW }) + 2;
    for (const [text, style] of signatureLines(data.signatures.find((sg) => sg.role === role), data.timeZone)) {
      y += s.cell(text, x, y, style, { width: colW });
    }
    bottom = Math.max(bottom, y);
  });
  s.y = bottom + 6;
  s.ensure(30);
  const y = s.y;
  s.cell('TERMS HASH (SHA-256)', LEFT, y, STYLE.label, { width: CONTENT_WIDTH });
  const hy = y + s.lineHeight(STYLE.label) + 1;
  s.cell(data.termsSha256 ?? 'Not signed yet: the hash is taken when the terms are signed', LEFT, hy, data.termsSha256 ? STYLE.bodyStrong : STYLE.muted, { width: CONTENT_WIDTH });
  s.y = hy + s.lineHeight(STYLE.bodyStrong) + 1;
  s.paragraph('The SHA-256 digest of the terms both parties signed. Recomputing it from the contract’s terms checks that this record shows what was signed.', STYLE.muted, { gapAfter: 4 });
}

function drawTotals(s: Sheet, data: GrazingLogPdfData): void {
  const t = data.terms;
  const intake = intakeForFlock(t.species, t.animalClass);
  const lbPerHead = (t.bodyWeightLb * intake.pct) / 100;
  const aud = (data.log.headDays * lbPerHead) / AU_CONVENTION.lbDmPerAuDay;
  const aum = aud / AU_CONVENTION.daysPerAum;

  s.section('Totals', 110);
  drawFigures(s, [
    { label: 'Head-days from the log', value: headDaysText(data.log.headDays), unit: 'head-days' },
    { label: 'Animal-unit days', value: formatNumber(aud, 1), unit: 'AUD' },
    { label: 'Animal-unit months', value: formatNumber(aum, 2), unit: 'AUM' },
  ]);
  s.paragraph(`AUD at ${AU_CONVENTION.lbDmPerAuDay} lb DM per animal unit per day; AUM = AUD ÷ ${AU_CONVENTION.daysPerAum}.`, STYLE.bodyStrong, { gapAfter: 1 });
  s.paragraph(
    `Intake ${formatNumber(lbPerHead, 2)} lb DM per head per day: ${formatNumber(intake.pct, 1)} % of ${formatNumber(t.bodyWeightLb)} lb body weight (${intake.basis}; ${intake.source}). ` +
      `Convention: ${AU_CONVENTION.source} Head-days count the head on the block over elapsed time, split at local midnights (${data.timeZone}), up to ${formatMoment(data.log.until, data.timeZone)}.`,
    STYLE.muted,
    { gapAfter: 6 },
  );

  const a = data.agreed;
  s.ensure(40);
  const y = s.y;
  const h = a ? 38 : 26;
  s.box(LEFT, y, CONTENT_WIDTH, h, a ? colors.coverWash : colors.surfaceSunk);
  s.box(LEFT, y, 3, h, a ? colors.cover : colors.lineStrong);
  if (a) {
    s.cell(`Head-days agreed at sign-off: ${headDaysText(a.headDays)}`, LEFT + 10, y + 5, STYLE.bodyStrong, { width: CONTENT_WIDTH - 20 });
    s.cell(
      `Proposed by ${a.proposedBy.name}, ${formatMoment(a.proposedBy.at, data.timeZone)} · approved by ${a.approvedBy.name}, ${formatMoment(a.approvedBy.at, data.timeZone)}`,
      LEFT + 10,
      y + 5 + s.lineHeight(STYLE.bodyStrong) + 1,
      STYLE.body,
      { width: CONTENT_WIDTH - 20 },
    );
  } else {
    s.cell('Head-days not agreed yet: the figures above are the log as it stands.', LEFT + 10, y + 7, STYLE.body, { width: CONTENT_WIDTH - 20 });
  }
  s.y = y + h + 8;
}

function drawFlagged(s: Sheet, data: GrazingLogPdfData): void {
  const items: string[] = [];
  for (const d of data.log.days) {
    for (const e of d.entries) for (const f of e.flags) items.push(`${formatDay(d.date)}, ${formatClock(e.at, data.timeZone)} — ${f}`);
    for (const f of d.flags) items.push(`${formatDay(d.date)} — ${f}`);
  }
  s.section(`Flagged entries (${items.length})`, 30);
  if (items.length === 0) {
    s.paragraph('No entry is flagged.', STYLE.body, { gapAfter: 6 });
    return;
  }
  const LIMIT = 24;
  const line = s.lineHeight(STYLE.bodyStrong);
  const shown = items.slice(0, LIMIT);
  shown.forEach((item, i) => {
    const h = s.measure(item, STYLE.bodyStrong, { width: CONTENT_WIDTH - 14 });
    // The last item keeps the note under it on its page.
    s.ensure(h + 2 + (i === shown.length - 1 ? s.lineHeight(STYLE.muted) + 2 : 0));
    const y = s.y;
    s.flagMark(LEFT, y + (line - 7) / 2, 7);
    s.cell(item, LEFT + 12, y, STYLE.bodyStrong, { width: CONTENT_WIDTH - 14 });
    s.y = y + h + 2;
  });
  if (items.length > LIMIT) s.paragraph(`and ${items.length - LIMIT} more, each marked "Flagged" in the daily log below.`, STYLE.muted);
  else s.paragraph('Each is marked "Flagged" in the daily log below.', STYLE.muted);
  s.y += 6;
}

export async function renderGrazingLog(data: GrazingLogPdfData): Promise<Buffer> {
  assertDaysAddUp(data);
  const t = data.terms;
  const tz = data.timeZone;
  const s = new Sheet({
    title: `Grazing log — ${data.block.name} — contract ${shortId(data.contractId)} v${data.version}`,
    subject: `Fieldfold grazing log for contract ${data.contractId}, version ${data.version}`,
    createdAt: new Date(parseIsoInstant(data.generatedAt) ?? Number.NaN),
  });

  drawTitleBlock(s, {
    kind: 'Grazing log',
    title: data.block.name,
    subtitle: [data.block.placeName, `${formatNumber(data.block.acres, 2)} ac ${data.block.crop}`].filter(Boolean).join(' · '),
    meta: [
      ['Contract', data.contractId, 2.3],
      ['Version', String(data.version), 0.6],
      ['Generated', formatMoment(data.generatedAt, tz), 1.5],
    ],
  });

  s.section('Terms', 120);
  const days = daysBetween(t.startDate, t.endDate);
  drawKeyValues(s, [
    ['Grower', partyLine(data.grower)],
    ['Grazier', partyLine(data.grazier)],
    ['Block', `${data.block.name}${data.block.placeName ? `, ${data.block.placeName}` : ''} (${data.block.crop})`],
    ['Acres', `${formatNumber(data.block.acres, 2)} ac`],
    ['Forage standing', `${formatNumber(t.lbDmPerAcre)} lb DM/ac`],
    ['Target take', `${formatNumber(t.targetUtilizationPct, 1)} % of standing forage`],
    ['Priced', formatRate(t.basis, t.rate)],
    ['Head', `${formatNumber(t.headCount)} ${t.animalClass} (${t.species}), about ${formatNumber(t.bodyWeightLb)} lb each`],
    ['Dates', `${formatDayRange(t.startDate, t.endDate)} — ${days} day${days === 1 ? '' : 's'}, ${formatNumber(t.headCount * days)} head-days planned`],
    ['Animals out by', formatDay(t.outBy)],
    ['Services', t.services.length > 0 ? t.services.join(', ') : 'none agreed'],
    ['Restrictions', t.restrictions.length > 0 ? t.restrictions.join('\n') : 'none entered', true],
  ]);

  drawSignatures(s, data);
  drawTotals(s, data);
  drawFlagged(s, data);

  s.section('Daily log', 80);
  s.paragraph(
    `Times are local to the block (${tz}). Head on block is the count when the day ended; head-days are those earned that day. Residual is stubble height; taken is the estimated share of forage eaten.`,
    STYLE.muted,
    { gapAfter: 4 },
  );
  const table = new LogTable(s, tz);
  table.header();
  for (const d of data.log.days) table.day(d);
  const last = data.log.days[data.log.days.length - 1];
  table.total(last ? last.headAtEnd : 0, data.log.headDays);
  s.y += 14;

  drawCautions(s, data.cautions.length > 0 ? data.cautions : GENERAL_GRAZING_CAUTIONS);

  return s.finish(`Fieldfold grazing log · ${data.block.name} · contract ${shortId(data.contractId)} · version ${data.version}`);
}
