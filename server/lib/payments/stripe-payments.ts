import Stripe from 'stripe';
import type { PaymentsConfig } from '../../config/env';
import type { TestPaymentMethodId } from '../../../lib/payments';
import {
  PaymentsUnavailableError,
  WebhookEventError,
  WebhookVerificationError,
  type CustomerInput,
  type DraftInvoiceInput,
  type LineInput,
  type PaymentEvent,
  type PaymentOutcome,
  type PaymentsPort,
  type ProviderInvoice,
} from './payments-port';

// The payments port on the official SDK. In fake mode the SDK is pointed at the local fake over plain HTTP on
// loopback; with a real key and no PAYMENTS_API_URL it talks to the hosted API. Nothing else differs.

const CURRENCY = 'usd';
/** Metadata keys on the API's objects that lead back to Fieldfold's records. */
const META_INVOICE = 'fieldfold_invoice_id';
const META_CONTRACT = 'fieldfold_contract_id';
const META_ACCOUNT = 'fieldfold_account_id';
const META_LINE = 'fieldfold_line';
const META_NUMBER = 'fieldfold_invoice_number';

export function createStripeClient(config: Pick<PaymentsConfig, 'mode' | 'secretKey' | 'apiUrl'>): Stripe {
  const common = { maxNetworkRetries: 2, timeout: 20_000, appInfo: { name: 'Fieldfold' } };
  if (config.mode === 'hosted' || !config.apiUrl) return new Stripe(config.secretKey, common);
  const url = new URL(config.apiUrl);
  return new Stripe(config.secretKey, {
    ...common,
    host: url.hostname,
    port: url.port || (url.protocol === 'https:' ? '443' : '80'),
    protocol: url.protocol === 'https:' ? 'https' : 'http',
    telemetry: false,
  });
}

export class StripePayments implements PaymentsPort {
  readonly mode: 'fake' | 'hosted';
  private readonly stripe: Stripe;

  constructor(private readonly config: PaymentsConfig) {
    this.mode = config.mode;
    this.stripe = createStripeClient(config);
  }

  async createCustomer(input: CustomerInput, idempotencyKey: string): Promise<{ id: string }> {
    const c = await call(() =>
      this.stripe.customers.create({ email: input.email, name: input.name, metadata: { [META_ACCOUNT]: input.accountId } }, { idempotencyKey }),
    );
    return { id: c.id };
  }

  async createDraftInvoice(input: DraftInvoiceInput, idempotencyKey: string): Promise<ProviderInvoice> {
    const inv = await call(() =>
      this.stripe.invoices.create(
        {
          customer: input.customerId,
          currency: CURRENCY,
          // The grower pays from the invoice screen when they choose; nothing is charged automatically.
          collection_method: 'send_invoice',
          due_date: endOfDayUtc(input.dueDate),
          auto_advance: false,
          pending_invoice_items_behavior: 'exclude',
          description: input.description,
          metadata: { [META_INVOICE]: input.fieldfoldInvoiceId, [META_CONTRACT]: input.contractId, [META_NUMBER]: input.number },
        },
        { idempotencyKey },
      ),
    );
    return toProviderInvoice(inv);
  }

  async addLines(invoice: ProviderInvoice, lines: LineInput[], keyBase: string): Promise<void> {
    // An interrupted attempt may have added some lines already (and its keys may have expired): list what is there
    // and add only the rest.
    const present = new Set<string>();
    for await (const line of this.stripe.invoices.listLineItems(invoice.id, { limit: 100 })) {
      const key = line.metadata?.[META_LINE];
      if (key) present.add(key);
    }
    for (const line of lines) {
      if (present.has(line.key)) continue;
      await call(() =>
        this.stripe.invoiceItems.create(
          { customer: invoice.customerId, invoice: invoice.id, currency: CURRENCY, amount: line.amountCents, description: line.description, metadata: { [META_LINE]: line.key } },
          { idempotencyKey: `${keyBase}:${line.key}` },
        ),
      );
    }
  }

  async finalize(providerInvoiceId: string, idempotencyKey: string): Promise<ProviderInvoice> {
    const current = await this.retrieve(providerInvoiceId);
    if (current.status !== 'draft') return current;
    return toProviderInvoice(await call(() => this.stripe.invoices.finalizeInvoice(providerInvoiceId, { auto_advance: false }, { idempotencyKey })));
  }

  async pay(providerInvoiceId: string, paymentMethod: TestPaymentMethodId, idempotencyKey: string): Promise<PaymentOutcome> {
    try {
      const inv = await this.stripe.invoices.pay(providerInvoiceId, { payment_method: paymentMethod }, { idempotencyKey });
      return { kind: 'paid', invoice: toProviderInvoice(inv) };
    } catch (err) {
      if (err instanceof Stripe.errors.StripeCardError) {
        return { kind: 'declined', code: err.code ?? null, declineCode: err.decline_code ?? null, message: err.message };
      }
      if (err instanceof Stripe.errors.StripeInvalidRequestError && /already paid/i.test(err.message)) {
        return { kind: 'already-paid', invoice: await this.retrieve(providerInvoiceId) };
      }
      throw translate(err);
    }
  }

