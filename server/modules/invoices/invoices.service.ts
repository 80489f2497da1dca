import crypto from 'node:crypto';
import type { EntityManager } from 'typeorm';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { decodeCursor, encodeCursor } from '../contracts/cursor';
import { AppError } from '../../lib/errors/app-error';
import { inTransaction } from '../../lib/db/transaction';
import { isUniqueViolation } from '../../lib/db/unique-violation';
import { check } from '../../lib/http/validate';
import { hasRole } from '../../lib/http/auth';
import { PaymentsUnavailableError, type PaymentOutcome } from '../../lib/payments';
import { Account } from '../accounts/account.entity';
import { lockContract } from '../contracts/contract-state';
import { Contract } from '../contracts/contract.entity';
import { Invoice, InvoiceCounter } from './invoice.entity';
import type { ServiceContext } from '../../lib/service-context';
import { assertInvoiceParty, assertIssuer, assertMayInvoice, assertPayer } from './invoices.policy';
import { invoiceListItems, invoiceViews } from './invoice-views';
import { ensureInvoicePdf, markPaid, refreshInvoicePdf, syncInvoice } from './invoice-sync';
import type { Document } from '../documents/documents.service';
import { addDays, todayIn } from '../../../lib/day-keys';
import { displayStatus, invoiceCharge, invoiceNumberLabel, invoicePrefix, invoiceTotals, seasonOf } from '../../../lib/invoices';
import { paymentFailureInWords } from '../../../lib/payments';
import {
  createInvoiceSchema,
  DEFAULT_INVOICE_PAGE,
  DEFAULT_PAYMENT_TERMS_DAYS,
  invoiceListQuerySchema,
  payInvoiceSchema,
  type InvoiceListQuery,
  type InvoiceListView,
  type InvoiceSide,
  type InvoiceStatus,
  type InvoiceView,
  type PayInvoiceInput,
} from '../../../lib/schemas/invoice';

/** How long one payment attempt owns an invoice: longer than the SDK's timeout with its retries. */
export const PAY_LEASE_MS = 90_000;

/** 409 naming the contract's invoice, with its address in Location. */
function alreadyInvoiced(existing: Invoice): AppError {
  const label = invoiceNumberLabel(existing.numberPrefix, existing.number);
  return new AppError(409, 'already_invoiced', `This contract is invoiced already: invoice ${label} (${existing.id}).`, undefined, {
    Location: `/api/invoices/${existing.id}`,
  });
}

async function viewOf(ctx: ServiceContext, viewer: Account, inv: Invoice, em: EntityManager = ctx.ds.manager): Promise<InvoiceView> {
  const [view] = await invoiceViews(em, ctx, viewer, [inv]);
  return view;
}

/**
 * The grazier bills an agreed sign-off, once per contract. In one transaction: the contract is agreed and not yet
 * invoiced, the next number of the grazier's sequence is taken (a conditional UPDATE of their counter, the unique
 * (grazier, number) index behind it), the lines are computed by lib/ and the invoice row is written. After the
 * commit the invoice is created in the payments API and its PDF rendered; neither runs inside the transaction.
 * Two requests racing past the check in different processes meet the unique contract index: the loser answers
 * the same 409 as a request that came late.
 */
export async function createInvoice(ctx: ServiceContext, viewer: Account, contractId: string, body: unknown): Promise<InvoiceView> {
  const input = await check(createInvoiceSchema, body ?? {});
  const terms = input.paymentTermsDays ?? DEFAULT_PAYMENT_TERMS_DAYS;
  const invoiceId = await inTransaction(ctx.ds, (tx) => writeInvoice(tx, ctx, viewer, contractId, terms)).catch(async (err: unknown) => {
    if (!isUniqueViolation(err)) throw err;
    const winner = await ctx.ds.manager.findOneBy(Invoice, { contractId });
    throw winner ? alreadyInvoiced(winner) : AppError.conflict('Invoices are being numbered by another request; try again.', 'numbering_busy');
  });
  // After the commit: the payments API (idempotent, retried later if it is down), then the PDF once it is sent.
  await syncInvoice(ctx, invoiceId);
  return viewOf(ctx, viewer, await ctx.ds.manager.findOneByOrFail(Invoice, { id: invoiceId }));
}

