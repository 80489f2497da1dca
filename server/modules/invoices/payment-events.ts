import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import type { PaymentEvent } from '../../lib/payments';
import { Invoice, PaymentEventRecord } from './invoice.entity';
import type { ServiceContext } from '../../lib/service-context';
import { markPaid, markSent, refreshInvoicePdf } from './invoice-sync';

// Events from the payments API, each applied once. The event's id is stored in the same transaction that applies
// it (its primary key refuses a second row), so a redelivered event changes nothing. Events may arrive in any
// order: each one only moves an invoice forward (draft → sent → paid; void), never back, so "paid" arriving
// before "finalized" ends paid, and the late "finalized" is recorded as no change. Two deliveries of one event
// racing in different processes both pass the first look; the loser's insert of the event id meets the primary
// key, its transaction (and whatever it changed) rolls back, and it answers 'duplicate' like a late redelivery.

export type EventOutcome = 'applied' | 'no-change' | 'unmatched' | 'ignored' | 'duplicate';

export async function applyPaymentEvent(ctx: ServiceContext, event: PaymentEvent): Promise<EventOutcome> {
  let invoiceId: string | null = null;
  const outcome = await applyInTransaction(ctx, event, (id) => (invoiceId = id)).catch(async (err: unknown): Promise<EventOutcome> => {
    if (isUniqueViolation(err) && (await ctx.ds.manager.existsBy(PaymentEventRecord, { id: event.id }))) return 'duplicate';
    throw err;
  });
  if (outcome === 'applied' && invoiceId) {
    ctx.outbox.kick();
    await refreshInvoicePdf(ctx, invoiceId);
  }
  return outcome;
}

function applyInTransaction(ctx: ServiceContext, event: PaymentEvent, matched: (invoiceId: string | null) => void): Promise<EventOutcome> {
  return inTransaction(ctx.ds, async (tx): Promise<EventOutcome> => {
    if (await tx.findOneBy(PaymentEventRecord, { id: event.id })) return 'duplicate';
    let invoice: Invoice | null = null;
    if (event.invoice) {
      invoice = await tx.findOneBy(Invoice, { providerInvoiceId: event.invoice.id });
      // The API may tell of an invoice before Fieldfold recorded its id (a crash between the call and the record):
      // the metadata written at creation leads back to it.
      if (!invoice && event.invoice.fieldfoldInvoiceId) {
        invoice = await tx.findOneBy(Invoice, { id: event.invoice.fieldfoldInvoiceId });
        if (invoice && invoice.providerInvoiceId === null) {
          await tx.update(Invoice, { id: invoice.id }, { providerInvoiceId: event.invoice.id, providerCustomerId: invoice.providerCustomerId ?? event.invoice.customerId, updatedAt: ctx.now() });
        } else if (invoice && invoice.providerInvoiceId !== event.invoice.id) {
          invoice = null;
        }
      }
    }
    let result: EventOutcome;
    if (!event.invoice) result = 'ignored';
    else if (!invoice) result = 'unmatched';
    else {
      const provider = event.invoice;
      switch (event.type) {
        case 'invoice.finalized':
          result = invoice.status === 'draft' && (await markSent(tx, ctx, invoice.id, provider)) ? 'applied' : 'no-change';
          break;
        case 'invoice.paid':
        case 'invoice.payment_succeeded':
          result = (await markPaid(tx, ctx, invoice.id, { paidAt: provider.paidAt ?? event.createdAt, paidWith: null, provider })) ? 'applied' : 'no-change';
          break;
        case 'invoice.voided': {
          const res = await tx
            .createQueryBuilder()
            .update(Invoice)
            .set({ status: 'void', voidedAt: event.createdAt, providerStatus: 'void', updatedAt: ctx.now() })
            .where('id = :id AND status IN (:...open)', { id: invoice.id, open: ['draft', 'sent'] })
            .execute();
          result = res.affected === 1 ? 'applied' : 'no-change';
          break;
        }
        default:
          // invoice.created, invoice.payment_failed (the pay action records the reason in its own words), …
          result = 'ignored';
      }
    }
    matched(invoice?.id ?? null);
    await tx.insert(PaymentEventRecord, { id: event.id, type: event.type, invoiceId: invoice?.id ?? null, outcome: result, receivedAt: ctx.now() });
    return result;
  });
}
