import { createHmac } from 'node:crypto';
import type { Delivery, DeliveryAttempt, FakeEvent, FakeStateData, StateWriter } from './fake-state';
import { newId } from './payment-ledger';

/**
 * The provider's webhook signature header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<raw
 * body>" keyed with the endpoint's signing secret>` (the scheme its SDK's
 * `webhooks.constructEvent` verifies and `webhooks.generateTestHeaderString` produces). Each try
 * is signed anew with its own time, so a retry hours later still passes the receiver's tolerance.
 */
export function signWebhookPayload(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

export interface WebhookSenderOptions {
  /** Where events go now (read at every try, so a restarted fake uses its new setting); null: no webhooks. */
  url: string | null;
  secret: string;
  /** Event types sent; null: every type. */
  enabledEvents: ReadonlySet<string> | null;
  /** Delay after the first failed try; doubled after each further failure up to `retryMaxMs`. */
  retryBaseMs: number;
  retryMaxMs: number;
  /** How long the receiver may take to answer one try. */
  timeoutMs: number;
  /** Tries before a delivery is given up as failed; 0: never give up. */
  maxAttempts: number;
  paused: boolean;
}

const KEEP_ATTEMPTS = 20;

/**
 * Delivers events to the webhook URL: one delivery per event, signed, retried with exponential
 * backoff until the receiver answers 2xx (redirects count as failures). Deliveries live in the
 * fake's state, so pending ones resume after a restart. For tests: pause and resume (the app is
 * "down" between a charge and its webhook), fail the next N tries without calling the receiver,
 * retry everything now, and wait for a delivery.
 */
export class WebhookSender {
  private timer: NodeJS.Timeout | null = null;
  private readonly inFlight = new Map<string, { controller: AbortController; done: Promise<void> }>();
  private readonly waiters = new Set<() => void>();
  private failNext = 0;
  private paused: boolean;
  private closed = false;

  constructor(
    private readonly state: FakeStateData,
    private readonly writer: StateWriter,
    private readonly options: WebhookSenderOptions,
    private readonly onWriteError: (err: Error) => void,
  ) {
    this.paused = options.paused;
  }

  /** Queues the delivery of a new event (when a URL is set and its type is sent); the caller saves the state. */
  enqueue(event: FakeEvent): void {
    const { url, enabledEvents } = this.options;
    if (!url || (enabledEvents && !enabledEvents.has(event.type))) return;
    event.pending_webhooks = 1;
    this.state.deliveries.push({
      id: newId('whdel'),
      eventId: event.id,
      eventType: event.type,
      payload: JSON.stringify(event, null, 2),
      status: 'pending',
      attemptCount: 0,
      attempts: [],
      nextAttemptAt: Date.now(),
      createdAt: new Date().toISOString(),
      deliveredAt: null,
    });
    this.notify();
    this.schedule();
  }

  status(): { paused: boolean; failNext: number; pending: number } {
    return { paused: this.paused, failNext: this.failNext, pending: this.state.deliveries.filter((d) => d.status === 'pending').length };
  }

  pause(): void {
    this.paused = true;
    this.clearTimer();
  }

  /** Resumes sending; pending deliveries are tried at once. */
  resume(): void {
    this.paused = false;
    this.retryNow();
  }

  /** Makes every pending delivery due now (without waiting for its backoff). */
  retryNow(): void {
    const now = Date.now();
    for (const d of this.state.deliveries) if (d.status === 'pending') d.nextAttemptAt = Math.min(d.nextAttemptAt, now);
    this.schedule();
  }

  /** The next `count` tries fail without calling the receiver (recorded as simulated failures). */
  failNextSends(count: number): void {
    this.failNext = count;
  }

  /** Resolves with the first delivery (now or later) that matches. */
  waitFor(match: (d: Delivery) => boolean, timeoutMs = 5000): Promise<Delivery> {
    return new Promise((resolve, reject) => {
      const check = () => {
        const found = this.state.deliveries.find(match);
        if (!found) return false;
        clearTimeout(timer);
        this.waiters.delete(waiter);
        resolve(found);
        return true;
      };
      const waiter = () => void check();
      const timer = setTimeout(() => {
        this.waiters.delete(waiter);
        reject(new Error(`no matching webhook delivery within ${timeoutMs} ms`));
      }, timeoutMs);
      if (!check()) this.waiters.add(waiter);
    });
  }

  /** Sets the timer for the earliest due delivery. */
  schedule(): void {
    this.clearTimer();
    if (this.paused || this.closed) return;
    let next = Infinity;
    for (const d of this.state.deliveries) if (d.status === 'pending' && !this.inFlight.has(d.id)) next = Math.min(next, d.nextAttemptAt);
    if (next === Infinity) return;
    this.timer = setTimeout(() => this.runDue(), Math.max(0, next - Date.now()));
    this.timer.unref();
  }

  /** Stops sending: aborts tries in flight (not recorded: they are tried again after a restart). */
  async close(): Promise<void> {
    this.closed = true;
    this.clearTimer();
    for (const { controller } of this.inFlight.values()) controller.abort();
    await Promise.all([...this.inFlight.values()].map((f) => f.done));
  }

  private notify(): void {
    for (const w of [...this.waiters]) w();
  }

  private clearTimer(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  private runDue(): void {
    this.timer = null;
    if (this.paused || this.closed) return;
    const now = Date.now();
    for (const d of this.state.deliveries) {
      if (d.status === 'pending' && !this.inFlight.has(d.id) && d.nextAttemptAt <= now) {
        const controller = new AbortController();
        const done = this.attempt(d, controller).finally(() => {
          this.inFlight.delete(d.id);
          this.notify();
          this.schedule();
        });
        this.inFlight.set(d.id, { controller, done });
      }
    }
    this.schedule();
  }

  private async attempt(d: Delivery, controller: AbortController): Promise<void> {
    const started = Date.now();
    const attempt: DeliveryAttempt = { at: new Date(started).toISOString(), status: null, error: null, simulated: false, durationMs: 0 };
    const url = this.options.url;
    if (this.failNext > 0) {
      this.failNext--;
      attempt.simulated = true;
      attempt.error = 'simulated failure (fail next sends)';
    } else if (!url) {
      attempt.error = 'no webhook URL is set';
    } else {
      try {
        const res = await fetch(url, {
          method: 'POST',
          headers: {
            'Content-Type': 'application/json; charset=utf-8',
            'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
            'Stripe-Signature': signWebhookPayload(d.payload, this.options.secret),
          },
          body: d.payload,
          redirect: 'manual',
          signal: AbortSignal.any([controller.signal, AbortSignal.timeout(this.options.timeoutMs)]),
        });
        attempt.status = res.status;
        await res.arrayBuffer().catch(() => undefined);
        if (res.status < 200 || res.status >= 300) attempt.error = `the receiver answered HTTP ${res.status}`;
      } catch (err) {
        if (controller.signal.aborted) return;
        const e = err as Error & { cause?: { code?: string } };
        attempt.error =
          e.name === 'TimeoutError'
            ? `no answer within ${this.options.timeoutMs} ms`
            : `${e.message}${e.cause?.code ? ` (${e.cause.code})` : ''}`;
      }
    }
    attempt.durationMs = Date.now() - started;
    d.attemptCount++;
    d.attempts.push(attempt);
    if (d.attempts.length > KEEP_ATTEMPTS) d.attempts.splice(0, d.attempts.length - KEEP_ATTEMPTS);
    if (!attempt.error) {
      d.status = 'succeeded';
      d.deliveredAt = new Date().toISOString();
      const event = this.state.events.find((e) => e.id === d.eventId);
      if (event) event.pending_webhooks = 0;
    } else if (this.options.maxAttempts > 0 && d.attemptCount >= this.options.maxAttempts) {
      d.status = 'failed';
    } else {
      d.nextAttemptAt = Date.now() + Math.min(this.options.retryBaseMs * 2 ** (d.attemptCount - 1), this.options.retryMaxMs);
    }
    this.writer.save().catch(this.onWriteError);
  }
}