/**
 * createInvoice's transaction: the contract is agreed and not yet invoiced, the next number of the grazier's
 * sequence is taken, the row is written and the contract moves to invoiced. Resolves with the invoice's id.
 */
export async function writeInvoice(tx: EntityManager, ctx: ServiceContext, viewer: Account, contractId: string, paymentTermsDays: number): Promise<string> {
  // Locked first: a second request for the same contract (a double tap, on any process) waits here and then
  // finds the first one's invoice.
  const contract = await lockContract(tx, contractId);
  assertMayInvoice(viewer, contract);
  const existing = await tx.findOneBy(Invoice, { contractId: contract.id });
  if (existing) throw alreadyInvoiced(existing);
  if (contract.status !== 'agreed') {
    throw AppError.conflict('Invoice once both of you have agreed the head-days at sign-off.', 'not_agreed');
  }
  const charge = invoiceCharge({ basis: contract.basis, rate: contract.rate, agreedHeadDays: contract.agreedHeadDays, acres: contract.acres });
  const grazier = await tx.findOneByOrFail(Account, { id: contract.grazierId });
  const number = await nextInvoiceNumber(tx, grazier.id);
  const issueDate = todayIn(contract.timeZone, ctx.now());
  const id = crypto.randomUUID();
  await tx.insert(Invoice, {
    id,
    contractId: contract.id,
    grazierId: contract.grazierId,
    growerId: contract.growerId,
    number,
    numberPrefix: invoicePrefix(grazier.businessName ?? grazier.name),
    status: 'draft',
    issueDate,
    dueDate: addDays(issueDate, paymentTermsDays),
    paymentTermsDays,
    currency: 'usd',
    basis: contract.basis,
    rate: contract.rate,
    quantity: charge.quantity,
    lines: charge.lines,
    services: contract.services,
    subtotalCents: charge.subtotalCents,
    totalCents: charge.totalCents,
    providerCustomerId: null,
    providerInvoiceId: null,
    providerStatus: null,
    providerNumber: null,
    syncAttempts: 0,
    syncError: null,
    syncNextAt: null,
    payingUntil: null,
    payAttempts: 0,
    lastFailureCode: null,
    lastFailureDeclineCode: null,
    lastFailureMessage: null,
    lastFailureAt: null,
    paidAt: null,
    paidDay: null,
    paidWith: null,
    voidedAt: null,
    pdfShows: null,
    createdAt: ctx.now(),
    updatedAt: ctx.now(),
  });
  const moved = await tx
    .createQueryBuilder()
    .update(Contract)
    .set({ status: 'invoiced' })
    .where('id = :id AND status = :agreed', { id: contract.id, agreed: 'agreed' })
    .execute();
  if (moved.affected !== 1) throw AppError.conflict('The contract changed meanwhile; reload it and try again.', 'contract_changed');
  return id;
}

/**
 * The next number in the grazier's own sequence. The counter row moves only from the value read to one more
 * (a conditional UPDATE), so two writers — two processes on PostgreSQL — can never take one number; the loser
 * reads again. The unique (grazier, number) index is the last word. No gaps: the number is taken in the same
 * transaction that inserts the invoice, so a rolled-back invoice gives its number back.
 */
async function nextInvoiceNumber(tx: EntityManager, grazierId: string): Promise<number> {
  await tx.createQueryBuilder().insert().into(InvoiceCounter).values({ grazierId, lastNumber: 0 }).orIgnore().execute();
  for (let attempt = 0; attempt < 5; attempt++) {
    const { lastNumber } = await tx.findOneByOrFail(InvoiceCounter, { grazierId });
    const res = await tx
      .createQueryBuilder()
      .update(InvoiceCounter)
      .set({ lastNumber: lastNumber + 1 })
      .where('grazier_id = :grazierId AND last_number = :lastNumber', { grazierId, lastNumber })
      .execute();
    if (res.affected === 1) return lastNumber + 1;
  }
  throw AppError.conflict('Invoices are being numbered by another request; try again.', 'numbering_busy');
}

