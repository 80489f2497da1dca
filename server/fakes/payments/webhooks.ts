import crypto from 'node:crypto';
import { newId } from './ids';
import type { Delivery, EventJson, FakeStore } from './store';

/**
 * The signature header the API sends with each delivery: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload">`
 * keyed with the endpoint's signing secret (the scheme `stripe.webhooks.constructEvent` verifies). Written here
 * with node:crypto rather than the SDK's test helper so the tests check the SDK against an independent signer.
 */
export function signatureHeader(payload: string, secret: string, timestampSeconds: number): string {
  const v1 = crypto.createHmac('sha256', secret).update(`${timestampSeconds}.${payload}`, 'utf8').digest('hex');
  return `t=${timestampSeconds},v1=${v1}`;
}

/** The signing secret format the API hands out for an endpoint. */
export function newSigningSecret(): string {
  return `whsec_${crypto.randomBytes(24).toString('base64url')}`;
}

export interface DeliveryOptions {
  /** Delay before the first retry; each later retry waits twice as long, up to `retryMaxMs`. */
  retryBaseMs: number;
  retryMaxMs: number;
  /** Attempts in all before a delivery is given up (the hosted API keeps trying for three days). */
  maxAttempts: number;
  timeoutMs: number;
  /** When false, events wait until deliverPending() is called (tests that choose the order). */
  autoDeliver: boolean;
  log: (msg: string) => void;
}

/**
 * Delivers each event to every enabled endpoint that wants it, at least once: a 2xx answer ends it, anything else
 * (an error status, a refused connection, a timeout) schedules a retry with exponential backoff. Deliveries are
 * tried one at a time in the order they fell due, so a retried event can arrive after a later one — as with the
 * hosted API, receivers must not assume order.
 */
export class Deliverer {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> | null = null;
  private closed = false;
  private readonly controllers = new Set<AbortController>();

  constructor(
    private readonly store: FakeStore,
    private readonly opts: DeliveryOptions,
  ) {}

  enqueue(event: EventJson): void {
    const { webhookEndpoints } = this.store.state;
    let count = 0;
    for (const id of webhookEndpoints.ids) {
      const { endpoint } = webhookEndpoints.byId[id];
      if (endpoint.status !== 'enabled') continue;
      if (!endpoint.enabled_events.includes('*') && !endpoint.enabled_events.includes(event.type)) continue;
      this.store.state.deliveries.push({
        id: newId('whdel'),
        eventId: event.id,
        endpointId: id,
        attempts: 0,
        nextAttemptAt: Date.now(),
        status: 'pending',
        lastStatus: null,
        lastError: null,
      });
      count += 1;
    }
    event.pending_webhooks = count;
  }

  /** Called after each change: makes sure a pass runs when the next delivery falls due. */
  kick(): void {
    if (this.closed || !this.opts.autoDeliver) return;
    this.schedule();
  }

  private schedule(): void {
    if (this.closed || this.running) return;
    const next = this.pending().reduce((min, d) => Math.min(min, d.nextAttemptAt), Number.POSITIVE_INFINITY);
    if (!Number.isFinite(next)) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.pass(false).then(() => this.schedule());
    }, Math.max(0, next - Date.now()));
    this.timer.unref?.();
  }

  private pending(): Delivery[] {
    return this.store.state.deliveries.filter((d) => d.status === 'pending');
  }

  /** One pass over the deliveries that are due (or all pending ones, when `all`), in order. */
  private pass(all: boolean): Promise<void> {
    if (this.running) return this.running.then(() => this.pass(all));
    this.running = (async () => {
      const due = this.pending()
        .filter((d) => all || d.nextAttemptAt <= Date.now())
        .sort((a, b) => a.nextAttemptAt - b.nextAttemptAt);
      for (const d of due) {
        if (this.closed) break;
        await this.attempt(d);
      }
    })().finally(() => {
      this.running = null;
    });
    return this.running;
  }

  /**
   * Tests: delivers every pending event now (ignoring backoff), once each; resolves when done. With `autoDeliver`
   * off this is the only way events leave the fake.
   */
  async deliverPending(): Promise<void> {
    await this.pass(true);
    this.schedule();
  }

  /** Tests: waits until no delivery is pending (every event answered 2xx or given up), or the timeout passes. */
  async idle(timeoutMs = 10_000): Promise<void> {
    const deadline = Date.now() + timeoutMs;
    while (this.pending().length > 0 || this.running) {
      if (Date.now() > deadline) throw new Error(`payments fake: ${this.pending().length} webhook deliveries still pending`);
      await new Promise((r) => setTimeout(r, 20));
    }
  }

  private async attempt(d: Delivery): Promise<void> {
    const { events, webhookEndpoints } = this.store.state;
    const event = events.byId[d.eventId];
    const rec = webhookEndpoints.byId[d.endpointId];
    if (!event || !rec || rec.endpoint.status !== 'enabled') {
      d.status = 'failed';
      d.lastError = 'endpoint or event no longer exists';
      this.store.save();
      return;
    }
    // The hosted API sends the event pretty-printed; the signature covers these exact bytes.
    const payload = JSON.stringify(event, null, 2);
    const header = signatureHeader(payload, rec.secret, Math.floor(Date.now() / 1000));
    d.attempts += 1;
    const controller = new AbortController();
    this.controllers.add(controller);
    const timeout = setTimeout(() => controller.abort(), this.opts.timeoutMs);
    try {
      const res = await fetch(rec.endpoint.url, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json; charset=utf-8', 'Stripe-Signature': header, 'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)' },
        body: payload,
        signal: controller.signal,
      });
      await res.arrayBuffer().catch(() => undefined);
      d.lastStatus = res.status;
      d.lastError = res.ok ? null : `HTTP ${res.status}`;
    } catch (err) {
      d.lastStatus = null;
      d.lastError = err instanceof Error ? err.message : String(err);
    } finally {
      clearTimeout(timeout);
      this.controllers.delete(controller);
    }
    if (d.lastError === null) {
      d.status = 'succeeded';
      event.pending_webhooks = Math.max(0, event.pending_webhooks - 1);
    } else if (d.attempts >= this.opts.maxAttempts) {
      d.status = 'failed';
      this.opts.log(`[payments-fake] gave up delivering ${event.type} ${event.id} after ${d.attempts} attempts: ${d.lastError}`);
    } else {
      d.nextAttemptAt = Date.now() + Math.min(this.opts.retryBaseMs * 2 ** (d.attempts - 1), this.opts.retryMaxMs);
    }
    if (!this.closed) this.store.save();
  }

  async close(): Promise<void> {
    this.closed = true;
    if (this.timer) clearTimeout(this.timer);
    for (const c of this.controllers) c.abort();
    await this.running?.catch(() => undefined);
  }
}
