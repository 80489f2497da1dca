import { IsNull, type EntityManager } from 'typeorm';
import { inTransaction } from '../../lib/db/transaction';
import { queueMail } from '../../lib/mail/outbox';
import { customerKey, PaymentsUnavailableError, type ProviderInvoice } from '../../lib/payments';
import { invoiceLinesFromCharge, type InvoicePdfData } from '../../lib/pdf/pdf-renderer';
import { latestDocument, storeRenderedDocument, type Document } from '../documents/documents.service';
import { Account } from '../accounts/account.entity';
import { Contract } from '../contracts/contract.entity';
import { Invoice, PaymentCustomer } from './invoice.entity';
import type { ServiceContext } from '../../lib/service-context';
import { invoiceViews } from './invoice-views';
import { invoiceSentMail, receiptMails } from './invoices.mails';
import { todayIn } from '../../../lib/day-keys';
import { invoiceNumberLabel } from '../../../lib/invoices';
import { formatDay } from '../../../lib/format';
import { paymentTermsLabel } from '../../../lib/schemas/invoice';

// Creating an invoice in the payments API, step by step, never inside a write transaction: the invoice row was
// committed first; each API call runs on its own, and each id it returns is recorded in a short transaction of
// its own. Every call carries an idempotency key derived from the contract, so repeating the whole sequence —
// after a crash between two steps, a timeout, or two requests racing — returns the same customer, invoice and
// lines instead of making new ones. A payments service that is down delays the invoice (it stays "being issued"
// and is retried with backoff), never undoes it.

/** Retry delays after the 1st, 2nd, … failure to reach the payments API; the last one repeats. */
export const SYNC_BACKOFF_MS = [10_000, 60_000, 5 * 60_000, 30 * 60_000];

/** The idempotency key base of everything one contract's invoice makes in the payments API. */
export function invoiceKeyBase(inv: Pick<Invoice, 'contractId'>): string {
  return `fieldfold:invoice:${inv.contractId}`;
}

export async function viewForMail(em: EntityManager, ctx: ServiceContext, inv: Invoice) {
  const [view] = await invoiceViews(em, ctx, { id: inv.grazierId }, [inv]);
  const people = await em.findBy(Account, [{ id: inv.growerId }, { id: inv.grazierId }]);
  const person = (id: string) => {
    const p = people.find((x) => x.id === id)!;
    return { email: p.email, name: p.name };
  };
  return { view, grower: person(inv.growerId), grazier: person(inv.grazierId) };
}

/** draft → sent, once (the conditional UPDATE decides), with the grower's mail in the same transaction. */
export async function markSent(tx: EntityManager, ctx: ServiceContext, invoiceId: string, provider: ProviderInvoice): Promise<boolean> {
  const res = await tx
    .createQueryBuilder()
    .update(Invoice)
    .set({ status: 'sent', providerStatus: provider.status, providerNumber: provider.number, syncError: null, syncNextAt: null, updatedAt: ctx.now() })
    .where('id = :id AND status = :draft', { id: invoiceId, draft: 'draft' })
    .execute();
  if (res.affected !== 1) return false;
  const inv = await tx.findOneByOrFail(Invoice, { id: invoiceId });
  const { view, grower } = await viewForMail(tx, ctx, inv);
  await queueMail(tx, [invoiceSentMail(ctx.links, view, grower)], ctx.now());
  return true;
}

/**
 * Marks the invoice and its contract paid, once: from being issued, sent, or even void (money that moved is a
 * fact to record). The receipts to both parties are queued in the same transaction, so a payment recorded twice
 * (the pay action and the API's event, or two events) mails once.
 */
export async function markPaid(
  tx: EntityManager,
  ctx: ServiceContext,
  invoiceId: string,
  p: { paidAt: number; paidWith: string | null; provider: ProviderInvoice | null },
): Promise<boolean> {
  const inv = await tx.findOneBy(Invoice, { id: invoiceId });
  if (!inv || inv.status === 'paid') return false;
  const contract = await tx.findOneByOrFail(Contract, { id: inv.contractId });
  const res = await tx
    .createQueryBuilder()
    .update(Invoice)
    .set({
      status: 'paid',
      paidAt: p.paidAt,
      paidDay: todayIn(contract.timeZone, p.paidAt),
      paidWith: p.paidWith,
      payingUntil: null,
      providerStatus: 'paid',
      ...(p.provider?.number ? { providerNumber: p.provider.number } : {}),
      updatedAt: ctx.now(),
    })
    .where('id = :id AND status <> :paid', { id: invoiceId, paid: 'paid' })
    .execute();
  if (res.affected !== 1) return false;
  await tx
    .createQueryBuilder()
    .update(Contract)
    .set({ status: 'paid' })
    .where('id = :id AND status IN (:...from)', { id: inv.contractId, from: ['agreed', 'invoiced'] })
    .execute();
  const paid = await tx.findOneByOrFail(Invoice, { id: invoiceId });
  const { view, grower, grazier } = await viewForMail(tx, ctx, paid);
  await queueMail(tx, receiptMails(ctx.links, view, grower, grazier), ctx.now());
  return true;
}