/** One side's invoices in list order (due date, number, id), from the start or after a cursor. */
function invoicePage(side: InvoiceSide, after: boolean) {
  return new PreparedSelect(
    (em) => {
      const qb = em
        .createQueryBuilder(Invoice, 'i')
        .where(side === 'receivable' ? 'i.grazier_id = :me' : 'i.grower_id = :me')
        .orderBy('i.due_date', 'ASC')
        .addOrderBy('i.number', 'ASC')
        .addOrderBy('i.id', 'ASC');
      if (after) qb.andWhere('(i.due_date > :due OR (i.due_date = :due AND (i.number > :number OR (i.number = :number AND i.id > :id))))');
      return qb;
    },
    { limit: true },
  );
}

/**
 * Every invoice of one side in a few groups alike in what the totals need: the block's zone (for "today"), the
 * status, and only then what that status's figure depends on — a sent invoice's due date (overdue or not), a
 * paid one's year (the season) or, where no paid day was kept, its paid instant.
 */
const SENT_DUE = "CASE WHEN i.status = 'sent' THEN i.due_date END";
const PAID_YEAR = "CASE WHEN i.status = 'paid' AND i.paid_at IS NOT NULL THEN SUBSTR(i.paid_day, 1, 4) END";
const PAID_AT = "CASE WHEN i.status = 'paid' AND i.paid_day IS NULL THEN i.paid_at END";
function invoiceTotalsOf(side: InvoiceSide) {
  return new PreparedSelect((em) =>
    em
      .createQueryBuilder(Invoice, 'i')
      .innerJoin(Contract, 'c', 'c.id = i.contract_id')
      .select('c.time_zone', 'zone')
      .addSelect('i.status', 'status')
      .addSelect(SENT_DUE, 'due')
      .addSelect(PAID_YEAR, 'paidYear')
      .addSelect(PAID_AT, 'paidAt')
      .addSelect('SUM(i.total_cents)', 'cents')
      .addSelect('COUNT(*)', 'n')
      .where(side === 'receivable' ? 'i.grazier_id = :me' : 'i.grower_id = :me')
      .groupBy('c.time_zone')
      .addGroupBy('i.status')
      .addGroupBy(SENT_DUE)
      .addGroupBy(PAID_YEAR)
      .addGroupBy(PAID_AT),
  );
}

const invoiceLists = {
  first: { receivable: invoicePage('receivable', false), payable: invoicePage('payable', false) },
  after: { receivable: invoicePage('receivable', true), payable: invoicePage('payable', true) },
  totals: { receivable: invoiceTotalsOf('receivable'), payable: invoiceTotalsOf('payable') },
};

interface TotalsRow {
  zone: string;
  status: InvoiceStatus;
  due: string | null;
  paidYear: string | null;
  paidAt: number | string | null;
  cents: number | string;
  n: number | string;
}

/**
 * One side's invoices (receivable for a grazier, payable for a grower, unless `side` says), due first, a page at a
 * time, with the totals and the count over the whole side. The page is cut in SQL by keyset; the totals are one
 * grouped query, so the work per request is bounded by the page and the number of distinct due dates.
 */
