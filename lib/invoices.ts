import { chargeLines, type ChargeBasis, type ChargeResult, type FeeInput } from './money';
import { formatNumber } from './format';
import { formatRate } from './terms';
import type { InvoiceDisplayStatus, InvoiceLineView, InvoiceStatus, InvoiceTotals } from './schemas/invoice';
import { GrazingInputError } from './grazing/errors';

// The arithmetic and wording of an invoice, shared by the server (which stores what this computes), the screens
// and the PDF. The money is lib/money.ts chargeLines — the same function the calculator and the bid comparison
// use — so an invoice's total is, to the cent, what the calculator shows for the same basis, quantity and rate.

export interface InvoiceBasisInput {
  basis: ChargeBasis;
  /** Dollars per unit as the contract states it ("0.18"). */
  rate: string;
  /** Head-days both parties agreed at sign-off (the head-day basis bills these). */
  agreedHeadDays: number | null;
  /** The block's acres as contracted (the acre basis bills these). */
  acres: number;
  /** Priced extras the contract carries (hauling or mobilisation), if any. */
  fees?: FeeInput[];
}

export interface InvoiceCharge extends ChargeResult {
  quantity: number;
  lines: InvoiceLineView[];
}

/** The quantity a basis bills: agreed head-days, contracted acres, or 1 for a flat price. */
export function billedQuantity(input: InvoiceBasisInput): number {
  if (input.basis === 'head-day') {
    if (input.agreedHeadDays === null || !Number.isFinite(input.agreedHeadDays)) {
      throw new GrazingInputError('agreedHeadDays', 'The head-days must be agreed at sign-off before invoicing');
    }
    return input.agreedHeadDays;
  }
  return input.basis === 'acre' ? input.acres : 1;
}

export function invoiceCharge(input: InvoiceBasisInput): InvoiceCharge {
  const quantity = billedQuantity(input);
  const result = chargeLines({ basis: input.basis, quantity: input.basis === 'flat' ? undefined : quantity, rate: input.rate, feesCents: input.fees });
  return { ...result, quantity, lines: result.lines.map((line) => ({ ...line, description: lineDescription(line, input.basis) })) };
}

function lineDescription(line: { kind: 'grazing' | 'fee'; label: string; quantity: number; rate: string }, basis: ChargeBasis): string {
  if (line.kind === 'fee') return line.label;
  if (basis === 'head-day') return `Grazing: ${formatNumber(line.quantity, 4)} head-days × ${formatRate(basis, line.rate)}`;
  if (basis === 'acre') return `Grazing: ${formatNumber(line.quantity, 4)} acres × ${formatRate(basis, line.rate)}`;
  return `Grazing: ${formatRate(basis, line.rate)}`;
}

/** "Kellner Range Sheep" → "KRS": up to three initials of the grazier's business (or own) name; "FF" without letters. */
export function invoicePrefix(name: string): string {
  const initials = name
    .normalize('NFKD')
    .replace(/[^A-Za-z\s-]/g, '')
    .split(/[\s-]+/)
    .filter(Boolean)
    .slice(0, 3)
    .map((w) => w[0].toUpperCase())
    .join('');
  return initials || 'FF';
}

/** "KRS-0007". */
export function invoiceNumberLabel(prefix: string, number: number): string {
  return `${prefix}-${String(number).padStart(4, '0')}`;
}

/** A sent invoice is overdue from the day after its due date (the due day itself is still on time). */
export function displayStatus(status: InvoiceStatus, dueDate: string, today: string): InvoiceDisplayStatus {
  return status === 'sent' && today > dueDate ? 'overdue' : status;
}

/**
 * The season a day belongs to, for "paid this season". Fieldfold counts a season as the calendar year, as farm
 * books and tax years do in the US (common practice; a winter orchard stay that runs Dec–Feb falls in two).
 */
export function seasonOf(day: string): string {
  return day.slice(0, 4);
}

export interface TotalsItem {
  displayStatus: InvoiceDisplayStatus;
  totalCents: number;
  /** The day it was paid, 'YYYY-MM-DD', or null. */
  paidDay: string | null;
  /** How many invoices this line stands for (alike in the three fields above; totalCents is their sum); default 1. */
  count?: number;
}

/**
 * Receivables or payables in three figures: still owed (being issued, sent or overdue), of that overdue, and paid
 * in `season` (seasonOf today). Void invoices count nowhere.
 */
export function invoiceTotals(items: readonly TotalsItem[], season: string): InvoiceTotals {
  const t: InvoiceTotals = { outstandingCents: 0, outstandingCount: 0, overdueCents: 0, overdueCount: 0, paidThisSeasonCents: 0, paidThisSeasonCount: 0, season };
  for (const i of items) {
    const n = i.count ?? 1;
    if (i.displayStatus === 'draft' || i.displayStatus === 'sent' || i.displayStatus === 'overdue') {
      t.outstandingCents += i.totalCents;
      t.outstandingCount += n;
      if (i.displayStatus === 'overdue') {
        t.overdueCents += i.totalCents;
        t.overdueCount += n;
      }
    } else if (i.displayStatus === 'paid' && i.paidDay !== null && seasonOf(i.paidDay) === season) {
      t.paidThisSeasonCents += i.totalCents;
      t.paidThisSeasonCount += n;
    }
  }
  return t;
}