async function recordFailure(ctx: ServiceContext, inv: Invoice, err: unknown): Promise<void> {
  const reason = (err instanceof Error ? err.message : String(err)).replace(/\s+/g, ' ').slice(0, 480);
  const attempts = inv.syncAttempts + 1;
  const delay = SYNC_BACKOFF_MS[Math.min(attempts - 1, SYNC_BACKOFF_MS.length - 1)];
  await inTransaction(ctx.ds, (tx) => tx.update(Invoice, { id: inv.id }, { syncAttempts: attempts, syncError: reason, syncNextAt: ctx.now() + delay, updatedAt: ctx.now() }));
  if (!(err instanceof PaymentsUnavailableError)) ctx.log(`[invoices] could not create invoice ${inv.id} in the payments API: ${reason}`);
}

async function customerFor(ctx: ServiceContext, inv: Invoice): Promise<string> {
  if (inv.providerCustomerId) return inv.providerCustomerId;
  const known = await ctx.ds.manager.findOneBy(PaymentCustomer, { accountId: inv.growerId });
  let customerId = known?.providerCustomerId;
  if (!customerId) {
    const grower = await ctx.ds.manager.findOneByOrFail(Account, { id: inv.growerId });
    const input = { accountId: grower.id, email: grower.email, name: grower.businessName ?? grower.name };
    const made = await ctx.payments.createCustomer(input, customerKey(input));
    // Two invoices to one grower may race here: the primary key keeps the first record, and both use it.
    customerId = await inTransaction(ctx.ds, async (tx) => {
      await tx.createQueryBuilder().insert().into(PaymentCustomer).values({ accountId: grower.id, providerCustomerId: made.id, createdAt: ctx.now() }).orIgnore().execute();
      return (await tx.findOneByOrFail(PaymentCustomer, { accountId: grower.id })).providerCustomerId;
    });
  }
  await inTransaction(ctx.ds, (tx) => tx.update(Invoice, { id: inv.id, providerCustomerId: IsNull() }, { providerCustomerId: customerId, updatedAt: ctx.now() }));
  return customerId;
}

/**
 * Brings one invoice into the payments API (customer, draft invoice, lines, finalised) and marks it sent.
 * Safe to call any number of times, from any process: each step is idempotent and skipped once recorded.
 * Resolves to the invoice as stored afterwards; failures are recorded on the invoice, not thrown.
 */
