import type Stripe from 'stripe';
import { errors, FakeApiError } from './errors';
import { invoicePrefix, newId } from './ids';
import { Params } from './params';
import { insert, type Collection, type EventJson, type FakeStore, type InvoiceItemRecord, type InvoiceRecord } from './store';
import { paymentMethodObject, TEST_CARDS } from './test-cards';
import { newSigningSecret, type Deliverer } from './webhooks';

// The endpoints Fieldfold calls, with the payments API's object shapes (typed against the official SDK's own
// declarations where the object is simple enough to build whole). Each handler runs synchronously against the
// in-memory state: one request is one atomic change, saved and announced (events) before the response is sent.

export interface RequestInfo {
  requestId: string;
  idempotencyKey: string | null;
  apiVersion: string;
  now: number;
}

export interface Handled {
  status?: number;
  body: unknown;
}

export type Handler = (p: Params, path: Record<string, string>, info: RequestInfo) => Handled;

const CURRENCY = /^[a-z]{3}$/;
const LIST_DEFAULT = 10;

export class FakeApi {
  constructor(
    private readonly store: FakeStore,
    private readonly deliverer: Deliverer,
  ) {}

  private get s() {
    return this.store.state;
  }

  // ---- events ------------------------------------------------------------------------------------------------

  private emit(type: string, object: Record<string, unknown>, info: RequestInfo, previous?: Record<string, unknown>): void {
    const event: EventJson = {
      id: newId('evt'),
      object: 'event',
      api_version: info.apiVersion,
      created: info.now,
      data: { object: structuredClone(object), ...(previous ? { previous_attributes: previous } : {}) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: info.requestId, idempotency_key: info.idempotencyKey },
      type,
    };
    insert(this.s.events, event.id, event);
    this.deliverer.enqueue(event);
  }

  // ---- customers ---------------------------------------------------------------------------------------------

