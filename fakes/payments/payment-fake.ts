import { createHash, timingSafeEqual } from 'node:crypto';
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response } from 'express';
import Stripe from 'stripe';
import { ApiError, type ApiErrorBody, invalidParam, Params } from './api-params';
import { type ApiObject, type Delivery, type FakeEvent, type IdempotencyRecord, loadState, StateWriter } from './fake-state';
import { FormEncodingError, type FormHash, type FormValue, parseFormEncoded } from './form-encoding';
import { newId, PaymentLedger, type RequestContext } from './payment-ledger';
import { WebhookSender } from './webhook-sender';

/** The event types the app's webhook receives unless `webhookEvents` says otherwise. */
export const DEFAULT_WEBHOOK_EVENTS: readonly string[] = ['payment_intent.succeeded', 'payment_intent.payment_failed', 'charge.refunded'];

export interface PaymentFakeOptions {
  /** Port on loopback; 0 or unset: any free port. */
  port?: number;
  /** 127.0.0.1 (default) or ::1: the fake never listens on another address. */
  host?: string;
  /** The secret API key, or keys, the fake accepts (`sk_test_…`; live keys are refused). */
  secretKey: string | readonly string[];
  /** The webhook endpoint's signing secret (`whsec_…`). */
  webhookSecret: string;
  /** Where events are POSTed; unset or null: no webhooks. */
  webhookUrl?: string | null;
  /** Event types sent to the webhook URL, or 'all' (default: DEFAULT_WEBHOOK_EVENTS). */
  webhookEvents?: readonly string[] | 'all';
  /** JSON file the state is kept in (written atomically after every change); unset or null: memory only. */
  stateFile?: string | null;
  /** Delay after a failed webhook try, doubled after each further failure (default 1000 ms)… */
  webhookRetryBaseMs?: number;
  /** …up to this (default 60 000 ms). */
  webhookRetryMaxMs?: number;
  /** How long the receiver may take to answer (default 10 000 ms). */
  webhookTimeoutMs?: number;
  /** Tries before a delivery is given up as failed (default 0: retry until the receiver answers 2xx). */
  webhookMaxAttempts?: number;
  /** Start with webhook sending paused. */
  webhooksPaused?: boolean;
}

export interface PaymentFake {
  port: number;
  /** `http://127.0.0.1:<port>`: the API is under /v1, the control surface under /_fake. */
  url: string;
  /** Events so far, oldest first (copies). */
  events(): FakeEvent[];
  /** Webhook deliveries with their tries, oldest first (copies). */
  deliveries(): Delivery[];
  /** Resolves with the first delivery (now or later) that matches. */
  waitForDelivery(match: (d: Delivery) => boolean, timeoutMs?: number): Promise<Delivery>;
  pauseWebhooks(): void;
  resumeWebhooks(): void;
  /** The next `count` webhook tries fail without calling the receiver. */
  failNextWebhooks(count: number): void;
  /** Tries every pending delivery now. */
  retryWebhooksNow(): void;
  /** Stops the server and the webhook sender, and writes the state. */
  close(): Promise<void>;
}

const LOOPBACK = new Set(['127.0.0.1', '::1']);

function digest(s: string): Buffer {
  return createHash('sha256').update(s).digest();
}

/** Constant-time check of a presented key against the accepted ones (hashes make the lengths equal). */
function acceptedKey(given: string, accepted: readonly string[]): boolean {
  let ok = false;
  for (const key of accepted) ok = timingSafeEqual(digest(given), digest(key)) || ok;
  return ok;
}

/** A key shown in an error message: its prefix and last four characters only. */
function maskKey(key: string): string {
  if (key.length <= 12) return '*'.repeat(key.length);
  return `${key.slice(0, 8)}${'*'.repeat(key.length - 12)}${key.slice(-4)}`;
}