export async function syncInvoice(ctx: ServiceContext, invoiceId: string): Promise<Invoice | null> {
  let inv = await ctx.ds.manager.findOneBy(Invoice, { id: invoiceId });
  if (!inv) return null;
  try {
    if (inv.status === 'void') {
      await voidAtProvider(ctx, inv);
      return inv;
    }
    if (inv.status !== 'draft') return inv;
    const customerId = await customerFor(ctx, inv);
    const keyBase = invoiceKeyBase(inv);
    let providerId = inv.providerInvoiceId;
    if (!providerId) {
      const draft = await ctx.payments.createDraftInvoice(
        {
          customerId,
          fieldfoldInvoiceId: inv.id,
          contractId: inv.contractId,
          number: invoiceNumberLabel(inv.numberPrefix, inv.number),
          dueDate: inv.dueDate,
          description: `Grazing invoice ${invoiceNumberLabel(inv.numberPrefix, inv.number)}, issued with Fieldfold`,
        },
        `${keyBase}:draft`,
      );
      await inTransaction(ctx.ds, (tx) =>
        tx.update(Invoice, { id: inv!.id, providerInvoiceId: IsNull() }, { providerInvoiceId: draft.id, providerStatus: draft.status, updatedAt: ctx.now() }),
      );
      providerId = (await ctx.ds.manager.findOneByOrFail(Invoice, { id: inv.id })).providerInvoiceId!;
    }
    let provider = await ctx.payments.retrieve(providerId);
    if (provider.status === 'draft') {
      await ctx.payments.addLines(
        provider,
        inv.lines.map((l, i) => ({ key: String(i), description: l.description, amountCents: l.amountCents })),
        `${keyBase}:line`,
      );
      provider = await ctx.payments.finalize(providerId, `${keyBase}:finalize`);
    }
    // Never send an invoice whose amount in the payments API differs from what Fieldfold computed.
    if (provider.totalCents !== inv.totalCents) {
      throw new Error(`the payments API's total ${provider.totalCents} differs from the invoice's ${inv.totalCents} cents`);
    }
    await inTransaction(ctx.ds, async (tx) => {
      if (provider.status === 'paid') await markPaid(tx, ctx, inv!.id, { paidAt: provider.paidAt ?? ctx.now(), paidWith: null, provider });
      else if (provider.status === 'open') await markSent(tx, ctx, inv!.id, provider);
      else if (provider.status === 'void') await tx.update(Invoice, { id: inv!.id, status: 'draft' }, { status: 'void', voidedAt: ctx.now(), updatedAt: ctx.now() });
    });
    ctx.outbox.kick();
    await refreshInvoicePdf(ctx, inv.id);
    inv = await ctx.ds.manager.findOneByOrFail(Invoice, { id: inv.id });
    // A void that landed while this ran: the API's copy must not stay payable.
    if (inv.status === 'void') await voidAtProvider(ctx, inv);
    return inv;
  } catch (err) {
    await recordFailure(ctx, inv, err);
    return ctx.ds.manager.findOneBy(Invoice, { id: invoiceId });
  }
}

async function voidAtProvider(ctx: ServiceContext, inv: Invoice): Promise<void> {
  if (!inv.providerInvoiceId) return;
  const provider = await ctx.payments.retrieve(inv.providerInvoiceId);
  // A draft in the API can never be paid; only an open one must be voided there too.
  if (provider.status !== 'open') return;
  const voided = await ctx.payments.voidInvoice(inv.providerInvoiceId, `${invoiceKeyBase(inv)}:void`);
  await inTransaction(ctx.ds, (tx) => tx.update(Invoice, { id: inv.id }, { providerStatus: voided.status, updatedAt: ctx.now() }));
}

/** How long a recovery run owns an invoice it took (longer than one pass through the payments API's calls). */
export const RECOVERY_LEASE_MS = 2 * 60_000;

/**
 * Takes the oldest invoice still being issued whose next attempt is due, for this recovery run alone: its next
 * attempt is pushed a lease ahead by a conditional UPDATE, so the recovery timers of several server processes never
 * work on one invoice at once, and a process that died leaves it due again when the lease runs out. The run's own
 * outcome then sets the next attempt (null once sent; the backoff after a failure). On PostgreSQL the row is picked
 * with FOR UPDATE SKIP LOCKED, so two runs take different invoices instead of waiting on one.
 */
async function claimDueInvoice(ctx: ServiceContext, now: number): Promise<Invoice | 'lost' | null> {
  return inTransaction(ctx.ds, async (tx) => {
    const pick = tx
      .createQueryBuilder(Invoice, 'i')
      .where('i.status = :draft AND (i.sync_next_at IS NULL OR i.sync_next_at <= :now)', { draft: 'draft', now })
      .orderBy('i.created_at', 'ASC')
      .addOrderBy('i.id', 'ASC')
      .limit(1);
    if (tx.connection.options.type === 'postgres') pick.setLock('pessimistic_write').setOnLocked('skip_locked');
    const inv = await pick.getOne();
    if (!inv) return null;
    const res = await tx
      .createQueryBuilder()
      .update(Invoice)
      .set({ syncNextAt: now + RECOVERY_LEASE_MS })
      .where('id = :id AND status = :draft AND (sync_next_at IS NULL OR sync_next_at <= :now)', { id: inv.id, draft: 'draft', now })
      .execute();
    return res.affected === 1 ? inv : 'lost';
  });
}

/** Invoices still being issued whose next attempt is due, each claimed then synced; run at boot and on a timer (server/index.ts). */
export async function resumePendingInvoices(ctx: ServiceContext, max = 50): Promise<number> {
  const now = ctx.now();
  let done = 0;
  for (let n = 0; n < max; n++) {
    const inv = await claimDueInvoice(ctx, now);
    if (inv === null) break;
    if (inv === 'lost') continue;
    await syncInvoice(ctx, inv.id);
    done += 1;
  }
  return done;
}

