import crypto from 'node:crypto';
import type { TestPaymentMethodId } from '../../../lib/payments';

// Payments as a port: the invoices service says what it needs (a customer, a draft invoice with its lines, a
// finalised invoice, a payment attempt, a verified event) and an adapter does it. The one adapter is built on the
// official SDK (stripe-payments.ts) and talks to the hosted API or, in development and tests, to the local fake.
// Every call that changes something takes an idempotency key, so repeating a call after a crash or a timeout never
// makes a second customer, invoice, line or charge.

export type ProviderInvoiceStatus = 'draft' | 'open' | 'paid' | 'void' | 'uncollectible';

export interface ProviderInvoice {
  id: string;
  customerId: string;
  number: string | null;
  status: ProviderInvoiceStatus;
  totalCents: number;
  amountDueCents: number;
  amountPaidCents: number;
  /** Epoch ms. */
  paidAt: number | null;
  /** The Fieldfold invoice this belongs to, from the metadata written at creation. */
  fieldfoldInvoiceId: string | null;
}

export interface CustomerInput {
  accountId: string;
  email: string;
  name: string;
}

export interface DraftInvoiceInput {
  customerId: string;
  fieldfoldInvoiceId: string;
  contractId: string;
  /**
   * Fieldfold's invoice number ("WK-0007"), kept in the API copy's metadata and description. Not the API's own
   * `number`: that must be unique across the whole account, and two graziers' sequences can both have a WK-0007.
   */
  number: string;
  /** Day the payment is due, 'YYYY-MM-DD'. */
  dueDate: string;
  description: string;
}

export interface LineInput {
  /** Stable within the invoice (0, 1, 2…): finds a line already added by an interrupted attempt. */
  key: string;
  description: string;
  amountCents: number;
}

export type PaymentOutcome =
  | { kind: 'paid'; invoice: ProviderInvoice }
  /** The API says it was paid already (an earlier attempt whose answer was lost). */
  | { kind: 'already-paid'; invoice: ProviderInvoice }
  | { kind: 'declined'; code: string | null; declineCode: string | null; message: string };

export interface PaymentEvent {
  id: string;
  type: string;
  /** Epoch ms. */
  createdAt: number;
  /** For invoice.* events: the invoice as the event carries it. */
  invoice: ProviderInvoice | null;
}

export interface PaymentsPort {
  readonly mode: 'fake' | 'hosted';
  createCustomer(input: CustomerInput, idempotencyKey: string): Promise<{ id: string }>;
  createDraftInvoice(input: DraftInvoiceInput, idempotencyKey: string): Promise<ProviderInvoice>;
  /** Adds each line not yet on the draft; `keyBase` + line key is each line's idempotency key. */
  addLines(invoice: ProviderInvoice, lines: LineInput[], keyBase: string): Promise<void>;
  /** Finalises a draft; an invoice already past draft is returned as it is. */
  finalize(providerInvoiceId: string, idempotencyKey: string): Promise<ProviderInvoice>;
  pay(providerInvoiceId: string, paymentMethod: TestPaymentMethodId, idempotencyKey: string): Promise<PaymentOutcome>;
  voidInvoice(providerInvoiceId: string, idempotencyKey: string): Promise<ProviderInvoice>;
  retrieve(providerInvoiceId: string): Promise<ProviderInvoice>;
  /** Checks the signature and its timestamp against the raw body; throws WebhookVerificationError. */
  verifyWebhook(rawBody: Buffer, signatureHeader: string | undefined): PaymentEvent;
}

/** The idempotency key of one grower's customer record: a changed name or email is a different request. */
export function customerKey(input: CustomerInput): string {
  const digest = crypto.createHash('sha256').update(`${input.email}\n${input.name}`).digest('hex').slice(0, 12);
  return `fieldfold:customer:${input.accountId}:${digest}`;
}

/** The payments API could not be reached or failed on its side: the work is kept and retried later. */
export class PaymentsUnavailableError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PaymentsUnavailableError';
  }
}

/** A webhook whose signature or timestamp does not check out. */
export class WebhookVerificationError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'WebhookVerificationError';
  }
}

/** A webhook that verified but is not an event in the shape the payments API sends (nothing is applied). */
export class WebhookEventError extends WebhookVerificationError {
  constructor(message: string) {
    super(message);
    this.name = 'WebhookEventError';
  }
}
