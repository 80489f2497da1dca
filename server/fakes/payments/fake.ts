import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import express, { type Request, type Response } from 'express';
import { errors, FakeApiError } from './errors';
import { newId } from './ids';
import { Params } from './params';
import { FakeApi, type Handler, type RequestInfo } from './api';
import { FakeStore, IDEMPOTENCY_TTL_MS, type Delivery, type EventJson } from './store';
import { Deliverer, signatureHeader } from './webhooks';

// A local stand-in for the hosted payments API, for development and tests. The official SDK talks to it with
// `new Stripe(key, { host, port, protocol: 'http' })`. It implements only what Fieldfold calls; see README.md
// beside this file for what it covers and what it does not.

export interface PaymentsFakeOptions {
  /** 0 picks a free port. */
  port?: number;
  /** Loopback only by default. */
  host?: string;
  /** Folder for the fake's JSON state (created if missing). */
  dataDir: string;
  /** Where events are delivered (Fieldfold's `POST /api/webhooks/payments`); none when absent. */
  webhookUrl?: string | null;
  /** The signing secret of that endpoint (`whsec_…`), shared with the server that verifies it. */
  webhookSecret?: string;
  /** Event types sent to the configured endpoint; every type by default. */
  webhookEvents?: string[];
  /** First retry after this many ms, doubling each attempt (default 1 s, capped at retryMaxMs, default 1 h). */
  retryBaseMs?: number;
  retryMaxMs?: number;
  /** Attempts before a delivery is given up (default 12). */
  maxAttempts?: number;
  /** Per-attempt timeout of a delivery (default 10 s). */
  deliveryTimeoutMs?: number;
  /** False holds events until `deliverPending()` (tests that choose delivery order). Default true. */
  autoDeliver?: boolean;
  /** Added to every API request before it runs, to watch progress states and double taps. Default 0. */
  latencyMs?: number;
  /** Clock in epoch ms for object timestamps and idempotency expiry (delivery timers use the real clock). */
  now?: () => number;
  log?: (msg: string) => void;
}

export interface PaymentsFake {
  url: string;
  port: number;
  close: () => Promise<void>;
  /** Tests: deliver every pending event now, in order, once each. */
  deliverPending: () => Promise<void>;
  /** Tests: wait until no delivery is pending. */
  webhooksIdle: (timeoutMs?: number) => Promise<void>;
  /** Tests: events the fake has emitted, oldest first. */
  events: () => EventJson[];
  /** Tests: delivery attempts and their outcome. */
  deliveries: () => Delivery[];
  /** Tests: the exact body and signature header the fake would send now for an event. */
  signedDelivery: (eventId: string, timestampSeconds?: number) => { payload: string; signature: string };
}

/** The id of the endpoint made from `webhookUrl`/`webhookSecret`, kept across restarts. */
const CONFIGURED_ENDPOINT = 'we_fieldfold_configured';