  createCustomer: Handler = (p, _path, info) => {
    const email = p.string('email') ?? null;
    const name = p.string('name') ?? null;
    const description = p.string('description') ?? null;
    const phone = p.string('phone') ?? null;
    const metadata = p.metadata() ?? {};
    p.expand();
    p.done();
    const customer: Stripe.Customer = {
      id: newId('cus', 14),
      object: 'customer',
      address: null,
      balance: 0,
      created: info.now,
      currency: null,
      default_source: null,
      delinquent: false,
      description,
      discount: null,
      email,
      invoice_prefix: invoicePrefix(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata,
      name,
      next_invoice_sequence: 1,
      phone,
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
    insert(this.s.customers, customer.id, customer);
    this.emit('customer.created', customer as unknown as Record<string, unknown>, info);
    return { body: customer };
  };

  retrieveCustomer: Handler = (p, path) => {
    p.expand();
    p.done();
    return { body: this.customer(path.id) };
  };

  listCustomers: Handler = (p) => {
    const email = p.string('email');
    const page = pageParams(p);
    p.done();
    const all = newestFirst(this.s.customers).filter((c) => email === undefined || c.email === email);
    return { body: paginate(all, page, '/v1/customers', 'customer') };
  };

  private customer(id: string, param = 'id'): Stripe.Customer {
    const c = this.s.customers.byId[id];
    if (!c) throw errors.noSuch('customer', id, param);
    return c;
  }

  // ---- invoice items -----------------------------------------------------------------------------------------

  createInvoiceItem: Handler = (p, _path, info) => {
    const customerId = p.requiredString('customer');
    const amount = p.int('amount');
    const currency = (p.string('currency') ?? 'usd').toLowerCase();
    const description = p.string('description') ?? null;
    const invoiceId = p.string('invoice');
    const metadata = p.metadata() ?? {};
    const discountable = p.bool('discountable') ?? true;
    p.expand();
    p.done();
    if (amount === undefined) throw errors.missingParam('amount');
    if (!CURRENCY.test(currency)) throw errors.invalidParam('currency', `Invalid currency: ${currency}`);
    this.customer(customerId, 'customer');
    let invoice: InvoiceRecord | null = null;
    if (invoiceId !== undefined) {
      invoice = this.invoiceRecord(invoiceId, 'invoice');
      if (invoice.status !== 'draft') {
        throw errors.state(`Invoice ${invoice.id} is no longer editable: invoice items can only be added to draft invoices.`, 'invoice_not_editable', 'invoice');
      }
      if (invoice.customer !== customerId) throw errors.invalidParam('invoice', `Invoice ${invoice.id} belongs to another customer.`);
      if (invoice.currency !== currency) throw errors.invalidParam('currency', `The currency ${currency} does not match the invoice's currency ${invoice.currency}.`);
    }
    const rec: InvoiceItemRecord = {
      lineId: newId('il'),
      item: {
        id: newId('ii'),
        object: 'invoiceitem',
        amount,
        currency,
        customer: customerId,
        customer_account: null,
        date: info.now,
        description,
        discountable,
        discounts: [],
        invoice: invoice?.id ?? null,
        livemode: false,
        metadata,
        net_amount: amount,
        parent: null,
        period: { end: info.now, start: info.now },
        pricing: { price_details: null, type: null, unit_amount_decimal: String(amount) },
        proration: false,
        quantity: 1,
        quantity_decimal: '1',
        tax_rates: [],
        test_clock: null,
      },
    };
    insert(this.s.invoiceItems, rec.item.id, rec);
    if (invoice) this.recomputeTotals(invoice);
    this.emit('invoiceitem.created', rec.item as unknown as Record<string, unknown>, info);
    return { body: rec.item };
  };

  retrieveInvoiceItem: Handler = (p, path) => {
    p.expand();
    p.done();
    const rec = this.s.invoiceItems.byId[path.id];
    if (!rec) throw errors.noSuch('invoiceitem', path.id);
    return { body: rec.item };
  };

  listInvoiceItems: Handler = (p) => {
    const customer = p.string('customer');
    const invoice = p.string('invoice');
    const pending = p.bool('pending');
    const page = pageParams(p);
    p.done();
    const all = newestFirst(this.s.invoiceItems)
      .map((r) => r.item)
      .filter((i) => (customer === undefined || i.customer === customer) && (invoice === undefined || i.invoice === invoice))
      .filter((i) => pending === undefined || (i.invoice === null) === pending);
    return { body: paginate(all, page, '/v1/invoiceitems', 'invoiceitem') };
  };

  // ---- invoices ----------------------------------------------------------------------------------------------

  createInvoice: Handler = (p, _path, info) => {
    const customerId = p.requiredString('customer');
    const collection = p.oneOf('collection_method', ['charge_automatically', 'send_invoice'] as const) ?? 'charge_automatically';
    const daysUntilDue = p.int('days_until_due', { min: 0 });
    const dueDate = p.int('due_date', { min: 0 });
    const currency = (p.string('currency') ?? 'usd').toLowerCase();
    const autoAdvance = p.bool('auto_advance') ?? false;
    const description = p.string('description') ?? null;
    const footer = p.string('footer') ?? null;
    const number = p.string('number') ?? null;
    const metadata = p.metadata() ?? {};
    const pendingBehavior = p.oneOf('pending_invoice_items_behavior', ['exclude', 'include'] as const) ?? 'exclude';
    const expand = p.expand();
    p.done();
    const customer = this.customer(customerId, 'customer');
    if (!CURRENCY.test(currency)) throw errors.invalidParam('currency', `Invalid currency: ${currency}`);
    if (collection === 'send_invoice' && daysUntilDue === undefined && dueDate === undefined) {
      throw errors.invalidParam('days_until_due', 'Invoices with collection_method=send_invoice need either days_until_due or due_date.');
    }
    if (collection === 'charge_automatically' && (daysUntilDue !== undefined || dueDate !== undefined)) {
      throw errors.invalidParam('due_date', 'Invoices with collection_method=charge_automatically cannot have a due_date or days_until_due.');
    }
    if (daysUntilDue !== undefined && dueDate !== undefined) {
      throw errors.invalidParam('due_date', 'You may only specify one of these parameters: days_until_due, due_date.');
    }
    if (number !== null && this.s.invoices.ids.some((id) => this.s.invoices.byId[id].number === number)) {
      throw errors.invalidParam('number', `Invoice number ${number} is already in use: invoice numbers must be unique.`);
    }
    const invoice: InvoiceRecord = {
      id: newId('in'),
      object: 'invoice',
      account_country: 'US',
      account_name: 'Fieldfold local payments fake',
      account_tax_ids: null,
      amount_due: 0,
      amount_overpaid: 0,
      amount_paid: 0,
      amount_remaining: 0,
      amount_shipping: 0,
      application: null,
      attempt_count: 0,
      attempted: false,
      auto_advance: autoAdvance,
      automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
      automatically_finalizes_at: null,
      billing_reason: 'manual',
      collection_method: collection,
      created: info.now,
      currency,
      custom_fields: null,
      customer: customer.id,
      customer_account: null,
      customer_address: null,
      customer_email: customer.email,
      customer_name: customer.name ?? null,
      customer_phone: customer.phone ?? null,
      customer_shipping: null,
      customer_tax_exempt: 'none',
      customer_tax_ids: [],
      default_payment_method: null,
      default_source: null,
      default_tax_rates: [],
      description,
      discounts: [],
      due_date: dueDate ?? null,
      effective_at: null,
      ending_balance: null,
      footer,
      from_invoice: null,
      hosted_invoice_url: null,
      invoice_pdf: null,
      issuer: { type: 'self' },
      last_finalization_error: null,
      latest_revision: null,
      livemode: false,
      metadata,
      next_payment_attempt: null,
      number,
      on_behalf_of: null,
      parent: null,
      payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
      period_end: info.now,
      period_start: info.now,
      post_payment_credit_notes_amount: 0,
      pre_payment_credit_notes_amount: 0,
      receipt_number: null,
      rendering: null,
      shipping_cost: null,
      shipping_details: null,
      starting_balance: 0,
      statement_descriptor: null,
      status: 'draft',
      status_transitions: { finalized_at: null, marked_uncollectible_at: null, paid_at: null, voided_at: null },
      subtotal: 0,
      subtotal_excluding_tax: 0,
      test_clock: null,
      total: 0,
      total_discount_amounts: [],
      total_excluding_tax: 0,
      total_pretax_credit_amounts: [],
      total_taxes: [],
      webhooks_delivered_at: null,
    };
    this.s.invoices.ids.push(invoice.id);
    this.s.invoices.byId[invoice.id] = invoice;
    // The API object has no days_until_due: the due date is set from it at finalisation.
    if (daysUntilDue !== undefined) this.s.draftDaysUntilDue[invoice.id] = daysUntilDue;
    if (pendingBehavior === 'include') {
      for (const id of this.s.invoiceItems.ids) {
        const it = this.s.invoiceItems.byId[id].item;
        if (it.customer === customer.id && it.invoice === null && it.currency === currency) it.invoice = invoice.id;
      }
    }
    this.recomputeTotals(invoice);
    const view = this.invoiceView(invoice, expand);
    this.emit('invoice.created', this.invoiceView(invoice, []), info);
    return { body: view };
  };

  retrieveInvoice: Handler = (p, path) => {
    const expand = p.expand();
    p.done();
    return { body: this.invoiceView(this.invoiceRecord(path.id), expand) };
  };

  listInvoices: Handler = (p) => {
    const customer = p.string('customer');
    const status = p.oneOf('status', ['draft', 'open', 'paid', 'uncollectible', 'void'] as const);
    const collection = p.oneOf('collection_method', ['charge_automatically', 'send_invoice'] as const);
    const page = pageParams(p);
    const expand = p.expand();
    p.done();
    const all = newestFirst(this.s.invoices).filter(
      (i) => (customer === undefined || i.customer === customer) && (status === undefined || i.status === status) && (collection === undefined || i.collection_method === collection),
    );
    const list = paginate(all, page, '/v1/invoices', 'invoice');
    const inner = expand.filter((e) => e.startsWith('data.')).map((e) => e.slice(5));
    return { body: { ...list, data: list.data.map((i) => this.invoiceView(i, inner)) } };
  };

  listInvoiceLines: Handler = (p, path) => {
    const page = pageParams(p);
    p.expand();
    p.done();
    const invoice = this.invoiceRecord(path.id);
    return { body: paginate(this.lines(invoice), page, `/v1/invoices/${invoice.id}/lines`, 'line_item') };
  };

  finalizeInvoice: Handler = (p, path, info) => {
    const autoAdvance = p.bool('auto_advance');
    const expand = p.expand();
    p.done();
    const invoice = this.invoiceRecord(path.id);
    if (invoice.status !== 'draft') {
      throw errors.state("This invoice is already finalized, you can't re-finalize a non-draft invoice.", 'invoice_not_editable');
    }
    const customer = this.customer(invoice.customer as string);
    this.recomputeTotals(invoice);
    if (invoice.number === null) {
      const seq = customer.next_invoice_sequence ?? 1;
      invoice.number = `${customer.invoice_prefix}-${String(seq).padStart(4, '0')}`;
      customer.next_invoice_sequence = seq + 1;
    }
    const days = this.s.draftDaysUntilDue[invoice.id];
    if (days !== undefined) invoice.due_date = info.now + days * 86_400;
    delete this.s.draftDaysUntilDue[invoice.id];
    if (autoAdvance !== undefined) invoice.auto_advance = autoAdvance;
    invoice.status = 'open';
    invoice.status_transitions.finalized_at = info.now;
    invoice.effective_at = info.now;
    invoice.ending_balance = 0;
    this.emit('invoice.finalized', this.invoiceView(invoice, []), info, { status: 'draft' });
    // An invoice for nothing is settled on finalisation: there is nothing to collect.
    if (invoice.amount_due === 0) this.markPaid(invoice, info, null);
    return { body: this.invoiceView(invoice, expand) };
  };

  payInvoice: Handler = (p, path, info) => {
    const paymentMethod = p.string('payment_method');
    const outOfBand = p.bool('paid_out_of_band') ?? false;
    const expand = p.expand();
    p.done();
    const invoice = this.invoiceRecord(path.id);
    if (invoice.status === 'paid') throw errors.state('Invoice is already paid');
    if (invoice.status === 'void') throw errors.state('This invoice has been voided and can no longer be paid.');
    if (invoice.status === 'draft') throw errors.state('This invoice is a draft: finalize it before paying it (the local fake does not finalize on pay).');
    if (outOfBand) {
      if (paymentMethod !== undefined) throw errors.invalidParam('paid_out_of_band', 'You may only specify one of these parameters: paid_out_of_band, payment_method.');
      this.markPaid(invoice, info, null);
      return { body: this.invoiceView(invoice, expand) };
    }
    const customer = this.customer(invoice.customer as string);
    const pmId = paymentMethod ?? (invoice.default_payment_method as string | null) ?? (customer.invoice_settings.default_payment_method as string | null);
    if (!pmId) {
      throw errors.state('This customer has no attached payment source or default payment method. Pass payment_method, or set a default payment method.', 'missing', 'payment_method');
    }
    const card = TEST_CARDS[pmId];
    if (!card) throw errors.noSuch('PaymentMethod', pmId, 'payment_method');
    invoice.attempt_count += 1;
    invoice.attempted = true;
    const intentId = newId('pi');
    if (card.outcome.kind === 'declined') {
      const chargeId = newId('ch');
      this.emit('invoice.payment_failed', this.invoiceView(invoice, []), info, { attempt_count: invoice.attempt_count - 1 });
      throw new FakeApiError(402, {
        type: 'card_error',
        code: card.outcome.code,
        decline_code: card.outcome.declineCode,
        message: card.outcome.message,
        charge: chargeId,
        doc_url: 'https://stripe.com/docs/error-codes/card-declined',
        payment_method: paymentMethodObject(card, info.now),
      });
    }
    this.markPaid(invoice, info, intentId);
    return { body: this.invoiceView(invoice, expand) };
  };

  voidInvoice: Handler = (p, path, info) => {
    const expand = p.expand();
    p.done();
    const invoice = this.invoiceRecord(path.id);
    if (invoice.status === 'draft') throw errors.state('You can only void an invoice that has been finalized; delete a draft instead.');
    if (invoice.status === 'paid') throw errors.state('You cannot void a paid invoice.');
    if (invoice.status === 'void') throw errors.state('This invoice has already been voided.');
    const before = invoice.status;
    invoice.status = 'void';
    invoice.amount_remaining = 0;
    invoice.status_transitions.voided_at = info.now;
    this.emit('invoice.voided', this.invoiceView(invoice, []), info, { status: before });
    return { body: this.invoiceView(invoice, expand) };
  };

  private markPaid(invoice: InvoiceRecord, info: RequestInfo, intentId: string | null): void {
    const before = { status: invoice.status, amount_paid: invoice.amount_paid, amount_remaining: invoice.amount_remaining };
    invoice.status = 'paid';
    invoice.amount_paid = invoice.amount_due;
    invoice.amount_remaining = 0;
    invoice.status_transitions.paid_at = info.now;
    if (intentId) {
      const pay = {
        id: newId('inpay'),
        object: 'invoice_payment' as const,
        amount_paid: invoice.amount_due,
        amount_requested: invoice.amount_due,
        created: info.now,
        currency: invoice.currency,
        invoice: invoice.id,
        is_default: true,
        livemode: false as const,
        payment: { type: 'payment_intent' as const, payment_intent: intentId },
        status: 'paid' as const,
        status_transitions: { canceled_at: null, paid_at: info.now },
      };
      insert(this.s.invoicePayments, pay.id, pay);
    }
    // The API's order for a successful collection: paid, then payment_succeeded.
    this.emit('invoice.paid', this.invoiceView(invoice, []), info, before);
    if (intentId) this.emit('invoice.payment_succeeded', this.invoiceView(invoice, []), info, before);
  }

  private invoiceRecord(id: string, param = 'id'): InvoiceRecord {
    const inv = this.s.invoices.byId[id];
    if (!inv) throw errors.noSuch('invoice', id, param);
    return inv;
  }

  private itemsOf(invoice: InvoiceRecord) {
    return this.s.invoiceItems.ids.map((id) => this.s.invoiceItems.byId[id]).filter((r) => r.item.invoice === invoice.id);
  }

  private recomputeTotals(invoice: InvoiceRecord): void {
    if (invoice.status !== 'draft') return;
    const subtotal = this.itemsOf(invoice).reduce((sum, r) => sum + r.item.amount, 0);
    invoice.subtotal = subtotal;
    invoice.subtotal_excluding_tax = subtotal;
    invoice.total = subtotal;
    invoice.total_excluding_tax = subtotal;
    invoice.amount_due = Math.max(0, subtotal);
    invoice.amount_remaining = invoice.amount_due - invoice.amount_paid;
  }

  private lines(invoice: InvoiceRecord) {
    return this.itemsOf(invoice).map(({ item, lineId }) => ({
      id: lineId,
      object: 'line_item' as const,
      amount: item.amount,
      currency: item.currency,
      description: item.description,
      discount_amounts: [],
      discountable: item.discountable,
      discounts: [],
      invoice: invoice.id,
      livemode: false,
      metadata: item.metadata ?? {},
      parent: {
        invoice_item_details: { invoice_item: item.id, proration: false, proration_details: { credited_items: null }, subscription: null },
        subscription_item_details: null,
        type: 'invoice_item_details',
      },
      period: item.period,
      pretax_credit_amounts: [],
      pricing: { price_details: null, type: 'price_details', unit_amount_decimal: String(item.amount) },
      quantity: item.quantity,
      quantity_decimal: item.quantity_decimal,
      subscription: null,
      subtotal: item.amount,
      taxes: [],
    }));
  }

  private invoiceView(invoice: InvoiceRecord, expand: string[]): Record<string, unknown> {
    for (const e of expand) {
      if (e !== 'customer' && e !== 'payments') throw errors.invalidParam('expand', `This property cannot be expanded (${e}). The local fake expands customer and payments.`);
    }
    const lines = this.lines(invoice);
    const view: Record<string, unknown> = {
      ...structuredClone(invoice),
      lines: { object: 'list', data: lines.slice(0, LIST_DEFAULT), has_more: lines.length > LIST_DEFAULT, total_count: lines.length, url: `/v1/invoices/${invoice.id}/lines` },
    };
    if (expand.includes('customer')) view.customer = this.customer(invoice.customer as string);
    if (expand.includes('payments')) {
      const payments = newestFirst(this.s.invoicePayments).filter((pay) => pay.invoice === invoice.id);
      view.payments = { object: 'list', data: payments, has_more: false, url: `/v1/invoice_payments?invoice=${invoice.id}` };
    }
    // Key order as the API prints it: id and object first.
    return { id: view.id, object: view.object, ...view };
  }

  // ---- payment methods (the test ids only) -----------------------------------------------------------------

  retrievePaymentMethod: Handler = (p, path, info) => {
    p.expand();
    p.done();
    const card = TEST_CARDS[path.id];
    if (!card) throw errors.noSuch('PaymentMethod', path.id);
    return { body: paymentMethodObject(card, info.now) };
  };

  // ---- events ------------------------------------------------------------------------------------------------

  retrieveEvent: Handler = (p, path) => {
    p.expand();
    p.done();
    const e = this.s.events.byId[path.id];
    if (!e) throw errors.noSuch('event', path.id);
    return { body: e };
  };

  listEvents: Handler = (p) => {
    const type = p.string('type');
    const types = p.stringList('types');
    const page = pageParams(p);
    p.done();
    const matches = (t: string, pattern: string) => pattern === t || (pattern.endsWith('.*') && t.startsWith(pattern.slice(0, -1)));
    const all = newestFirst(this.s.events).filter((e) => (type === undefined || matches(e.type, type)) && (types === undefined || types.some((t) => matches(e.type, t))));
    return { body: paginate(all, page, '/v1/events', 'event') };
  };

  // ---- webhook endpoints -------------------------------------------------------------------------------------

  createWebhookEndpoint: Handler = (p, _path, info) => {
    const url = p.requiredString('url');
    const enabled = p.stringList('enabled_events');
    const description = p.string('description') ?? null;
    const apiVersion = p.string('api_version') ?? null;
    const metadata = p.metadata() ?? {};
    p.expand();
    p.done();
    if (!enabled || enabled.length === 0) throw errors.missingParam('enabled_events');
    if (!/^https?:\/\//.test(url)) throw errors.invalidParam('url', `Invalid URL: ${url}`);
    const rec = this.addEndpoint({ url, enabled, description, apiVersion, metadata, secret: newSigningSecret(), created: info.now });
    // The signing secret is shown once, in the create response.
    return { body: { ...rec.endpoint, secret: rec.secret } };
  };

  addEndpoint(o: { url: string; enabled: string[]; description: string | null; apiVersion: string | null; metadata: Record<string, string>; secret: string; created: number; id?: string }) {
    const endpoint = {
      id: o.id ?? newId('we'),
      object: 'webhook_endpoint' as const,
      api_version: o.apiVersion,
      application: null,
      created: o.created,
      description: o.description,
      enabled_events: o.enabled,
      livemode: false,
      metadata: o.metadata,
      status: 'enabled',
      url: o.url,
    };
    return insert(this.s.webhookEndpoints, endpoint.id, { endpoint, secret: o.secret });
  }

  retrieveWebhookEndpoint: Handler = (p, path) => {
    p.expand();
    p.done();
    const rec = this.s.webhookEndpoints.byId[path.id];
    if (!rec) throw errors.noSuch('webhook endpoint', path.id);
    return { body: rec.endpoint };
  };

  listWebhookEndpoints: Handler = (p) => {
    const page = pageParams(p);
    p.expand();
    p.done();
    const all = newestFirst(this.s.webhookEndpoints).map((r) => r.endpoint);
    return { body: paginate(all, page, '/v1/webhook_endpoints', 'webhook endpoint') };
  };

  deleteWebhookEndpoint: Handler = (p, path) => {
    p.done();
    const rec = this.s.webhookEndpoints.byId[path.id];
    if (!rec) throw errors.noSuch('webhook endpoint', path.id);
    delete this.s.webhookEndpoints.byId[path.id];
    this.s.webhookEndpoints.ids = this.s.webhookEndpoints.ids.filter((id) => id !== path.id);
    return { body: { id: path.id, object: 'webhook_endpoint', deleted: true } };
  };
}

// ---- lists --------------------------------------------------------------------------------------------------

interface PageParams {
  limit: number;
  startingAfter?: string;
  endingBefore?: string;
}

function pageParams(p: Params): PageParams {
  const limit = p.int('limit') ?? LIST_DEFAULT;
  if (limit < 1 || limit > 100) throw errors.invalidParam('limit', 'Invalid limit: must be between 1 and 100');
  const startingAfter = p.string('starting_after');
  const endingBefore = p.string('ending_before');
  if (startingAfter !== undefined && endingBefore !== undefined) {
    throw errors.invalidParam('starting_after', 'You may only specify one of these parameters: ending_before, starting_after.');
  }
  return { limit, startingAfter, endingBefore };
}

function newestFirst<T>(c: Collection<T>): T[] {
  return [...c.ids].reverse().map((id) => c.byId[id]);
}

/**
 * The API's cursor pagination: `starting_after` an id gives the page after it, `ending_before` the page just
 * before it; `has_more` says whether anything lies beyond the page in that direction.
 */
function paginate<T extends { id: string }>(all: T[], page: PageParams, url: string, what: string) {
  let start = 0;
  let end = all.length;
  if (page.startingAfter !== undefined) {
    const i = all.findIndex((x) => x.id === page.startingAfter);
    if (i < 0) throw errors.noSuch(what, page.startingAfter, 'starting_after');
    start = i + 1;
  }
  if (page.endingBefore !== undefined) {
    const i = all.findIndex((x) => x.id === page.endingBefore);
    if (i < 0) throw errors.noSuch(what, page.endingBefore, 'ending_before');
    end = i;
    start = Math.max(0, end - page.limit);
    return { object: 'list' as const, data: all.slice(start, end), has_more: start > 0, url };
  }
  const data = all.slice(start, start + page.limit);
  return { object: 'list' as const, data, has_more: start + page.limit < end, url };
}
