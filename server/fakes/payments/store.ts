import fs from 'node:fs';
import path from 'node:path';
import type Stripe from 'stripe';

// The fake's whole state is one JSON document under its data folder, rewritten (to a temp file, then renamed) after
// every change, so a restarted fake still knows its customers, invoices, undelivered webhooks and the responses it
// owes to a retried Idempotency-Key. It is small: one demo district's worth of invoices.

export interface Collection<T> {
  /** Ids in creation order (lists show newest first, an invoice's lines oldest first). */
  ids: string[];
  byId: Record<string, T>;
}

/** An invoice as stored: the API object without its computed `lines` list. */
export type InvoiceRecord = Omit<Stripe.Invoice, 'lines' | 'payments'> & { object: 'invoice' };

/** An invoice item as the API shows it, plus the id of the line it becomes on its invoice. */
export interface InvoiceItemRecord {
  item: Omit<Stripe.InvoiceItem, 'quantity_decimal' | 'pricing'> & { quantity_decimal: string; pricing: ItemPricing };
  lineId: string;
}

export interface ItemPricing {
  price_details: null;
  type: 'price_details' | null;
  unit_amount_decimal: string | null;
}

export interface InvoicePaymentRecord {
  id: string;
  object: 'invoice_payment';
  amount_paid: number | null;
  amount_requested: number;
  created: number;
  currency: string;
  invoice: string;
  is_default: boolean;
  livemode: false;
  payment: { type: 'payment_intent'; payment_intent: string };
  status: 'paid' | 'open' | 'canceled';
  status_transitions: { canceled_at: number | null; paid_at: number | null };
}

export type EventJson = Omit<Stripe.EventBase, 'type'> & {
  type: string;
  data: { object: Record<string, unknown>; previous_attributes?: Record<string, unknown> };
};

export interface EndpointRecord {
  endpoint: Omit<Stripe.WebhookEndpoint, 'secret'>;
  secret: string;
}

export interface Delivery {
  id: string;
  eventId: string;
  endpointId: string;
  attempts: number;
  /** Epoch ms of the next attempt. */
  nextAttemptAt: number;
  status: 'pending' | 'succeeded' | 'failed';
  lastStatus: number | null;
  lastError: string | null;
}

export interface IdempotencyRecord {
  /** "POST /v1/invoices" */
  endpoint: string;
  /** Canonical JSON of the parameters it was first used with. */
  fingerprint: string;
  createdAt: number;
  status: number;
  body: unknown;
  requestId: string;
}

export interface FakeState {
  version: 1;
  customers: Collection<Stripe.Customer>;
  invoiceItems: Collection<InvoiceItemRecord>;
  invoices: Collection<InvoiceRecord>;
  invoicePayments: Collection<InvoicePaymentRecord>;
  events: Collection<EventJson>;
  webhookEndpoints: Collection<EndpointRecord>;
  deliveries: Delivery[];
  /** days_until_due of draft invoices created with it (the API object only shows the due date, set on finalising). */
  draftDaysUntilDue: Record<string, number>;
  /** Keyed by Idempotency-Key (one test account, so keys need no account prefix). */
  idempotency: Record<string, IdempotencyRecord>;
}

function emptyState(): FakeState {
  const c = () => ({ ids: [], byId: {} });
  return {
    version: 1,
    customers: c(),
    invoiceItems: c(),
    invoices: c(),
    invoicePayments: c(),
    events: c(),
    webhookEndpoints: c(),
    deliveries: [],
    draftDaysUntilDue: {},
    idempotency: {},
  };
}

export const STATE_FILE = 'payments-fake.json';

/** The API keeps idempotent results for 24 hours. */
export const IDEMPOTENCY_TTL_MS = 24 * 3600_000;
/** Events are listed for 30 days. */
export const EVENT_TTL_MS = 30 * 24 * 3600_000;

export class FakeStore {
  readonly state: FakeState;
  private readonly file: string;

  constructor(dataDir: string) {
    fs.mkdirSync(dataDir, { recursive: true });
    this.file = path.join(dataDir, STATE_FILE);
    this.state = fs.existsSync(this.file) ? { ...emptyState(), ...(JSON.parse(fs.readFileSync(this.file, 'utf8')) as FakeState) } : emptyState();
  }

  save(): void {
    const tmp = `${this.file}.${process.pid}.tmp`;
    fs.writeFileSync(tmp, JSON.stringify(this.state));
    fs.renameSync(tmp, this.file);
  }

  /** Drops idempotent results older than a day and events older than 30 days (and their finished deliveries). */
  prune(nowMs: number): void {
    for (const [key, rec] of Object.entries(this.state.idempotency)) {
      if (rec.createdAt + IDEMPOTENCY_TTL_MS < nowMs) delete this.state.idempotency[key];
    }
    const events = this.state.events;
    const keep = events.ids.filter((id) => events.byId[id].created * 1000 + EVENT_TTL_MS >= nowMs);
    for (const id of events.ids) if (!keep.includes(id)) delete events.byId[id];
    events.ids = keep;
    this.state.deliveries = this.state.deliveries.filter((d) => d.status === 'pending' || events.byId[d.eventId]);
  }
}

export function insert<T>(c: Collection<T>, id: string, value: T): T {
  c.ids.push(id);
  c.byId[id] = value;
  return value;
}
