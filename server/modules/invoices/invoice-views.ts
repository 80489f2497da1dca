import type { EntityManager } from 'typeorm';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { readTogether } from '../../lib/db/reads';
import { Account } from '../accounts/account.entity';
import { Block } from '../blocks/block.entity';
import { blockSummary, partyOf } from '../blocks/block-views';
import { Contract } from '../contracts/contract.entity';
import { Document } from '../documents/document.entity';
import type { Invoice } from './invoice.entity';
import { invoicePdfUrl, signInvoicePdfAccess } from './pdf-access';
import type { LinkViewer } from '../../lib/http/auth';
import { displayStatus, invoiceNumberLabel } from '../../../lib/invoices';
import { todayIn } from '../../../lib/day-keys';
import { TEST_PAYMENT_METHODS } from '../../../lib/payments';
import type { InvoiceListItem, InvoiceView } from '../../../lib/schemas/invoice';

// Stored invoices as the API returns them, for one viewer (their side, their PDF link). "Overdue" is worked out
// on the block's calendar: the due day is still on time there.

export interface ViewContext {
  now: () => number;
  tokenSecret: string;
}

function methodLabel(id: string | null): string | null {
  const m = TEST_PAYMENT_METHODS.find((t) => t.id === id);
  return m ? `${m.label} (${m.detail})` : null;
}

// What the views read of each invoice's contract, block, parties and newest PDF: only the columns shown (a
// contract row also carries its terms and their text, which a list of invoices never needs).
const viewContracts = new PreparedSelect((em) =>
  em
    .createQueryBuilder(Contract, 'c')
    .select(['c.id', 'c.blockId', 'c.timeZone', 'c.startDate', 'c.endDate', 'c.headCount', 'c.species', 'c.animalClass', 'c.agreedHeadDays'])
    .where('c.id IN (:...ids)'),
);
const viewBlocks = new PreparedSelect((em) =>
  em.createQueryBuilder(Block, 'b').select(['b.id', 'b.name', 'b.status', 'b.crop', 'b.acres', 'b.placeName', 'b.timeZone']).where('b.id IN (:...ids)'),
);
const viewPeople = new PreparedSelect((em) => em.createQueryBuilder(Account, 'a').select(['a.id', 'a.name', 'a.businessName']).where('a.id IN (:...ids)'));
const viewPdfs = new PreparedSelect((em) =>
  em
    .createQueryBuilder(Document, 'd')
    .select(['d.id', 'd.invoiceId', 'd.version', 'd.sha256'])
    .where("d.kind = 'invoice' AND d.invoice_id IN (:...ids)")
    .orderBy('d.version', 'DESC'),
);

/** Invoices as their own page shows them, with a signed link to the PDF. */
export async function invoiceViews(em: EntityManager, ctx: ViewContext, viewer: LinkViewer, invoices: Invoice[]): Promise<InvoiceView[]> {
  return (await views(em, ctx, viewer, invoices, true)) as InvoiceView[];
}

/**
 * Invoices as the list shows them: the same, without the PDF link (the list offers none; each link is a token
 * signed for that invoice and viewer, 25 signatures a page for links nobody follows from there).
 */
export async function invoiceListItems(em: EntityManager, ctx: ViewContext, viewer: LinkViewer, invoices: Invoice[]): Promise<InvoiceListItem[]> {
  return views(em, ctx, viewer, invoices, false);
}

async function views(em: EntityManager, ctx: ViewContext, viewer: LinkViewer, invoices: Invoice[], pdfLinks: boolean): Promise<Array<InvoiceListItem & { pdf: { url?: string } }>> {
  if (invoices.length === 0) return [];
  const contracts = await viewContracts.many(em, { ids: [...new Set(invoices.map((i) => i.contractId))] });
  const contractById = new Map(contracts.map((c) => [c.id, c]));
  const [blocks, people, docs] = await readTogether(em, [
    () => viewBlocks.many(em, { ids: [...new Set(contracts.map((c) => c.blockId))] }),
    () => viewPeople.many(em, { ids: [...new Set(invoices.flatMap((i) => [i.growerId, i.grazierId]))] }),
    // The newest stored PDF of each (documents keep every version; the view names the latest).
    () => viewPdfs.many(em, { ids: invoices.map((i) => i.id) }),
  ]);
  const blockById = new Map(blocks.map((b) => [b.id, b]));
  const pdfOf = new Map<string, Document>();
  for (const d of docs) if (d.invoiceId && !pdfOf.has(d.invoiceId)) pdfOf.set(d.invoiceId, d);
  const personById = new Map(people.map((p) => [p.id, p]));
  const party = (id: string) => {
    const p = personById.get(id);
    return p ? partyOf(p) : { id, name: 'Unknown', businessName: null };
  };
  const now = ctx.now();
  const todays = new Map<string, string>();
  const todayAt = (zone: string) => todays.get(zone) ?? todays.set(zone, todayIn(zone, now)).get(zone)!;
  return invoices.map((inv) => {
    const contract = contractById.get(inv.contractId)!;
    const block = blockById.get(contract.blockId)!;
    const today = todayAt(contract.timeZone);
    const paying = inv.payingUntil !== null && inv.payingUntil > now;
    return {
      id: inv.id,
      number: inv.number,
      numberLabel: invoiceNumberLabel(inv.numberPrefix, inv.number),
      contractId: inv.contractId,
      block: blockSummary(block),
      grower: party(inv.growerId),
      grazier: party(inv.grazierId),
      viewerSide: inv.grazierId === viewer.id ? 'receivable' : 'payable',
      status: inv.status,
      displayStatus: displayStatus(inv.status, inv.dueDate, today),
      issueDate: inv.issueDate,
      dueDate: inv.dueDate,
      paymentTermsDays: inv.paymentTermsDays,
      currency: inv.currency,
      basis: inv.basis,
      rate: inv.rate,
      quantity: inv.quantity,
      agreedHeadDays: inv.basis === 'head-day' ? inv.quantity : (contract.agreedHeadDays ?? null),
      stay: { startDate: contract.startDate, endDate: contract.endDate, headCount: contract.headCount, species: contract.species, animalClass: contract.animalClass },
      servicesIncluded: inv.services,
      lines: inv.lines,
      subtotalCents: inv.subtotalCents,
      totalCents: inv.totalCents,
      payment: {
        ready: inv.status === 'sent',
        inProgress: paying,
        lastFailure:
          inv.status !== 'paid' && inv.lastFailureMessage && inv.lastFailureAt !== null
            ? { code: inv.lastFailureCode, declineCode: inv.lastFailureDeclineCode, message: inv.lastFailureMessage, at: new Date(inv.lastFailureAt).toISOString() }
            : null,
      },
      receipt:
        inv.status === 'paid' && inv.paidAt !== null
          ? {
              paidAt: new Date(inv.paidAt).toISOString(),
              paidDay: inv.paidDay ?? todayIn(contract.timeZone, inv.paidAt),
              amountCents: inv.totalCents,
              method: methodLabel(inv.paidWith),
              reference: inv.providerNumber ?? inv.providerInvoiceId,
            }
          : null,
      pdf: {
        ...(pdfLinks ? { url: invoicePdfUrl(inv.id, signInvoicePdfAccess(ctx.tokenSecret, inv.id, viewer)) } : {}),
        sha256: pdfOf.get(inv.id)?.sha256 ?? null,
        version: pdfOf.get(inv.id)?.version ?? null,
      },
      createdAt: new Date(inv.createdAt).toISOString(),
    };
  });
}
