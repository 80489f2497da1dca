import { parseIsoInstant } from '../../../lib/dates';
import { formatDay, formatDayRange, formatNumber } from '../../../lib/format';
import { formatCents } from '../../../lib/money';
import { formatRateAmount } from '../../../lib/terms';
import { formatMoment, shortId } from './format';
import { drawTitleBlock } from './parts';
import { CONTENT_WIDTH, LEFT, RIGHT, STYLE, Sheet, colors, columnStarts, type TableColumn, type TextStyle } from './sheet';
import type { InvoicePdfData, InvoicePdfLine, InvoicePdfParty } from './types';

// The invoice a grazier sends a grower, as a file for both: who, what for, each line with its quantity,
// unit, rate and amount, the total, and whether it is paid. Amounts are integer cents printed with
// lib/money formatCents; the renderer refuses to print lines that do not add up to the totals it is given.

const COLUMNS: TableColumn[] = [
  { label: 'Description', width: 212, align: 'left' },
  { label: 'Quantity', width: 70, align: 'right' },
  { label: 'Unit', width: 70, align: 'left' },
  { label: 'Rate', width: 70, align: 'right' },
  { label: 'Amount', width: 90, align: 'right' },
];
const COL_X = columnStarts(COLUMNS);
const PAD_X = 4;
const PAD_Y = 4;

function assertAddsUp(data: InvoicePdfData): void {
  const grazing = data.lines.filter((l) => l.kind === 'grazing').reduce((n, l) => n + l.amountCents, 0);
  const all = data.lines.reduce((n, l) => n + l.amountCents, 0);
  for (const l of data.lines) {
    if (!Number.isSafeInteger(l.amountCents)) throw new Error(`Invoice PDF: line "${l.description}" is not a whole number of cents`);
  }
  if (grazing !== data.subtotalCents) throw new Error(`Invoice PDF: grazing lines add up to ${grazing} cents, not the subtotal ${data.subtotalCents}`);
  if (all !== data.totalCents) throw new Error(`Invoice PDF: lines add up to ${all} cents, not the total ${data.totalCents}`);
  if (data.status === 'paid' && !data.paidAt) throw new Error('Invoice PDF: a paid invoice needs the time it was paid');
}

function partyBlock(s: Sheet, x: number, y: number, w: number, heading: string, p: InvoicePdfParty): number {
  let cy = y;
  cy += s.cell(heading.toUpperCase(), x, cy, STYLE.label, { width: w }) + 2;
  cy += s.cell(p.businessName ?? p.name, x, cy, STYLE.bodyStrong, { width: w });
  const more = [p.businessName ? p.name : null, p.place, p.email, p.phone].filter((v): v is string => !!v);
  for (const line of more) cy += s.cell(line, x, cy, STYLE.body, { width: w });
  return cy - y;
}

function lineCells(l: InvoicePdfLine): string[] {
  return [l.description, formatNumber(l.quantity, 4), l.unit, formatRateAmount(l.rate), formatCents(l.amountCents)];
}

function drawRow(s: Sheet, cells: string[], styles: TextStyle[], fill: string | null): void {
  const h = Math.max(...cells.map((t, i) => s.measure(t, styles[i], { width: COLUMNS[i].width - 2 * PAD_X }))) + 2 * PAD_Y;
  if (s.ensure(h)) drawHeader(s);
  const y = s.y;
  if (fill) s.box(LEFT, y, CONTENT_WIDTH, h, fill);
  cells.forEach((t, i) => s.cell(t, COL_X[i] + PAD_X, y + PAD_Y, styles[i], { width: COLUMNS[i].width - 2 * PAD_X, align: COLUMNS[i].align }));
  s.y = y + h;
  s.rule(s.y, colors.line, 0.5);
}

function drawHeader(s: Sheet): void {
  const h = s.lineHeight(STYLE.head) + 2 * PAD_Y;
  const y = s.y;
  s.box(LEFT, y, CONTENT_WIDTH, h, colors.coverWash);
  COLUMNS.forEach((c, i) => s.cell(c.label, COL_X[i] + PAD_X, y + PAD_Y, STYLE.head, { width: c.width - 2 * PAD_X, align: c.align }));
  s.rule(y + h, colors.cover, 0.9);
  s.y = y + h;
}

function sumRow(s: Sheet, label: string, cents: number, strong: boolean): void {
  const style = strong ? { ...STYLE.bodyStrong, size: 11 } : STYLE.body;
  const h = s.lineHeight(style) + 2 * PAD_Y;
  s.ensure(h);
  const y = s.y;
  const amountW = COLUMNS[4].width;
  const labelW = 160;
  s.cell(label, RIGHT - amountW - labelW, y + PAD_Y, style, { width: labelW - PAD_X, align: 'right' });
  s.cell(formatCents(cents), RIGHT - amountW + PAD_X, y + PAD_Y, style, { width: amountW - 2 * PAD_X, align: 'right' });
  s.y = y + h;
  if (strong) s.rule(s.y, colors.ink, 1, RIGHT - amountW - labelW, RIGHT);
}