export async function startPaymentsFake(options: PaymentsFakeOptions): Promise<PaymentsFake> {
  const log = options.log ?? ((m: string) => console.log(m));
  const now = options.now ?? Date.now;
  const store = new FakeStore(options.dataDir);
  store.prune(now());
  const deliverer = new Deliverer(store, {
    retryBaseMs: options.retryBaseMs ?? 1000,
    retryMaxMs: options.retryMaxMs ?? 3600_000,
    maxAttempts: options.maxAttempts ?? 12,
    timeoutMs: options.deliveryTimeoutMs ?? 10_000,
    autoDeliver: options.autoDeliver ?? true,
    log,
  });
  const api = new FakeApi(store, deliverer);
  configureEndpoint(store, api, options, Math.floor(now() / 1000));
  store.save();

  const app = express();
  app.disable('x-powered-by');
  // The SDK's bracket keys (metadata[k], expand[0]) in bodies and query strings need the qs parser.
  app.set('query parser', 'extended');
  app.use(express.urlencoded({ extended: true, limit: '1mb', parameterLimit: 2000 }));

  app.get('/_fake/health', (_req, res) => {
    res.json({ ok: true, service: 'payments-fake', pendingDeliveries: store.state.deliveries.filter((d) => d.status === 'pending').length });
  });

  const inFlight = new Set<string>();
  const latency = options.latencyMs ?? 0;

  function route(method: 'get' | 'post' | 'delete', path: string, handler: Handler) {
    app[method](path, async (req: Request, res: Response) => {
      const requestId = newId('req', 14);
      res.set('Request-Id', requestId);
      res.set('Stripe-Version', req.get('Stripe-Version') ?? DEFAULT_VERSION);
      const info: RequestInfo = {
        requestId,
        idempotencyKey: null,
        apiVersion: req.get('Stripe-Version') ?? DEFAULT_VERSION,
        now: Math.floor(now() / 1000),
      };
      let key: string | null = null;
      try {
        authenticate(req);
        // GET and DELETE are idempotent by nature; the API ignores the header on them.
        key = method === 'post' ? (req.get('Idempotency-Key') ?? null) : null;
        const raw = (method === 'post' ? req.body : req.query) ?? {};
        if (key !== null) {
          if (key.length > 255) throw errors.idempotencyKeyTooLong();
          const endpoint = `${req.method} ${req.path}`;
          const fingerprint = canonical(raw);
          if (inFlight.has(key)) throw errors.idempotencyInFlight(key);
          const saved = store.state.idempotency[key];
          if (saved && saved.createdAt + IDEMPOTENCY_TTL_MS >= now()) {
            if (saved.endpoint !== endpoint) throw errors.idempotencyEndpoint(key, saved.endpoint, endpoint);
            if (saved.fingerprint !== fingerprint) throw errors.idempotencyParams(key);
            res.set({ 'Idempotent-Replayed': 'true', 'Original-Request': saved.requestId });
            res.status(saved.status).json(saved.body);
            return;
          }
          inFlight.add(key);
          info.idempotencyKey = key;
        }
        let status = 200;
        let body: unknown;
        let keep = true;
        try {
          if (latency > 0) await new Promise((r) => setTimeout(r, latency));
          info.now = Math.floor(now() / 1000);
          const out = handler(new Params(raw as Record<string, unknown>), req.params as Record<string, string>, info);
          status = out.status ?? 200;
          body = out.body;
        } catch (err) {
          if (!(err instanceof FakeApiError)) throw err;
          status = err.status;
          body = { error: err.body };
          keep = err.replayable;
        } finally {
          if (key !== null) inFlight.delete(key);
        }
        if (key !== null && keep) {
          store.state.idempotency[key] = { endpoint: `${req.method} ${req.path}`, fingerprint: canonical(raw), createdAt: now(), status, body, requestId };
        }
        if (method !== 'get') store.save();
        deliverer.kick();
        res.status(status).json(body);
      } catch (err) {
        if (err instanceof FakeApiError) {
          res.status(err.status).json({ error: err.body });
          return;
        }
        log(`[payments-fake] ${req.method} ${req.path} failed: ${err instanceof Error ? err.stack : String(err)}`);
        res.status(500).json({ error: { type: 'api_error', message: 'The local payments fake failed on this request; see its log.' } });
      }
    });
  }

  route('post', '/v1/customers', api.createCustomer);
  route('get', '/v1/customers', api.listCustomers);
  route('get', '/v1/customers/:id', api.retrieveCustomer);
  route('post', '/v1/invoiceitems', api.createInvoiceItem);
  route('get', '/v1/invoiceitems', api.listInvoiceItems);
  route('get', '/v1/invoiceitems/:id', api.retrieveInvoiceItem);
  route('post', '/v1/invoices', api.createInvoice);
  route('get', '/v1/invoices', api.listInvoices);
  route('get', '/v1/invoices/:id', api.retrieveInvoice);
  route('get', '/v1/invoices/:id/lines', api.listInvoiceLines);
  route('post', '/v1/invoices/:id/finalize', api.finalizeInvoice);
  route('post', '/v1/invoices/:id/pay', api.payInvoice);
  route('post', '/v1/invoices/:id/void', api.voidInvoice);
  route('get', '/v1/payment_methods/:id', api.retrievePaymentMethod);
  route('get', '/v1/events', api.listEvents);
  route('get', '/v1/events/:id', api.retrieveEvent);
  route('post', '/v1/webhook_endpoints', api.createWebhookEndpoint);
  route('get', '/v1/webhook_endpoints', api.listWebhookEndpoints);
  route('get', '/v1/webhook_endpoints/:id', api.retrieveWebhookEndpoint);
  route('delete', '/v1/webhook_endpoints/:id', api.deleteWebhookEndpoint);

  app.use((req, res) => {
    const e = errors.unrecognizedUrl(req.method, req.path);
    res.status(e.status).json({ error: e.body });
  });
  // A body the urlencoded parser refuses (too large, bad encoding) is the caller's error, in the API's shape.
  app.use((err: { status?: number; message?: string }, _req: Request, res: Response, _next: express.NextFunction) => {
    const status = typeof err.status === 'number' && err.status < 500 ? err.status : 400;
    res.status(status).json({ error: { type: 'invalid_request_error', message: `Invalid request body: ${err.message ?? 'could not be read'}` } });
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  const port = (server.address() as AddressInfo).port;
  deliverer.kick();

  return {
    url: `http://${options.host ?? '127.0.0.1'}:${port}`,
    port,
    close: async () => {
      await deliverer.close();
      store.save();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
    deliverPending: () => deliverer.deliverPending(),
    webhooksIdle: (t) => deliverer.idle(t),
    events: () => store.state.events.ids.map((id) => store.state.events.byId[id]),
    deliveries: () => store.state.deliveries.map((d) => ({ ...d })),
    signedDelivery: (eventId, timestampSeconds = Math.floor(Date.now() / 1000)) => {
      const event = store.state.events.byId[eventId];
      const rec = store.state.webhookEndpoints.byId[CONFIGURED_ENDPOINT];
      if (!event || !rec) throw new Error(`payments fake: no event ${eventId} or no configured endpoint`);
      const payload = JSON.stringify(event, null, 2);
      return { payload, signature: signatureHeader(payload, rec.secret, timestampSeconds) };
    },
  };
}

/** The API version the SDK pins when a request names none (events carry the version of the request). */
const DEFAULT_VERSION = '2026-10-28.endive';

/** The configured endpoint follows the options on every start (a changed URL or secret replaces the old one). */
function configureEndpoint(store: FakeStore, api: FakeApi, options: PaymentsFakeOptions, created: number) {
  const eps = store.state.webhookEndpoints;
  if (eps.byId[CONFIGURED_ENDPOINT]) {
    delete eps.byId[CONFIGURED_ENDPOINT];
    eps.ids = eps.ids.filter((id) => id !== CONFIGURED_ENDPOINT);
  }
  if (!options.webhookUrl) return;
  if (!options.webhookSecret) throw new Error('payments fake: webhookSecret is required with webhookUrl');
  api.addEndpoint({
    id: CONFIGURED_ENDPOINT,
    url: options.webhookUrl,
    enabled: options.webhookEvents ?? ['*'],
    description: 'Fieldfold (configured at start)',
    apiVersion: null,
    metadata: {},
    secret: options.webhookSecret,
    created,
  });
}

/**
 * Secret keys in a bearer header (the SDK's way) or as the basic-auth user name (curl's -u). The fake is test mode
 * only: a live key is refused so one can never be spent here by mistake; any other key is accepted.
 */
function authenticate(req: Request): void {
  const header = req.get('Authorization') ?? '';
  let key = '';
  const bearer = /^Bearer\s+(\S+)$/i.exec(header);
  const basic = /^Basic\s+(\S+)$/i.exec(header);
  if (bearer) key = bearer[1];
  else if (basic) key = Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0];
  if (!key) throw errors.noKey();
  if (key.startsWith('sk_live_') || key.startsWith('rk_live_')) throw errors.liveKey();
  if (key.startsWith('pk_')) {
    throw new FakeApiError(401, { type: 'invalid_request_error', message: 'This API call cannot be made with a publishable API key. Please use a secret API key.' }, false);
  }
}

/** JSON with sorted keys: the same parameters in another order are the same request. */
function canonical(value: unknown): string {
  const sort = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(sort);
    if (v && typeof v === 'object') return Object.fromEntries(Object.keys(v as object).sort().map((k) => [k, sort((v as Record<string, unknown>)[k])]));
    return v;
  };
  return JSON.stringify(sort(value));
}
