import * as yup from 'yup';
import type { ChargeBasis, ChargeLine } from '../money';
import { TEST_PAYMENT_METHOD_IDS, type TestPaymentMethodId } from '../payments';
import type { BidService } from './bid';
import type { BlockSummary, PartyView } from './block';
import { rejectUnknown } from './fields';
import { pageCursor, pageLimit } from './paging';

// An invoice bills one contract's agreed sign-off, once. The grazier makes it; the server computes its lines with
// lib/invoices.ts (the calculator's chargeLines), numbers it in the grazier's own sequence and creates it in the
// payments API; the grower pays it there with a test payment method.
//
// Statuses, in order (never backwards):
//   draft   written in Fieldfold; not yet created and finalised in the payments API (a moment, or longer when the
//           payments service is down — it is retried)
//   sent    finalised in the payments API and mailed to the grower; payable. Shown as "overdue" after the due date.
//   paid    paid in full (by the pay action or the API's paid event, whichever comes first)
//   void    cancelled before payment

export const INVOICE_STATUSES = ['draft', 'sent', 'paid', 'void'] as const;
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];

/** The stored status, plus "overdue" for a sent invoice past its due date. */
export type InvoiceDisplayStatus = InvoiceStatus | 'overdue';

export const INVOICE_STATUS_LABELS: Record<InvoiceDisplayStatus, string> = {
  draft: 'Being issued',
  sent: 'Sent — awaiting payment',
  overdue: 'Overdue',
  paid: 'Paid',
  void: 'Void',
};

/** Payment terms a grazier may give: due on receipt, or within 7, 14 or 30 days of the issue date. */
export const PAYMENT_TERMS_DAYS = [0, 7, 14, 30] as const;
export type PaymentTermsDays = (typeof PAYMENT_TERMS_DAYS)[number];
export const DEFAULT_PAYMENT_TERMS_DAYS: PaymentTermsDays = 14;

export function paymentTermsLabel(days: number): string {
  return days === 0 ? 'Due on receipt' : `Due within ${days} days`;
}

// ——— requests ———

export const createInvoiceSchema = rejectUnknown(
  yup.object({
    paymentTermsDays: yup
      .number()
      .strict()
      .typeError('Payment terms must be a number of days')
      .oneOf([...PAYMENT_TERMS_DAYS], `Payment terms must be one of ${PAYMENT_TERMS_DAYS.join(', ')} days`)
      .optional(),
  }),
);
export type CreateInvoiceInput = yup.InferType<typeof createInvoiceSchema>;

export const payInvoiceSchema = rejectUnknown(
  yup.object({
    paymentMethod: yup
      .string()
      .strict()
      .typeError('Payment method must be one of the test payment methods')
      .oneOf([...TEST_PAYMENT_METHOD_IDS], `Payment method must be one of the test payment methods: ${TEST_PAYMENT_METHOD_IDS.join(', ')}`)
      .required('Choose a payment method'),
  }),
);
export type PayInvoiceInput = { paymentMethod: TestPaymentMethodId };

export const INVOICE_SIDES = ['receivable', 'payable'] as const;
/** receivable: invoices the viewer issued as grazier; payable: invoices the viewer owes as grower. */
export type InvoiceSide = (typeof INVOICE_SIDES)[number];

/** Largest page of GET /api/invoices, and the page it gives when none is asked for. */
export const MAX_INVOICE_PAGE = 100;
export const DEFAULT_INVOICE_PAGE = 25;

/** A page of one side's invoices, due first (due date, then number); `cursor` is the last page's nextCursor. */
export const invoiceListQuerySchema = rejectUnknown(
  yup.object({
    side: yup.string().strict().oneOf([...INVOICE_SIDES], 'Side must be receivable or payable').optional(),
    limit: pageLimit('Limit', MAX_INVOICE_PAGE),
    cursor: pageCursor,
  }),
);
export type InvoiceListQuery = yup.InferType<typeof invoiceListQuerySchema>;

// ——— views ———

export interface InvoiceLineView extends ChargeLine {
  /** "10,800 head-days × $0.18 per head-day" */
  description: string;
}

export interface PaymentFailureView {
  code: string | null;
  declineCode: string | null;
  /** In plain words (lib/payments.ts paymentFailureInWords). */
  message: string;
  at: string;
}

export interface ReceiptView {
  paidAt: string;
  /** The day it was paid at the block. */
  paidDay: string;
  amountCents: number;
  /** "Test card that pays (Visa ending 4242)", or null when the payment was recorded from the API's event alone. */
  method: string | null;
  /** The payments API's invoice number, for the grower's bank records. */
  reference: string | null;
}

export interface InvoiceView {
  id: string;
  /** The grazier's sequence number: 1, 2, 3… with no gaps. */
  number: number;
  /** "KRS-0007": the grazier's prefix and the number. */
  numberLabel: string;
  contractId: string;
  block: BlockSummary;
  grower: PartyView;
  grazier: PartyView;
  /** Which side the viewer is on. */
  viewerSide: InvoiceSide;
  status: InvoiceStatus;
  displayStatus: InvoiceDisplayStatus;
  issueDate: string;
  dueDate: string;
  paymentTermsDays: number;
  currency: 'usd';
  basis: ChargeBasis;
  rate: string;
  /** Head-days, acres or 1, as billed. */
  quantity: number;
  agreedHeadDays: number | null;
  stay: { startDate: string; endDate: string; headCount: number; species: string; animalClass: string };
  servicesIncluded: BidService[];
  lines: InvoiceLineView[];
  subtotalCents: number;
  totalCents: number;
  payment: {
    /** Created and finalised in the payments API: the grower can pay. */
    ready: boolean;
    /** A payment attempt is running now. */
    inProgress: boolean;
    lastFailure: PaymentFailureView | null;
  };
  receipt: ReceiptView | null;
  /**
   * The invoice PDF: a link that carries its own short-lived access token (a download cannot send a header), and
   * the SHA-256 and version of the newest stored file (a new version is stored when the invoice is paid).
   */
  pdf: { url: string; sha256: string | null; version: number | null };
  createdAt: string;
}

export interface InvoiceTotals {
  outstandingCents: number;
  outstandingCount: number;
  overdueCents: number;
  overdueCount: number;
  paidThisSeasonCents: number;
  paidThisSeasonCount: number;
  /** "2027": the season the paid figure counts (see lib/invoices.ts). */
  season: string;
}

/** An invoice as the list shows it: its view without the PDF link (the invoice's own page has it). */
export type InvoiceListItem = Omit<InvoiceView, 'pdf'> & { pdf: Omit<InvoiceView['pdf'], 'url'> };

export interface InvoiceListView {
  side: InvoiceSide;
  /** One page, due first. */
  items: InvoiceListItem[];
  /** Over the whole side, every page. */
  totals: InvoiceTotals;
  /** Invoices on this side, every page. */
  total: number;
  /** Pass as `cursor` for the next page; null on the last page. */
  nextCursor: string | null;
}
