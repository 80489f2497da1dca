import { Column, Entity, PrimaryColumn } from 'typeorm';
import type { ChargeBasis } from '../../../lib/money';
import type { BidService } from '../../../lib/schemas/bid';
import type { InvoiceLineView, InvoiceStatus } from '../../../lib/schemas/invoice';
import type { ProviderInvoiceStatus } from '../../lib/payments';

// Times are epoch milliseconds in bigint columns (as the mail outbox keeps them), so SQLite and PostgreSQL compare
// them alike; days are 'YYYY-MM-DD' at the block.
const ms = { to: (v: number) => v, from: (v: string | number) => Number(v) };
const msOrNull = { to: (v: number | null) => v, from: (v: string | number | null) => (v == null ? null : Number(v)) };

/** One contract's invoice. Unique per contract, and per (grazier, number). */
@Entity('invoices')
export class Invoice {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  @Column('varchar', { name: 'grazier_id', length: 36 })
  grazierId: string;

  @Column('varchar', { name: 'grower_id', length: 36 })
  growerId: string;

  @Column('integer')
  number: number;

  /** The grazier's initials at issue ("KRS"); kept, so a later rename does not renumber old invoices. */
  @Column('varchar', { name: 'number_prefix', length: 8 })
  numberPrefix: string;

  @Column('varchar', { length: 8 })
  status: InvoiceStatus;

  @Column('varchar', { name: 'issue_date', length: 10 })
  issueDate: string;

  @Column('varchar', { name: 'due_date', length: 10 })
  dueDate: string;

  @Column('integer', { name: 'payment_terms_days' })
  paymentTermsDays: number;

  @Column('varchar', { length: 3 })
  currency: 'usd';

  @Column('varchar', { length: 10 })
  basis: ChargeBasis;

  @Column('varchar', { length: 20 })
  rate: string;

  @Column('real')
  quantity: number;

  @Column('simple-json')
  lines: InvoiceLineView[];

  @Column('simple-json')
  services: BidService[];

  @Column('integer', { name: 'subtotal_cents' })
  subtotalCents: number;

  @Column('integer', { name: 'total_cents' })
  totalCents: number;

  /** The payments API's ids, recorded after each call returns (never inside the transaction that wrote the row). */
  @Column('varchar', { name: 'provider_customer_id', length: 255, nullable: true })
  providerCustomerId: string | null;

  @Column('varchar', { name: 'provider_invoice_id', length: 255, nullable: true })
  providerInvoiceId: string | null;

  @Column('varchar', { name: 'provider_status', length: 16, nullable: true })
  providerStatus: ProviderInvoiceStatus | null;

  @Column('varchar', { name: 'provider_number', length: 64, nullable: true })
  providerNumber: string | null;

  /** How often creating it in the payments API failed, the last reason, and when to try again. */
  @Column('integer', { name: 'sync_attempts' })
  syncAttempts: number;

  @Column('varchar', { name: 'sync_error', length: 500, nullable: true })
  syncError: string | null;

  @Column('bigint', { name: 'sync_next_at', nullable: true, transformer: msOrNull })
  syncNextAt: number | null;

  /** A running payment attempt owns the invoice until then (a lease: a crashed attempt frees it by time). */
  @Column('bigint', { name: 'paying_until', nullable: true, transformer: msOrNull })
  payingUntil: number | null;

  @Column('integer', { name: 'pay_attempts' })
  payAttempts: number;

  @Column('varchar', { name: 'last_failure_code', length: 64, nullable: true })
  lastFailureCode: string | null;

  @Column('varchar', { name: 'last_failure_decline_code', length: 64, nullable: true })
  lastFailureDeclineCode: string | null;

  @Column('varchar', { name: 'last_failure_message', length: 500, nullable: true })
  lastFailureMessage: string | null;

  @Column('bigint', { name: 'last_failure_at', nullable: true, transformer: msOrNull })
  lastFailureAt: number | null;

  @Column('bigint', { name: 'paid_at', nullable: true, transformer: msOrNull })
  paidAt: number | null;

  /** The day it was paid at the block ('YYYY-MM-DD'), for "paid this season". */
  @Column('varchar', { name: 'paid_day', length: 10, nullable: true })
  paidDay: string | null;

  /** The test payment method that paid it; null when the payment is known from the API's event only. */
  @Column('varchar', { name: 'paid_with', length: 64, nullable: true })
  paidWith: string | null;

  @Column('bigint', { name: 'voided_at', nullable: true, transformer: msOrNull })
  voidedAt: number | null;

  /**
   * The status the newest stored PDF (modules/documents, one version per rendering) shows: 'sent', then 'paid'.
   * A PDF is rendered after each of those transitions commits, never inside them.
   */
  @Column('varchar', { name: 'pdf_shows', length: 8, nullable: true })
  pdfShows: 'sent' | 'paid' | null;

  @Column('bigint', { name: 'created_at', transformer: ms })
  createdAt: number;

  @Column('bigint', { name: 'updated_at', transformer: ms })
  updatedAt: number;
}

/** The last number a grazier used; moved on only by a conditional UPDATE in the transaction that inserts the invoice. */
@Entity('invoice_counters')
export class InvoiceCounter {
  @PrimaryColumn('varchar', { name: 'grazier_id', length: 36 })
  grazierId: string;

  @Column('integer', { name: 'last_number' })
  lastNumber: number;
}

/** Each payments API event, stored once by its id: the unique key is what makes "apply once" hold. */
@Entity('payment_events')
export class PaymentEventRecord {
  @PrimaryColumn('varchar', { length: 255 })
  id: string;

  @Column('varchar', { length: 80 })
  type: string;

  @Column('varchar', { name: 'invoice_id', length: 36, nullable: true })
  invoiceId: string | null;

  /** What applying it did: 'applied', 'no-change' (already in that state or later), 'unmatched'. */
  @Column('varchar', { length: 16 })
  outcome: string;

  @Column('bigint', { name: 'received_at', transformer: ms })
  receivedAt: number;
}

/** A grower's customer record in the payments API, made once and reused for every invoice to them. */
@Entity('payment_customers')
export class PaymentCustomer {
  @PrimaryColumn('varchar', { name: 'account_id', length: 36 })
  accountId: string;

  @Column('varchar', { name: 'provider_customer_id', length: 255 })
  providerCustomerId: string;

  @Column('bigint', { name: 'created_at', transformer: ms })
  createdAt: number;
}