export async function listInvoices(ctx: ServiceContext, viewer: Account, query: unknown): Promise<InvoiceListView> {
  const q = (await check(invoiceListQuerySchema, query ?? {})) as InvoiceListQuery;
  const side: InvoiceSide = q.side ?? (hasRole(viewer, 'grazier') ? 'receivable' : 'payable');
  const limit = q.limit ?? DEFAULT_INVOICE_PAGE;
  const em = ctx.ds.manager;
  const take = { me: viewer.id, limit: limit + 1 };
  let rows: Invoice[];
  if (q.cursor) {
    const [due, number, id] = decodeCursor(q.cursor, (p): p is [string, number, string] => p.length === 3 && typeof p[0] === 'string' && Number.isSafeInteger(p[1]) && typeof p[2] === 'string');
    rows = await invoiceLists.after[side].many(em, { ...take, due, number, id });
  } else rows = await invoiceLists.first[side].many(em, take);
  const page = rows.slice(0, limit);
  const last = page.at(-1);
  const [items, groups] = await Promise.all([invoiceListItems(em, ctx, viewer, page), invoiceLists.totals[side].raw<TotalsRow>(em, { me: viewer.id })]);
  const now = ctx.now();
  const todays = new Map<string, string>();
  const todayAt = (zone: string) => todays.get(zone) ?? todays.set(zone, todayIn(zone, now)).get(zone)!;
  const lines = groups.map((g) => {
    // Only the year of the paid day decides the season, so the year stands in for the day.
    const paidDay = g.paidYear !== null ? `${g.paidYear}-01-01` : g.paidAt !== null ? todayIn(g.zone, Number(g.paidAt)) : null;
    return { displayStatus: g.due !== null ? displayStatus(g.status, g.due, todayAt(g.zone)) : g.status, totalCents: Number(g.cents), paidDay, count: Number(g.n) };
  });
  // "This season" on the calendar of the first invoice in list order (the first page's first item).
  const first = q.cursor ? (await invoiceLists.first[side].many(em, { me: viewer.id, limit: 1 }))[0] : undefined;
  const zone = (first ? (await invoiceListItems(em, ctx, viewer, [first]))[0] : items[0])?.block.timeZone ?? 'UTC';
  return {
    side,
    items,
    totals: invoiceTotals(lines, seasonOf(todayIn(zone, now))),
    total: lines.reduce((n, l) => n + l.count, 0),
    nextCursor: rows.length > limit && last ? encodeCursor([last.dueDate, last.number, last.id]) : null,
  };
}

export async function getInvoice(ctx: ServiceContext, viewer: Account, id: string): Promise<InvoiceView> {
  let inv = await ctx.ds.manager.findOneBy(Invoice, { id });
  assertInvoiceParty(viewer, inv);
  // An invoice still being issued is pushed on whenever someone looks at it (and by the recovery timer).
  if (inv.status === 'draft' && (inv.syncNextAt === null || inv.syncNextAt <= ctx.now())) inv = (await syncInvoice(ctx, inv.id)) ?? inv;
  return viewOf(ctx, viewer, inv);
}

/** The newest stored PDF of the invoice (rendered now if the last render did not happen), for either party. */
export async function invoicePdf(ctx: ServiceContext, viewerId: string, id: string): Promise<Document> {
  const viewer = await ctx.ds.manager.findOneBy(Account, { id: viewerId });
  const inv = await ctx.ds.manager.findOneBy(Invoice, { id });
  if (!viewer) throw AppError.notFound('Invoice');
  assertInvoiceParty(viewer, inv);
  const doc = await ensureInvoicePdf(ctx, inv.id);
  if (!doc) throw AppError.conflict('This invoice is still being issued with the payments service; its PDF follows once it is sent.', 'not_issued');
  return doc;
}

/**
 * The grower pays with one of the payments API's test payment methods. The attempt first takes a lease on the
 * invoice (a conditional UPDATE: one attempt at a time, so a double tap cannot charge twice), then calls the API
 * outside any transaction with a key unique to the attempt, then records the outcome. A decline leaves the invoice
 * unpaid with the reason in plain words (402); a timeout frees the lease by time, and the next attempt learns
 * from the API if the first went through ("already paid").
 */