/** The parameters as compared between an idempotent request and its replay: keys sorted, card numbers and CVCs masked. */
function fingerprint(hash: FormHash): string {
  const canonical = (v: FormValue, key: string): unknown => {
    if (typeof v === 'string') {
      if (key === 'card.number') return `****${v.slice(-4)}`;
      if (key === 'card.cvc') return '***';
      return v;
    }
    if (Array.isArray(v)) return v.map((x) => canonical(x, ''));
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(v).sort()) out[k] = canonical(v[k], key === 'card' ? `card.${k}` : k);
    return out;
  };
  return createHash('sha256')
    .update(JSON.stringify(canonical(hash, '')))
    .digest('hex');
}

function render(value: unknown): string {
  return JSON.stringify(value, null, 2);
}

function errorJson(body: ApiErrorBody): string {
  return render({ error: body });
}

interface Route {
  method: 'GET' | 'POST';
  pattern: RegExp;
  handle: (p: Params, ctx: RequestContext, id: string) => ApiObject;
}

/**
 * A local stand-in for the card payment provider, speaking the part of its HTTP API that the
 * official `stripe` SDK uses for Spincycle's invoice payments, so that the app's production code
 * path runs against it (the SDK aimed here with its `host`, `port` and `protocol: 'http'`
 * options). Form-encoded requests, bearer secret-key auth, the provider's JSON errors and
 * statuses, `Idempotency-Key` replays (byte for byte, scoped per API key), customers,
 * PaymentMethods, PaymentIntents (create, confirm, cancel, update), charges, refunds and events;
 * the documented test cards; signed webhooks retried with backoff; state in a JSON file so a
 * restart resumes where it stopped. Card numbers, expiry dates and CVCs are never stored or
 * logged: a PaymentMethod keeps its brand and last four digits (and which test behaviour it has).
 *
 * The control surface for tests (same bearer key): GET /_fake/events, GET /_fake/deliveries,
 * POST /_fake/webhooks/pause | resume | retry-now, POST /_fake/webhooks/fail-next {count},
 * POST /_fake/payment_intents/:id/authenticate {outcome: succeed | fail}; GET /_fake/health.
 */
