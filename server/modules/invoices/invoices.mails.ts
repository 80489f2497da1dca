import { composeMail } from '../../lib/mail/compose';
import type { AppLinks } from '../../lib/mail/links';
import type { MailMessage } from '../../lib/mail/mail-port';
import { formatCents } from '../../../lib/money';
import { formatDay } from '../../../lib/format';
import { paymentTermsLabel, type InvoiceView } from '../../../lib/schemas/invoice';

// What invoicing mails, composed here and queued by the use case in the transaction that changes the invoice.

export interface Recipient {
  email: string;
  name: string;
}

function who(p: { name: string; businessName: string | null }): string {
  return p.businessName ?? p.name;
}

function facts(inv: InvoiceView): Array<[string, string]> {
  return [
    ['Invoice', inv.numberLabel],
    ['Block', inv.block.name],
    ...inv.lines.map((l): [string, string] => [l.description, formatCents(l.amountCents)]),
    ['Total', formatCents(inv.totalCents)],
  ];
}

/** To the grower, when the invoice is issued in the payments API and can be paid. */
export function invoiceSentMail(links: AppLinks, inv: InvoiceView, grower: Recipient): MailMessage {
  return composeMail({
    to: grower.email,
    subject: `Invoice ${inv.numberLabel} from ${who(inv.grazier)}: ${formatCents(inv.totalCents)} due ${formatDay(inv.dueDate)}`,
    greeting: `Hello ${grower.name},`,
    paragraphs: [
      `${who(inv.grazier)} invoiced the grazing on ${inv.block.name}, billed on the head-days you both signed off.`,
      `${paymentTermsLabel(inv.paymentTermsDays)}: please pay by ${formatDay(inv.dueDate)}. You can pay online from the invoice in Fieldfold and download it as a PDF.`,
    ],
    facts: facts(inv),
    action: { label: 'Open the invoice', url: links.invoice(inv.id) },
  });
}

/** To both parties, once, when the invoice is paid (from the pay action or the payments API's event). */
export function receiptMails(links: AppLinks, inv: InvoiceView, grower: Recipient, grazier: Recipient): MailMessage[] {
  const paidOn = formatDay(inv.receipt?.paidDay ?? inv.issueDate);
  const receiptFacts: Array<[string, string]> = [
    ...facts(inv),
    ['Paid', paidOn],
    ...(inv.receipt?.method ? [['Paid with', inv.receipt.method] as [string, string]] : []),
    ...(inv.receipt?.reference ? [['Payment reference', inv.receipt.reference] as [string, string]] : []),
  ];
  return [
    composeMail({
      to: grower.email,
      subject: `Receipt: invoice ${inv.numberLabel} paid, ${formatCents(inv.totalCents)}`,
      greeting: `Hello ${grower.name},`,
      paragraphs: [`Thank you: your payment of ${formatCents(inv.totalCents)} to ${who(inv.grazier)} for grazing on ${inv.block.name} went through. Keep this mail as your receipt.`],
      facts: receiptFacts,
      action: { label: 'See the receipt', url: links.invoice(inv.id) },
    }),
    composeMail({
      to: grazier.email,
      subject: `Invoice ${inv.numberLabel} was paid: ${formatCents(inv.totalCents)}`,
      greeting: `Hello ${grazier.name},`,
      paragraphs: [`${who(inv.grower)} paid invoice ${inv.numberLabel} for the grazing on ${inv.block.name}.`],
      facts: receiptFacts,
      action: { label: 'Open the invoice', url: links.invoice(inv.id) },
    }),
  ];
}