/** Polls for invoices to bring into the payments API (after an outage, or a crash between two steps). */
export class InvoiceRecovery {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;

  constructor(private readonly ctx: ServiceContext) {}

  start(intervalMs = 15_000): void {
    if (this.timer) return;
    this.timer = setInterval(() => this.kick(), intervalMs);
    this.timer.unref();
    this.kick();
  }

  kick(): void {
    if (this.running) return;
    this.running = resumePendingInvoices(this.ctx)
      .catch((err) => this.ctx.log(`[invoices] recovery run failed: ${err instanceof Error ? err.message : String(err)}`))
      .finally(() => {
        this.running = null;
      });
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.running;
  }
}

// ——— the PDF ———

/** The PDF renderer's data for an invoice as it stands (sent or paid), from lib's lines and the stored figures. */
async function pdfData(ctx: ServiceContext, inv: Invoice, version: number): Promise<InvoicePdfData> {
  const [view] = await invoiceViews(ctx.ds.manager, ctx, { id: inv.grazierId }, [inv]);
  const contract = await ctx.ds.manager.findOneByOrFail(Contract, { id: inv.contractId });
  const people = await ctx.ds.manager.findBy(Account, [{ id: inv.growerId }, { id: inv.grazierId }]);
  const party = (id: string) => {
    const p = people.find((x) => x.id === id)!;
    return { name: p.name, businessName: p.businessName, email: p.email, place: p.homePlace ?? null };
  };
  return {
    invoiceId: inv.id,
    number: view.numberLabel,
    version,
    generatedAt: new Date(ctx.now()).toISOString(),
    timeZone: contract.timeZone,
    issuedOn: inv.issueDate,
    dueOn: inv.dueDate,
    from: party(inv.grazierId),
    to: party(inv.growerId),
    contractId: inv.contractId,
    block: { name: view.block.name, placeName: view.block.placeName },
    stay: { startDate: contract.startDate, endDate: contract.endDate },
    lines: invoiceLinesFromCharge({ lines: inv.lines, subtotalCents: inv.subtotalCents, totalCents: inv.totalCents }, inv.basis),
    subtotalCents: inv.subtotalCents,
    totalCents: inv.totalCents,
    status: inv.status === 'paid' ? 'paid' : 'sent',
    paidAt: inv.paidAt === null ? null : new Date(inv.paidAt).toISOString(),
    paymentTerms: `${paymentTermsLabel(inv.paymentTermsDays)} of the issue date (${formatDay(inv.issueDate)}): by ${formatDay(inv.dueDate)}.`,
  };
}

/**
 * Renders and stores the invoice PDF as a new document version when the newest one does not show the invoice's
 * status yet: once when it is sent, once more when it is paid. Called after those transitions commit (rendering
 * is a side effect); a failure is logged and retried on the next call (the download renders on demand too).
 */
export async function ensureInvoicePdf(ctx: ServiceContext, invoiceId: string): Promise<Document | null> {
  const inv = await ctx.ds.manager.findOneBy(Invoice, { id: invoiceId });
  if (!inv || (inv.status !== 'sent' && inv.status !== 'paid')) return null;
  const latest = await latestDocument(ctx, { kind: 'invoice', contractId: inv.contractId, invoiceId: inv.id });
  if (latest && inv.pdfShows === inv.status) return latest;
  const doc = await storeRenderedDocument(ctx, {
    kind: 'invoice',
    contractId: inv.contractId,
    invoiceId: inv.id,
    render: async (version) => ctx.pdf.renderInvoice(await pdfData(ctx, inv, version)),
  });
  await inTransaction(ctx.ds, (tx) => tx.update(Invoice, { id: inv.id, status: inv.status }, { pdfShows: inv.status as 'sent' | 'paid', updatedAt: ctx.now() }));
  return doc;
}

/** ensureInvoicePdf for after-commit use: never fails the request that changed the invoice. */
export async function refreshInvoicePdf(ctx: ServiceContext, invoiceId: string): Promise<void> {
  try {
    await ensureInvoicePdf(ctx, invoiceId);
  } catch (err) {
    ctx.log(`[invoices] PDF for ${invoiceId} not stored yet: ${err instanceof Error ? err.message : String(err)}`);
  }
}