export async function payInvoice(ctx: ServiceContext, viewer: Account, id: string, body: unknown): Promise<InvoiceView> {
  const input = (await check(payInvoiceSchema, body)) as PayInvoiceInput;
  let inv = await ctx.ds.manager.findOneBy(Invoice, { id });
  assertInvoiceParty(viewer, inv);
  assertPayer(viewer, inv);
  if (inv.status === 'paid') throw AppError.conflict(`Invoice ${invoiceNumberLabel(inv.numberPrefix, inv.number)} is paid already.`, 'already_paid');
  if (inv.status === 'void') throw AppError.conflict('This invoice was voided and cannot be paid.', 'invoice_void');
  if (inv.status === 'draft') {
    inv = (await syncInvoice(ctx, inv.id)) ?? inv;
    if (inv.status === 'paid') throw AppError.conflict(`Invoice ${invoiceNumberLabel(inv.numberPrefix, inv.number)} is paid already.`, 'already_paid');
    if (inv.status !== 'sent') {
      throw new AppError(503, 'payments_unavailable', 'The payments service is not reachable yet, so this invoice cannot be paid right now. Nothing was charged; try again in a few minutes.', undefined, {
        'Retry-After': '60',
      });
    }
  }

  const attempt = await inTransaction(ctx.ds, async (tx) => {
    const now = ctx.now();
    const res = await tx
      .createQueryBuilder()
      .update(Invoice)
      .set({ payingUntil: now + PAY_LEASE_MS, payAttempts: () => 'pay_attempts + 1', updatedAt: now })
      .where('id = :id AND status = :sent', { id, sent: 'sent' })
      .andWhere('(paying_until IS NULL OR paying_until <= :now)', { now })
      .execute();
    const fresh = await tx.findOneByOrFail(Invoice, { id });
    if (res.affected === 1) return fresh;
    if (fresh.status === 'paid') throw AppError.conflict(`Invoice ${invoiceNumberLabel(fresh.numberPrefix, fresh.number)} is paid already.`, 'already_paid');
    throw AppError.conflict('A payment for this invoice is already going through. Wait a moment and reload before trying again.', 'payment_in_progress');
  });

  let outcome: PaymentOutcome;
  try {
    outcome = await ctx.payments.pay(attempt.providerInvoiceId!, input.paymentMethod, `fieldfold:pay:${attempt.id}:${attempt.payAttempts}`);
  } catch (err) {
    await inTransaction(ctx.ds, (tx) => tx.update(Invoice, { id, payingUntil: attempt.payingUntil! }, { payingUntil: null, updatedAt: ctx.now() }));
    if (err instanceof PaymentsUnavailableError) {
      throw new AppError(503, 'payments_unavailable', 'The payments service did not answer. If you were charged, the invoice will show paid shortly; otherwise try again.', undefined, {
        'Retry-After': '30',
      });
    }
    throw err;
  }

  if (outcome.kind === 'declined') {
    const message = paymentFailureInWords(outcome.code, outcome.declineCode);
    await inTransaction(ctx.ds, (tx) =>
      tx.update(
        Invoice,
        { id },
        { payingUntil: null, lastFailureCode: outcome.code, lastFailureDeclineCode: outcome.declineCode, lastFailureMessage: message, lastFailureAt: ctx.now(), updatedAt: ctx.now() },
      ),
    );
    throw new AppError(402, 'payment_declined', message);
  }
  await inTransaction(ctx.ds, async (tx) => {
    await markPaid(tx, ctx, id, { paidAt: outcome.invoice.paidAt ?? ctx.now(), paidWith: outcome.kind === 'paid' ? input.paymentMethod : null, provider: outcome.invoice });
  });
  ctx.outbox.kick();
  await refreshInvoicePdf(ctx, id);
  return viewOf(ctx, viewer, await ctx.ds.manager.findOneByOrFail(Invoice, { id }));
}

/** The grazier cancels an unpaid invoice (e.g. issued in error); the API's copy is voided after the commit. */
export async function voidInvoice(ctx: ServiceContext, viewer: Account, id: string): Promise<InvoiceView> {
  const inv = await ctx.ds.manager.findOneBy(Invoice, { id });
  assertInvoiceParty(viewer, inv);
  assertIssuer(viewer, inv);
  await inTransaction(ctx.ds, async (tx) => {
    const now = ctx.now();
    const res = await tx
      .createQueryBuilder()
      .update(Invoice)
      .set({ status: 'void', voidedAt: now, updatedAt: now })
      .where('id = :id AND status IN (:...open)', { id, open: ['draft', 'sent'] })
      .andWhere('(paying_until IS NULL OR paying_until <= :now)', { now })
      .execute();
    if (res.affected === 1) return;
    const fresh = await tx.findOneByOrFail(Invoice, { id });
    if (fresh.status === 'paid') throw AppError.conflict('This invoice is paid and cannot be voided.', 'already_paid');
    if (fresh.status === 'void') throw AppError.conflict('This invoice is void already.', 'invoice_void');
    throw AppError.conflict('A payment for this invoice is going through right now; try again in a moment.', 'payment_in_progress');
  });
  await syncInvoice(ctx, id);
  return viewOf(ctx, viewer, await ctx.ds.manager.findOneByOrFail(Invoice, { id }));
}