function drawStatus(s: Sheet, data: InvoicePdfData): void {
  const paid = data.status === 'paid';
  const text = paid ? `PAID ${formatMoment(data.paidAt as string, data.timeZone)}` : `SENT · DUE ${formatDay(data.dueOn).toUpperCase()}`;
  const style: TextStyle = { ...STYLE.bodyStrong, color: paid ? colors.ok : colors.caution };
  const w = s.widthOf(text, style) + 20;
  const h = s.lineHeight(style) + 10;
  const y = s.y;
  // Words and a drawn outline, so the status reads the same printed in grey.
  s.box(RIGHT - w, y, w, h, paid ? colors.coverWash : colors.cautionWash, paid ? colors.ok : colors.cautionLine, 1.2);
  s.cell(text, RIGHT - w + 10, y + 5, style, { width: w - 18 });
}

export async function renderInvoice(data: InvoicePdfData): Promise<Buffer> {
  assertAddsUp(data);
  const tz = data.timeZone;
  const s = new Sheet({
    title: `Invoice ${data.number} — ${data.block.name}`,
    subject: `Fieldfold invoice ${data.number} (${data.invoiceId}), version ${data.version}`,
    createdAt: new Date(parseIsoInstant(data.generatedAt) ?? Number.NaN),
  });

  drawTitleBlock(s, {
    kind: 'Invoice',
    title: `Invoice ${data.number}`,
    subtitle: `Contract grazing on ${data.block.name}${data.block.placeName ? `, ${data.block.placeName}` : ''}`,
    meta: [
      ['Issued', formatDay(data.issuedOn)],
      ['Due', formatDay(data.dueOn)],
      ['Contract', shortId(data.contractId)],
      ['Version', String(data.version)],
    ],
  });

  drawStatus(s, data);
  const colW = (CONTENT_WIDTH - 200) / 2;
  const y = s.y;
  const h1 = partyBlock(s, LEFT, y, colW, 'From (grazier)', data.from);
  const h2 = partyBlock(s, LEFT + colW + 20, y, colW, 'Bill to (grower)', data.to);
  s.y = y + Math.max(h1, h2, 30) + 14;

  const ref = [`Contract ${data.contractId}`, `block ${data.block.name}`, data.stay ? `stay ${formatDayRange(data.stay.startDate, data.stay.endDate)}` : null].filter(Boolean).join(' · ');
  s.paragraph(ref, STYLE.muted, { gapAfter: 8 });

  drawHeader(s);
  const cellStyles = [STYLE.body, STYLE.body, STYLE.body, STYLE.body, STYLE.bodyStrong];
  // Grazing lines first, then fees; the sums under the table name both parts.
  const ordered = [...data.lines.filter((l) => l.kind === 'grazing'), ...data.lines.filter((l) => l.kind === 'fee')];
  ordered.forEach((l) => drawRow(s, lineCells(l), cellStyles, null));
  s.y += 3;
  const feesCents = data.totalCents - data.subtotalCents;
  sumRow(s, feesCents > 0 ? 'Grazing subtotal' : 'Subtotal', data.subtotalCents, false);
  if (feesCents > 0) sumRow(s, 'Fees', feesCents, false);
  sumRow(s, paidTotalLabel(data), data.totalCents, true);
  s.y += 18;

  s.section('Payment', 50);
  s.paragraph(data.paymentTerms, STYLE.body, { gapAfter: 4 });
  s.paragraph(
    data.status === 'paid'
      ? `Paid in full ${formatMoment(data.paidAt as string, tz)}. Keep this invoice with the signed grazing log for the contract.`
      : `Amount due ${formatCents(data.totalCents)} by ${formatDay(data.dueOn)}. Pay online from the invoice in Fieldfold; the head-days billed are the ones both parties agreed at sign-off.`,
    STYLE.body,
    { gapAfter: 4 },
  );
  s.paragraph(`Generated ${formatMoment(data.generatedAt, tz)}. Amounts in US dollars; each line is rounded half-up to the cent.`, STYLE.muted);

  return s.finish(`Fieldfold invoice ${data.number} · contract ${shortId(data.contractId)} · version ${data.version}`);
}

function paidTotalLabel(data: InvoicePdfData): string {
  return data.status === 'paid' ? 'Total (paid)' : 'Total due';
}
