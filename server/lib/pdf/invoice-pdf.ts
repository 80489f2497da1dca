import fs from 'node:fs';
import path from 'node:path';
import PDFDocument from 'pdfkit';
import { formatCents } from '../../../lib/money';
import { formatDay, formatDayRange, formatNumber } from '../../../lib/format';
import { formatRate } from '../../../lib/terms';
import { paymentTermsLabel, type InvoiceView } from '../../../lib/schemas/invoice';
import { colors } from '../../../components/ui/theme';

// The invoice as a PDF for both parties' files, drawn with pdfkit in the same fonts the app ships (Public Sans and
// Bitter from assets/fonts, embedded and subset by pdfkit, so the text stays selectable and pdftotext reads it).
// Letter size, 0.75 in margins. Its content is fixed at issue: payment is recorded in Fieldfold and on the
// receipt, not by rewriting the invoice.

/** assets/fonts, found upward from this file (source: server/lib/pdf; build: build/server/lib/pdf). */
function fontsDir(): string {
  let dir = __dirname;
  for (let i = 0; i < 6; i++) {
    const candidate = path.join(dir, 'assets', 'fonts');
    if (fs.existsSync(path.join(candidate, 'PublicSans_400Regular.ttf'))) return candidate;
    dir = path.dirname(dir);
  }
  throw new Error('assets/fonts not found: the invoice PDF needs the Public Sans and Bitter TTFs');
}

const FONT_FILES = {
  body: 'PublicSans_400Regular.ttf',
  strong: 'PublicSans_600SemiBold.ttf',
  bold: 'PublicSans_700Bold.ttf',
  display: 'Bitter_700Bold.ttf',
  heading: 'Bitter_600SemiBold.ttf',
} as const;

function partyLines(p: { name: string; businessName: string | null }): string {
  return p.businessName ? `${p.businessName}\n${p.name}` : p.name;
}

export interface InvoicePdfInput {
  invoice: InvoiceView;
  /** Where the grower pays online (a link into the app). */
  payUrl: string;
}

export function renderInvoicePdf({ invoice: inv, payUrl }: InvoicePdfInput): Promise<Buffer> {
  const fonts = fontsDir();
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 54,
    // Fixed to the issue so the same invoice renders to the same metadata.
    info: { Title: `Invoice ${inv.numberLabel}`, Author: inv.grazier.businessName ?? inv.grazier.name, Subject: `Grazing on ${inv.block.name}`, Creator: 'Fieldfold', CreationDate: new Date(inv.createdAt) },
  });
  for (const [name, file] of Object.entries(FONT_FILES)) doc.registerFont(name, path.join(fonts, file));
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;

  doc.font('display').fontSize(20).fillColor(colors.coverDeep).text('Fieldfold', left, 54);
  doc.font('body').fontSize(9).fillColor(colors.inkMuted).text('Contract grazing records', left, doc.y);
  doc.font('heading').fontSize(22).fillColor(colors.ink).text(`Invoice ${inv.numberLabel}`, left, 54, { width, align: 'right' });
  doc.font('body').fontSize(10).fillColor(colors.inkMuted).text(`Issued ${formatDay(inv.issueDate)}`, left, doc.y, { width, align: 'right' });
  doc.text(`Due ${formatDay(inv.dueDate)} (${paymentTermsLabel(inv.paymentTermsDays).toLowerCase()})`, { width, align: 'right' });

  const partiesTop = 130;
  const col = width / 2;
  doc.font('strong').fontSize(9).fillColor(colors.inkMuted).text('FROM (GRAZIER)', left, partiesTop);
  doc.font('body').fontSize(11).fillColor(colors.ink).text(partyLines(inv.grazier), left, doc.y + 2, { width: col - 12 });
  doc.font('strong').fontSize(9).fillColor(colors.inkMuted).text('BILL TO (GROWER)', left + col, partiesTop);
  doc.font('body').fontSize(11).fillColor(colors.ink).text(partyLines(inv.grower), left + col, doc.y + 2, { width: col - 12 });

  let y = partiesTop + 62;
  const fact = (label: string, value: string) => {
    doc.font('strong').fontSize(9).fillColor(colors.inkMuted).text(label, left, y, { width: 120 });
    doc.font('body').fontSize(10).fillColor(colors.ink).text(value, left + 120, y, { width: width - 120 });
    y = doc.y + 4;
  };
  fact('Block', `${inv.block.name}${inv.block.placeName ? `, ${inv.block.placeName}` : ''}`);
  fact('Stay', `${formatDayRange(inv.stay.startDate, inv.stay.endDate)} · ${formatNumber(inv.stay.headCount)} ${inv.stay.animalClass} (${inv.stay.species})`);
  fact('Price', formatRate(inv.basis, inv.rate));
  if (inv.agreedHeadDays !== null) fact('Head-days agreed', `${formatNumber(inv.agreedHeadDays, 4)} (signed off by both parties from the grazing log)`);
  if (inv.servicesIncluded.length) fact('Services included', `${inv.servicesIncluded.join(', ')} (in the price)`);

  // The lines: description, then the amount right-aligned; quantity and rate are in the description's words.
  y += 14;
  const amountW = 110;
  doc.rect(left, y, width, 22).fill(colors.surfaceSunk);
  doc.font('strong').fontSize(9).fillColor(colors.inkMuted).text('DESCRIPTION', left + 8, y + 7, { width: width - amountW - 16 });
  doc.text('AMOUNT', left + width - amountW - 8, y + 7, { width: amountW, align: 'right' });
  y += 28;
  for (const line of inv.lines) {
    doc.font('body').fontSize(11).fillColor(colors.ink).text(line.description, left + 8, y, { width: width - amountW - 16 });
    const bottom = doc.y;
    doc.text(formatCents(line.amountCents), left + width - amountW - 8, y, { width: amountW, align: 'right' });
    y = Math.max(bottom, doc.y) + 8;
    doc.moveTo(left, y - 4).lineTo(left + width, y - 4).lineWidth(0.5).strokeColor(colors.line).stroke();
  }
  y += 6;
  const total = (label: string, cents: number, strong: boolean) => {
    doc.font(strong ? 'bold' : 'body').fontSize(strong ? 13 : 11).fillColor(colors.ink);
    doc.text(label, left + width - amountW - 180, y, { width: 172, align: 'right' });
    doc.text(formatCents(cents), left + width - amountW - 8, y, { width: amountW, align: 'right' });
    y = doc.y + 6;
  };
  total('Subtotal', inv.subtotalCents, false);
  total('Total due (USD)', inv.totalCents, true);

  y += 24;
  doc.font('heading').fontSize(12).fillColor(colors.coverDeep).text('How to pay', left, y);
  doc.font('body').fontSize(10).fillColor(colors.ink).text(`Pay online in Fieldfold by ${formatDay(inv.dueDate)}: ${payUrl}`, left, doc.y + 4, { width });
  doc.fillColor(colors.inkMuted).fontSize(9).text(
    'Card details are entered with the payments service, never with Fieldfold. Both parties can download this invoice from the contract in Fieldfold.',
    left,
    doc.y + 6,
    { width },
  );
  doc.fontSize(8).fillColor(colors.inkFaint).text(`Invoice id ${inv.id} · contract ${inv.contractId}`, left, doc.page.height - doc.page.margins.bottom - 12, { width, lineBreak: false });

  doc.end();
  return done;
}