export async function startPaymentFake(options: PaymentFakeOptions): Promise<PaymentFake> {
  const host = options.host ?? '127.0.0.1';
  if (!LOOPBACK.has(host)) throw new Error(`the payment fake listens on loopback only (127.0.0.1 or ::1), not ${host}`);
  const keys = typeof options.secretKey === 'string' ? [options.secretKey] : [...options.secretKey];
  if (!keys.length || keys.some((k) => !/^(sk|rk)_test_\S{4,}$/.test(k)))
    throw new Error('the payment fake accepts test secret keys only (sk_test_… or rk_test_…)');
  if (!options.webhookSecret) throw new Error('the payment fake needs a webhook signing secret (whsec_…)');

  const state = loadState(options.stateFile ?? null);
  const writer = new StateWriter(options.stateFile ?? null, () => state);
  const logWriteError = (err: Error) => console.error(`payment fake: cannot write its state file: ${err.message}`);
  const events = options.webhookEvents ?? DEFAULT_WEBHOOK_EVENTS;
  const sender = new WebhookSender(
    state,
    writer,
    {
      url: options.webhookUrl ?? null,
      secret: options.webhookSecret,
      enabledEvents: events === 'all' ? null : new Set(events),
      retryBaseMs: options.webhookRetryBaseMs ?? 1000,
      retryMaxMs: options.webhookRetryMaxMs ?? 60_000,
      timeoutMs: options.webhookTimeoutMs ?? 10_000,
      maxAttempts: options.webhookMaxAttempts ?? 0,
      paused: options.webhooksPaused ?? false,
    },
    logWriteError,
  );
  let baseUrl = '';
  const ledger = new PaymentLedger(state, {
    baseUrl: () => baseUrl,
    defaultApiVersion: Stripe.API_VERSION,
    onEvent: (e) => sender.enqueue(e),
  });
  /** Idempotency keys whose first request is still being answered. */
  const inFlight = new Set<string>();

  const routes: Route[] = [
    { method: 'POST', pattern: /^\/customers$/, handle: (p, ctx) => ledger.createCustomer(p, ctx) },
    { method: 'GET', pattern: /^\/customers\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrieveCustomer(id, p) },
    { method: 'POST', pattern: /^\/customers\/([^/]+)$/, handle: (p, ctx, id) => ledger.updateCustomer(id, p, ctx) },
    { method: 'POST', pattern: /^\/payment_methods$/, handle: (p, ctx) => ledger.createPaymentMethod(p, ctx) },
    { method: 'GET', pattern: /^\/payment_methods\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrievePaymentMethod(id, p) },
    { method: 'POST', pattern: /^\/payment_intents$/, handle: (p, ctx) => ledger.createPaymentIntent(p, ctx) },
    { method: 'GET', pattern: /^\/payment_intents$/, handle: (p) => ledger.listPaymentIntents(p) },
    { method: 'GET', pattern: /^\/payment_intents\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrievePaymentIntent(id, p) },
    { method: 'POST', pattern: /^\/payment_intents\/([^/]+)$/, handle: (p, ctx, id) => ledger.updatePaymentIntent(id, p, ctx) },
    { method: 'POST', pattern: /^\/payment_intents\/([^/]+)\/confirm$/, handle: (p, ctx, id) => ledger.confirmPaymentIntent(id, p, ctx) },
    { method: 'POST', pattern: /^\/payment_intents\/([^/]+)\/cancel$/, handle: (p, ctx, id) => ledger.cancelPaymentIntent(id, p, ctx) },
    { method: 'GET', pattern: /^\/charges\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrieveCharge(id, p) },
    { method: 'POST', pattern: /^\/refunds$/, handle: (p, ctx) => ledger.createRefund(p, ctx) },
    { method: 'GET', pattern: /^\/refunds$/, handle: (p) => ledger.listRefunds(p) },
    { method: 'GET', pattern: /^\/refunds\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrieveRefund(id, p) },
    { method: 'GET', pattern: /^\/events$/, handle: (p) => ledger.listEvents(p) },
    { method: 'GET', pattern: /^\/events\/([^/]+)$/, handle: (p, _ctx, id) => ledger.retrieveEvent(id, p) },
  ];

  /** The API key of the request, or an error answer (401) already sent. */
  function authenticate(req: Request, res: Response): string | null {
    const header = req.get('authorization') ?? '';
    let key: string | null = null;
    const bearer = /^Bearer\s+(\S+)$/i.exec(header);
    const basic = /^Basic\s+(\S+)$/i.exec(header);
    if (bearer) key = bearer[1];
    else if (basic) key = Buffer.from(basic[1], 'base64').toString('utf8').split(':')[0] || null;
    let message: string | null = null;
    if (!key)
      message =
        "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY').";
    else if (/^(sk|rk)_live_/.test(key)) message = 'The payment fake never accepts live keys: use a test secret key (sk_test_…).';
    else if (!acceptedKey(key, keys)) message = `Invalid API Key provided: ${maskKey(key)}`;
    if (message) {
      res
        .status(401)
        .set('Content-Type', 'application/json')
        .send(errorJson({ type: 'invalid_request_error', message }));
      return null;
    }
    return key;
  }

  async function handleApi(req: Request, res: Response): Promise<void> {
    const requestId = newId('req', 14);
    const apiVersion = req.get('stripe-version') || Stripe.API_VERSION;
    res.set({ 'Request-Id': requestId, 'Stripe-Version': apiVersion, 'Cache-Control': 'no-cache, no-store' });
    const send = (status: number, body: string) => void res.status(status).set('Content-Type', 'application/json').send(body);
    const apiKey = authenticate(req, res);
    if (!apiKey) return;

    const method = req.method;
    let route: Route | undefined;
    let id = '';
    for (const r of routes) {
      const m = r.method === method ? r.pattern.exec(req.path) : null;
      if (m) {
        route = r;
        id = m[1] ?? '';
        break;
      }
    }
    if (!route)
      return send(
        404,
        errorJson({
          type: 'invalid_request_error',
          message: `Unrecognized request URL (${method}: /v1${req.path}). The payment fake models only part of the API.`,
        }),
      );
    try {
      id = decodeURIComponent(id);
    } catch {
      return send(404, errorJson({ type: 'invalid_request_error', message: `Unrecognized request URL (${method}: /v1${req.path}).` }));
    }

    let hash: FormHash;
    try {
      const query = req.originalUrl.includes('?') ? req.originalUrl.slice(req.originalUrl.indexOf('?') + 1) : '';
      hash = parseFormEncoded(method === 'POST' ? (typeof req.body === 'string' ? req.body : '') : query);
    } catch (err) {
      if (!(err instanceof FormEncodingError)) throw err;
      return send(400, errorJson({ type: 'invalid_request_error', message: err.message, param: err.param }));
    }

    // Idempotency (POST only, as the provider): keyed per API key; the first answer is replayed byte for byte.
    const idempotencyKey = method === 'POST' ? (req.get('idempotency-key') ?? null) : null;
    let slot: string | null = null;
    let requestPrint = '';
    if (idempotencyKey !== null) {
      res.set('Idempotency-Key', idempotencyKey);
      if (idempotencyKey.length === 0 || idempotencyKey.length > 255)
        return send(
          400,
          errorJson({ type: 'invalid_request_error', message: 'Idempotency-Key must be between 1 and 255 characters long.' }),
        );
      const scope = digest(apiKey).toString('hex').slice(0, 32);
      slot = `${scope}:${idempotencyKey}`;
      const print = fingerprint(hash);
      // The first request is "going through" until its result is written to the state file: a
      // duplicate arriving meanwhile is told so (409, which the SDK retries), as the provider does.
      if (inFlight.has(slot))
        return send(
          409,
          errorJson({
            type: 'idempotency_error',
            code: 'idempotency_key_in_use',
            message: `There is currently another in-progress request using this Idempotency-Key (that probably means you submitted twice, and the other request is still going through): '${idempotencyKey}'. Please try again later.`,
          }),
        );
      const record = state.idempotency[slot];
      if (record && Date.now() - record.createdAt < 24 * 3600 * 1000) {
        const tryOther = `Try using a key other than '${idempotencyKey}' if you meant to execute a different request.`;
        if (record.method !== method || record.path !== req.path)
          return send(
            400,
            errorJson({
              type: 'idempotency_error',
              message: `Keys for idempotent requests can only be used for the same endpoint they were first used for ('${record.method} /v1${record.path}' vs '${method} /v1${req.path}'). ${tryOther}`,
            }),
          );
        if (record.fingerprint !== print)
          return send(
            400,
            errorJson({
              type: 'idempotency_error',
              message: `Keys for idempotent requests can only be used with the same parameters they were first used with. ${tryOther}`,
            }),
          );
        res.set({ 'Idempotent-Replayed': 'true', 'Original-Request': record.requestId });
        return send(record.status, record.body);
      }
      inFlight.add(slot);
      requestPrint = print;
    }

    try {
      const ctx: RequestContext = { requestId, idempotencyKey, apiVersion };
      let status = 200;
      let body: string;
      let recorded = true;
      try {
        body = render(route.handle(new Params(hash), ctx, id));
      } catch (err) {
        if (!(err instanceof ApiError)) throw err;
        status = err.status;
        body = errorJson(err.body);
        recorded = err.recorded;
      }
      if (slot && recorded) {
        const record: IdempotencyRecord = {
          scope: slot.slice(0, slot.indexOf(':')),
          key: idempotencyKey!,
          method,
          path: req.path,
          fingerprint: requestPrint,
          status,
          body,
          requestId,
          createdAt: Date.now(),
        };
        state.idempotency[slot] = record;
      }
      if (method === 'POST') {
        try {
          await writer.save();
        } catch (err) {
          logWriteError(err as Error);
          if (slot) delete state.idempotency[slot];
          return send(500, errorJson({ type: 'api_error', message: 'The payment fake could not write its state file.' }));
        }
      }
      send(status, body);
    } finally {
      if (slot) inFlight.delete(slot);
    }
  }

  const app = express();
  app.disable('x-powered-by');
  app.disable('etag');

  app.get('/_fake/health', (_req, res) => void res.json({ ok: true }));
  const control = express.Router();
  control.use((req, res, next) => {
    if (authenticate(req, res)) next();
  });
  control.use(express.json({ limit: '16kb' }), express.urlencoded({ extended: false, limit: '16kb' }));
  const controlStatus = () => sender.status();
  control.get('/events', (req, res) => {
    const type = typeof req.query.type === 'string' ? req.query.type : null;
    res.json({ data: state.events.filter((e) => !type || e.type === type).reverse() });
  });
  control.get('/deliveries', (req, res) => {
    const status = typeof req.query.status === 'string' ? req.query.status : null;
    const eventType = typeof req.query.eventType === 'string' ? req.query.eventType : null;
    const data = state.deliveries.filter((d) => (!status || d.status === status) && (!eventType || d.eventType === eventType));
    res.json({ ...controlStatus(), data });
  });
  control.post('/webhooks/pause', (_req, res) => {
    sender.pause();
    res.json(controlStatus());
  });
  control.post('/webhooks/resume', (_req, res) => {
    sender.resume();
    res.json(controlStatus());
  });
  control.post('/webhooks/retry-now', (_req, res) => {
    sender.retryNow();
    res.json(controlStatus());
  });
  control.post('/webhooks/fail-next', (req, res) => {
    const raw = (req.body as Record<string, unknown> | undefined)?.count;
    const count = typeof raw === 'number' ? raw : Number(raw);
    if (!Number.isInteger(count) || count < 0 || count > 1000) throw invalidParam('count must be a whole number from 0 to 1000', 'count');
    sender.failNextSends(count);
    res.json(controlStatus());
  });
  control.post('/payment_intents/:id/authenticate', async (req, res) => {
    const outcome = (req.body as Record<string, unknown> | undefined)?.outcome ?? 'succeed';
    if (outcome !== 'succeed' && outcome !== 'fail') throw invalidParam('outcome must be succeed or fail', 'outcome');
    const pi = ledger.completeAuthentication(String(req.params.id), outcome);
    await writer.save();
    res.json(pi);
  });
  app.use('/_fake', control);
  app.use('/v1', express.text({ type: () => true, limit: '1mb' }), handleApi);
  app.use((req, res) => {
    res
      .status(404)
      .set('Content-Type', 'application/json')
      .send(errorJson({ type: 'invalid_request_error', message: `Unrecognized request URL (${req.method}: ${req.path}).` }));
  });
  app.use((err: Error & { status?: number; type?: string }, _req: Request, res: Response, _next: NextFunction) => {
    if (err instanceof ApiError) return void res.status(err.status).set('Content-Type', 'application/json').send(errorJson(err.body));
    const status = typeof err.status === 'number' && err.status >= 400 && err.status < 500 ? err.status : 500;
    if (status === 500) console.error(`payment fake: ${err.stack ?? err.message}`);
    res
      .status(status)
      .set('Content-Type', 'application/json')
      .send(
        errorJson({
          type: status === 500 ? 'api_error' : 'invalid_request_error',
          message: status === 500 ? 'The payment fake failed.' : err.message,
        }),
      );
  });

  const server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, host, () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  const url = `http://${host.includes(':') ? `[${host}]` : host}:${port}`;
  baseUrl = url;
  // Deliveries left pending by an earlier run resume now.
  sender.schedule();

  return {
    port,
    url,
    events: () => structuredClone(state.events),
    deliveries: () => structuredClone(state.deliveries),
    waitForDelivery: (match, timeoutMs) => sender.waitFor(match, timeoutMs).then((d) => structuredClone(d)),
    pauseWebhooks: () => sender.pause(),
    resumeWebhooks: () => sender.resume(),
    failNextWebhooks: (count) => sender.failNextSends(count),
    retryWebhooksNow: () => sender.retryNow(),
    async close() {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeIdleConnections();
      const force = setTimeout(() => server.closeAllConnections(), 1000);
      await closed;
      clearTimeout(force);
      await sender.close();
      await writer.save().catch(logWriteError);
      await writer.flush();
    },
  };
}