  async voidInvoice(providerInvoiceId: string, idempotencyKey: string): Promise<ProviderInvoice> {
    return toProviderInvoice(await call(() => this.stripe.invoices.voidInvoice(providerInvoiceId, {}, { idempotencyKey })));
  }

  async retrieve(providerInvoiceId: string): Promise<ProviderInvoice> {
    return toProviderInvoice(await call(() => this.stripe.invoices.retrieve(providerInvoiceId)));
  }

  verifyWebhook(rawBody: Buffer, signatureHeader: string | undefined): PaymentEvent {
    if (!signatureHeader) throw new WebhookVerificationError('The Stripe-Signature header is missing');
    let event: Stripe.Event;
    try {
      // The SDK checks the HMAC over these exact bytes and that the signed timestamp is within the tolerance of
      // this machine's clock (a replayed old delivery fails even with a good signature).
      event = this.stripe.webhooks.constructEvent(rawBody, signatureHeader, this.config.webhookSecret, this.config.webhookToleranceSeconds);
    } catch (err) {
      throw new WebhookVerificationError(err instanceof Error ? err.message : String(err));
    }
    // The signature says who sent the bytes, not that they make an event: check the members read below.
    assertEventShape(event);
    const object = event.data.object as { object?: string };
    return {
      id: event.id,
      type: event.type,
      createdAt: event.created * 1000,
      invoice: object.object === 'invoice' ? toProviderInvoice(object as Stripe.Invoice) : null,
    };
  }
}

const isRecord = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);
/** Unix seconds from 1970 to 2999: what a timestamp of the API can be (beyond it a Date cannot be made). */
const isUnixSeconds = (v: unknown): v is number => Number.isSafeInteger(v) && (v as number) >= 0 && (v as number) < 32_503_680_000;
const isCents = (v: unknown) => Number.isSafeInteger(v);
const INVOICE_STATUSES: ReadonlyArray<string | null | undefined> = ['draft', 'open', 'paid', 'void', 'uncollectible', null, undefined];

/** Throws WebhookEventError unless every member verifyWebhook and toProviderInvoice read has the API's type. */
function assertEventShape(event: unknown): asserts event is Stripe.Event {
  const bad = (what: string) => new WebhookEventError(`the event's ${what} is missing or not of the payments API's type`);
  if (!isRecord(event)) throw new WebhookEventError('the event is not a JSON object');
  if (typeof event.id !== 'string' || event.id === '' || event.id.length > 255) throw bad('id');
  if (typeof event.type !== 'string' || event.type === '' || event.type.length > 255) throw bad('type');
  if (!isUnixSeconds(event.created)) throw bad('created');
  if (!isRecord(event.data) || !isRecord(event.data.object)) throw bad('data.object');
  const inv = event.data.object;
  if (inv.object !== 'invoice') return;
  if (typeof inv.id !== 'string' || inv.id === '') throw bad('invoice id');
  if (!(inv.customer == null || typeof inv.customer === 'string' || (isRecord(inv.customer) && typeof inv.customer.id === 'string'))) throw bad('invoice customer');
  if (!(inv.number == null || typeof inv.number === 'string')) throw bad('invoice number');
  if (!INVOICE_STATUSES.includes(inv.status as string | null | undefined)) throw bad('invoice status');
  for (const k of ['total', 'amount_due', 'amount_paid']) if (!isCents(inv[k])) throw bad(`invoice ${k}`);
  const transitions = inv.status_transitions;
  if (!(transitions == null || (isRecord(transitions) && (transitions.paid_at == null || isUnixSeconds(transitions.paid_at))))) throw bad('invoice status_transitions.paid_at');
  const metadata = inv.metadata;
  if (!(metadata == null || (isRecord(metadata) && (metadata[META_INVOICE] == null || typeof metadata[META_INVOICE] === 'string')))) throw bad('invoice metadata');
}

function toProviderInvoice(inv: Stripe.Invoice): ProviderInvoice {
  return {
    id: inv.id,
    customerId: typeof inv.customer === 'string' ? inv.customer : (inv.customer?.id ?? ''),
    number: inv.number,
    status: (inv.status ?? 'draft') as ProviderInvoice['status'],
    totalCents: inv.total,
    amountDueCents: inv.amount_due,
    amountPaidCents: inv.amount_paid,
    paidAt: inv.status_transitions?.paid_at ? inv.status_transitions.paid_at * 1000 : null,
    fieldfoldInvoiceId: inv.metadata?.[META_INVOICE] ?? null,
  };
}

/** The due day's last second in UTC, as the API's unix-seconds due_date. */
function endOfDayUtc(day: string): number {
  return Math.floor(Date.parse(`${day}T23:59:59Z`) / 1000);
}

async function call<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    throw translate(err);
  }
}

/** Down, timing out or failing on its side → PaymentsUnavailableError (retry later); anything else is ours. */
function translate(err: unknown): unknown {
  if (err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError || err instanceof Stripe.errors.StripeRateLimitError) {
    return new PaymentsUnavailableError(`The payments service is not answering (${err.message})`);
  }
  return err;
}
