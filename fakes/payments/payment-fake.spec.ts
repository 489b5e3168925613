import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { startPaymentFake, type PaymentFake, type PaymentFakeOptions } from './payment-fake';
import { signWebhookPayload } from './webhook-sender';

// Invented keys and secrets for this suite.
const KEY = 'sk_test_specPaymentFakeKey01';
const OTHER_KEY = 'sk_test_specPaymentFakeKey02';
const WEBHOOK_SECRET = 'whsec_specPaymentFakeSecret';
const RETRY_BASE_MS = 60;

/** A receiver standing in for the app's webhook route: answers from a script (then 200), records raw bodies. */
interface Receiver {
  url: string;
  received: { body: string; signature: string; status: number }[];
  answers: number[];
  close(): Promise<void>;
}

async function startReceiver(answers: number[] = []): Promise<Receiver> {
  const received: Receiver['received'] = [];
  const script = [...answers];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const status = script.length ? script.shift()! : 200;
      received.push({ body: Buffer.concat(chunks).toString('utf8'), signature: String(req.headers['stripe-signature'] ?? ''), status });
      res.writeHead(status, { 'content-type': 'text/plain' }).end(status === 200 ? 'ok' : 'down');
    });
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/billing/webhook`,
    received,
    answers: script,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

function sdkFor(fake: PaymentFake, key = KEY): Stripe {
  // The constructor options the app uses to aim the SDK at the fake; no SDK retries here, to keep failures quick.
  return new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });
}

/** Options for a PaymentIntent confirmed at once with cards only (no redirect-based methods, so no return_url). */
const CARDS_ONLY = { automatic_payment_methods: { enabled: true, allow_redirects: 'never' as const } };

async function rejection(p: Promise<unknown>): Promise<Stripe.errors.StripeError> {
  try {
    await p;
  } catch (err) {
    return err as Stripe.errors.StripeError;
  }
  throw new Error('expected the call to fail');
}

function rawPost(fake: PaymentFake, pathName: string, body: string, headers: Record<string, string> = {}, key = KEY) {
  return fetch(`${fake.url}${pathName}`, {
    method: 'POST',
    headers: { authorization: `Bearer ${key}`, 'content-type': 'application/x-www-form-urlencoded', ...headers },
    body,
  });
}

describe('payment fake', () => {
  const dirs: string[] = [];
  const cleanups: (() => Promise<void>)[] = [];
  afterAll(async () => {
    for (const c of cleanups.reverse()) await c();
    for (const d of dirs) rmSync(d, { recursive: true, force: true });
  });

  function tempDir(): string {
    const d = mkdtempSync(path.join(tmpdir(), 'payment-fake-spec-'));
    dirs.push(d);
    return d;
  }

  async function start(options: Partial<PaymentFakeOptions> = {}): Promise<PaymentFake> {
    const fake = await startPaymentFake({
      secretKey: [KEY, OTHER_KEY],
      webhookSecret: WEBHOOK_SECRET,
      webhookRetryBaseMs: RETRY_BASE_MS,
      webhookRetryMaxMs: 1000,
      ...options,
    });
    cleanups.push(() => fake.close());
    return fake;
  }

  describe('API through the stripe SDK', () => {
    let fake: PaymentFake;
    let stripe: Stripe;
    let customer: Stripe.Customer;
    beforeAll(async () => {
      fake = await start();
      stripe = sdkFor(fake);
      customer = await stripe.customers.create({
        email: 'treasurer@observatory.test',
        name: 'Invented Node Cooperative',
        metadata: { account: '7' },
      });
    });

    it('customers: create then retrieve gives the same customer with its metadata', async () => {
      expect(customer.id).toMatch(/^cus_/);
      expect(customer.object).toBe('customer');
      const again = await stripe.customers.retrieve(customer.id);
      expect(again).toEqual(customer);
      expect((again as Stripe.Customer).metadata).toEqual({ account: '7' });
    });

    it('payment intent with the success card and confirm=true: succeeded, with a charge and a client secret', async () => {
      const pi = await stripe.paymentIntents.create({
        amount: 1250,
        currency: 'eur',
        customer: customer.id,
        description: 'Node-hours invoice 12',
        metadata: { invoice: '12' },
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      expect(pi).toMatchObject({ object: 'payment_intent', status: 'succeeded', amount: 1250, amount_received: 1250, currency: 'eur' });
      expect(pi.id).toMatch(/^pi_/);
      expect(pi.client_secret).toMatch(new RegExp(`^${pi.id}_secret_`));
      expect(pi.metadata).toEqual({ invoice: '12' });
      expect(pi.latest_charge).toMatch(/^ch_/);
      expect(pi.payment_method).toMatch(/^pm_/);
      const expanded = await stripe.paymentIntents.retrieve(pi.id, { expand: ['latest_charge'] });
      const charge = expanded.latest_charge as Stripe.Charge;
      expect(charge).toMatchObject({ object: 'charge', status: 'succeeded', paid: true, amount: 1250, payment_intent: pi.id });
      expect(charge.payment_method_details?.card?.last4).toBe('4242');
    });

    it('payment_method_data with the success card number: succeeded, card shown by brand and last four only', async () => {
      const pi = await stripe.paymentIntents.create({
        amount: 900,
        currency: 'usd',
        // The SDK's types leave raw card fields out of payment_method_data; the API accepts them.
        payment_method_data: { type: 'card', card: { number: '4242424242424242', exp_month: 12, exp_year: 2040, cvc: '123' } } as never,
        confirm: true,
        ...CARDS_ONLY,
      });
      expect(pi.status).toBe('succeeded');
      const pm = await stripe.paymentMethods.retrieve(pi.payment_method as string);
      expect(pm.card).toMatchObject({ brand: 'visa', last4: '4242' });
      expect(JSON.stringify(pm)).not.toContain('4242424242424242');
    });

    it('generic decline card: StripeCardError 402 card_declined/generic_decline; the intent waits for another payment method', async () => {
      const err = await rejection(
        stripe.paymentIntents.create({
          amount: 1250,
          currency: 'eur',
          customer: customer.id,
          payment_method: 'pm_card_chargeDeclined',
          confirm: true,
          ...CARDS_ONLY,
        }),
      );
      expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
      expect(err).toMatchObject({ statusCode: 402, type: 'StripeCardError', code: 'card_declined', decline_code: 'generic_decline' });
      const failed = err.payment_intent!;
      expect(failed.status).toBe('requires_payment_method');
      const pi = await stripe.paymentIntents.retrieve(failed.id, { expand: ['latest_charge'] });
      expect(pi.status).toBe('requires_payment_method');
      expect(pi.last_payment_error).toMatchObject({ type: 'card_error', code: 'card_declined', decline_code: 'generic_decline' });
      expect(pi.latest_charge).toMatchObject({ status: 'failed', failure_code: 'card_declined' });
    });

    it('insufficient funds card (a PaymentMethod made from the number, then confirm): decline_code insufficient_funds', async () => {
      const pm = await stripe.paymentMethods.create({
        type: 'card',
        card: { number: '4000000000009995', exp_month: 6, exp_year: 2041, cvc: '314' },
      });
      expect(pm.card).toMatchObject({ last4: '9995', brand: 'visa' });
      const pi = await stripe.paymentIntents.create({
        amount: 5000,
        currency: 'eur',
        customer: customer.id,
        payment_method: pm.id,
        ...CARDS_ONLY,
      });
      expect(pi.status).toBe('requires_confirmation');
      const err = await rejection(stripe.paymentIntents.confirm(pi.id));
      expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
      expect(err).toMatchObject({
        code: 'card_declined',
        decline_code: 'insufficient_funds',
        message: 'Your card has insufficient funds.',
      });
    });

    it('authentication cards: requires_action with next_action; error_on_requires_action and off_session fail with authentication_required', async () => {
      const oneOff = await stripe.paymentMethods.create({
        type: 'card',
        card: { number: '4000002500003155', exp_month: 1, exp_year: 2042 },
      });
      const pi = await stripe.paymentIntents.create({
        amount: 2000,
        currency: 'eur',
        payment_method: oneOff.id,
        confirm: true,
        ...CARDS_ONLY,
      });
      expect(pi.status).toBe('requires_action');
      expect(pi.next_action?.type).toBe('use_stripe_sdk');
      expect(pi.latest_charge).toBeNull();

      const always = await stripe.paymentIntents.create({
        amount: 2000,
        currency: 'eur',
        payment_method: 'pm_card_authenticationRequired',
        confirm: true,
        return_url: 'http://127.0.0.1:4300/billing/return',
      });
      expect(always.status).toBe('requires_action');
      expect(always.next_action?.redirect_to_url?.return_url).toBe('http://127.0.0.1:4300/billing/return');

      const refused = await rejection(
        stripe.paymentIntents.create({
          amount: 2000,
          currency: 'eur',
          payment_method: oneOff.id,
          confirm: true,
          error_on_requires_action: true,
          ...CARDS_ONLY,
        }),
      );
      expect(refused).toMatchObject({ statusCode: 402, code: 'authentication_required', decline_code: 'authentication_required' });
      const offSession = await rejection(
        stripe.paymentIntents.create({
          amount: 2000,
          currency: 'eur',
          payment_method: 'pm_card_authenticationRequired',
          confirm: true,
          off_session: true,
          ...CARDS_ONLY,
        }),
      );
      expect(offSession).toBeInstanceOf(Stripe.errors.StripeCardError);
      expect(offSession.code).toBe('authentication_required');
    });

    it('confirm flow: requires_payment_method → confirm with a card → succeeded; confirming again is refused', async () => {
      const pi = await stripe.paymentIntents.create({ amount: 3100, currency: 'eur', customer: customer.id, ...CARDS_ONLY });
      expect(pi.status).toBe('requires_payment_method');
      expect(pi.latest_charge).toBeNull();
      const confirmed = await stripe.paymentIntents.confirm(pi.id, { payment_method: 'pm_card_mastercard' });
      expect(confirmed.status).toBe('succeeded');
      const again = await rejection(stripe.paymentIntents.confirm(pi.id));
      expect(again).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
      expect(again).toMatchObject({ statusCode: 400, code: 'payment_intent_unexpected_state' });
    });

    it('confirm=true without return_url while redirect-based methods are allowed (the default): 400 naming return_url', async () => {
      const err = await rejection(
        stripe.paymentIntents.create({ amount: 1000, currency: 'eur', payment_method: 'pm_card_visa', confirm: true }),
      );
      expect(err).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
      expect(err.param).toBe('return_url');
      const cardsOnly = await stripe.paymentIntents.create({
        amount: 1000,
        currency: 'eur',
        payment_method: 'pm_card_visa',
        confirm: true,
        allowed_payment_method_types: ['card'],
      });
      expect(cardsOnly.status).toBe('succeeded');
    });

    it('cancel: an unpaid intent becomes canceled; a succeeded one cannot be canceled', async () => {
      const pi = await stripe.paymentIntents.create({ amount: 1500, currency: 'eur', customer: customer.id, ...CARDS_ONLY });
      const canceled = await stripe.paymentIntents.cancel(pi.id, { cancellation_reason: 'abandoned' });
      expect(canceled).toMatchObject({ status: 'canceled', cancellation_reason: 'abandoned' });
      expect(canceled.canceled_at).toEqual(expect.any(Number));
      const paid = await stripe.paymentIntents.create({
        amount: 1500,
        currency: 'eur',
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      const err = await rejection(stripe.paymentIntents.cancel(paid.id));
      expect(err).toMatchObject({ statusCode: 400, code: 'payment_intent_unexpected_state' });
    });

    it('refunds: partial, too large, the rest, then already refunded; retrieve', async () => {
      const pi = await stripe.paymentIntents.create({
        amount: 1250,
        currency: 'eur',
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      const part = await stripe.refunds.create({
        payment_intent: pi.id,
        amount: 500,
        reason: 'requested_by_customer',
        metadata: { invoice: '12' },
      });
      expect(part).toMatchObject({ object: 'refund', amount: 500, status: 'succeeded', charge: pi.latest_charge, payment_intent: pi.id });
      expect(part.id).toMatch(/^re_/);
      let charge = await stripe.charges.retrieve(pi.latest_charge as string);
      expect(charge).toMatchObject({ amount_refunded: 500, refunded: false });
      // 1250 − 500 = 750 left (worked by hand in this test).
      const tooLarge = await rejection(stripe.refunds.create({ payment_intent: pi.id, amount: 800 }));
      expect(tooLarge).toMatchObject({ statusCode: 400, code: 'amount_too_large' });
      const rest = await stripe.refunds.create({ payment_intent: pi.id });
      expect(rest.amount).toBe(750);
      charge = await stripe.charges.retrieve(pi.latest_charge as string);
      expect(charge).toMatchObject({ amount_refunded: 1250, refunded: true });
      const again = await rejection(stripe.refunds.create({ payment_intent: pi.id }));
      expect(again).toMatchObject({ statusCode: 400, code: 'charge_already_refunded' });
      expect(await stripe.refunds.retrieve(part.id)).toEqual(part);
      const unpaid = await stripe.paymentIntents.create({ amount: 1250, currency: 'eur', ...CARDS_ONLY });
      expect(await rejection(stripe.refunds.create({ payment_intent: unpaid.id }))).toMatchObject({
        statusCode: 400,
        param: 'payment_intent',
      });
    });

    it('errors: missing object 404 resource_missing, unknown and malformed parameters 400 naming the parameter', async () => {
      const missing = await rejection(stripe.paymentIntents.retrieve('pi_doesNotExist'));
      expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
      expect(missing).toMatchObject({ statusCode: 404, code: 'resource_missing' });
      const unknown = await rejection(stripe.customers.create({ nickname: 'x' } as never));
      expect(unknown).toMatchObject({ statusCode: 400, code: 'parameter_unknown', param: 'nickname' });
      const fraction = await rejection(stripe.paymentIntents.create({ amount: 12.5, currency: 'eur' }));
      expect(fraction).toMatchObject({ statusCode: 400, code: 'parameter_invalid_integer', param: 'amount' });
      const noCustomer = await rejection(stripe.paymentIntents.create({ amount: 1000, currency: 'eur', customer: 'cus_nobody' }));
      expect(noCustomer).toMatchObject({ statusCode: 400, code: 'resource_missing', param: 'customer' });
      const badNumber = await rejection(
        stripe.paymentMethods.create({ type: 'card', card: { number: '4242424242424241', exp_month: 1, exp_year: 2040 } }),
      );
      expect(badNumber).toMatchObject({ statusCode: 402, code: 'incorrect_number' });
      expect(badNumber.message).not.toContain('4242424242424241');
    });

    it('bad, live or missing key: 401 as StripeAuthenticationError, with the API error shape', async () => {
      const wrong = await rejection(sdkFor(fake, 'sk_test_notTheRightKey99').customers.retrieve(customer.id));
      expect(wrong).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
      expect(wrong.statusCode).toBe(401);
      expect(wrong.message).not.toContain('notTheRightKey99');
      const live = await rejection(sdkFor(fake, 'sk_live_anInventedLiveKey').customers.retrieve(customer.id));
      expect(live).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
      const res = await fetch(`${fake.url}/v1/customers/${customer.id}`);
      expect(res.status).toBe(401);
      expect(await res.json()).toEqual({
        error: { type: 'invalid_request_error', message: expect.stringContaining('did not provide an API key') },
      });
    });
  });

  describe('idempotency', () => {
    let fake: PaymentFake;
    beforeAll(async () => {
      fake = await start({ stateFile: path.join(tempDir(), 'state.json') });
    });
    const body =
      'amount=1250&currency=eur&metadata[invoice]=12&payment_method=pm_card_visa&confirm=true&automatic_payment_methods[enabled]=true&automatic_payment_methods[allow_redirects]=never';

    it('a replay with the same key and body returns the first answer byte for byte, and pays once', async () => {
      const first = await rawPost(fake, '/v1/payment_intents', body, { 'idempotency-key': 'spec-invoice-12-a' });
      const firstText = await first.text();
      const second = await rawPost(fake, '/v1/payment_intents', body, { 'idempotency-key': 'spec-invoice-12-a' });
      const secondText = await second.text();
      expect(first.status).toBe(200);
      expect(second.status).toBe(200);
      expect(secondText).toBe(firstText);
      expect(second.headers.get('idempotent-replayed')).toBe('true');
      const id = JSON.parse(firstText).id as string;
      expect(fake.events().filter((e) => e.type === 'payment_intent.succeeded' && e.data.object.id === id)).toHaveLength(1);
    });

    it('a declined payment replays its 402 byte for byte', async () => {
      const declined = body.replace('pm_card_visa', 'pm_card_chargeDeclinedInsufficientFunds');
      const first = await rawPost(fake, '/v1/payment_intents', declined, { 'idempotency-key': 'spec-invoice-13' });
      const second = await rawPost(fake, '/v1/payment_intents', declined, { 'idempotency-key': 'spec-invoice-13' });
      expect([first.status, second.status]).toEqual([402, 402]);
      expect(await second.text()).toBe(await first.text());
    });

    it('the same key with other parameters or on another endpoint: 400 idempotency_error (StripeIdempotencyError)', async () => {
      const stripe = sdkFor(fake);
      await stripe.customers.create({ email: 'a@observatory.test' }, { idempotencyKey: 'spec-customer-key' });
      const err = await rejection(stripe.customers.create({ email: 'b@observatory.test' }, { idempotencyKey: 'spec-customer-key' }));
      expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
      expect(err.statusCode).toBe(400);
      const res = await rawPost(fake, '/v1/payment_intents', body, { 'idempotency-key': 'spec-customer-key' });
      expect(res.status).toBe(400);
      expect((await res.json()).error.type).toBe('idempotency_error');
    });

    it('keys are scoped per API key; a refused request (bad parameters) is not kept, so the key can be retried', async () => {
      const a = await (await rawPost(fake, '/v1/customers', 'email=c@observatory.test', { 'idempotency-key': 'spec-scoped' })).json();
      const b = await (
        await rawPost(fake, '/v1/customers', 'email=c@observatory.test', { 'idempotency-key': 'spec-scoped' }, OTHER_KEY)
      ).json();
      expect(a.id).toMatch(/^cus_/);
      expect(b.id).toMatch(/^cus_/);
      expect(b.id).not.toBe(a.id);
      const bad = await rawPost(fake, '/v1/customers', 'email=not-an-address', { 'idempotency-key': 'spec-retry-after-fix' });
      expect(bad.status).toBe(400);
      const fixed = await rawPost(fake, '/v1/customers', 'email=d@observatory.test', { 'idempotency-key': 'spec-retry-after-fix' });
      expect(fixed.status).toBe(200);
    });

    it('concurrent requests with one key: one payment; the others replay it or get 409 idempotency_key_in_use', async () => {
      const answers = await Promise.all(
        Array.from({ length: 5 }, () =>
          rawPost(fake, '/v1/payment_intents', body, { 'idempotency-key': 'spec-concurrent' }).then(async (r) => ({
            status: r.status,
            text: await r.text(),
          })),
        ),
      );
      const ok = answers.filter((a) => a.status === 200);
      expect(ok.length).toBeGreaterThanOrEqual(1);
      expect(new Set(ok.map((a) => a.text)).size).toBe(1);
      for (const a of answers.filter((x) => x.status !== 200)) {
        expect(a.status).toBe(409);
        expect(JSON.parse(a.text).error).toMatchObject({ type: 'idempotency_error', code: 'idempotency_key_in_use' });
      }
      const id = JSON.parse(ok[0].text).id as string;
      expect(fake.events().filter((e) => e.type === 'payment_intent.created' && e.data.object.id === id)).toHaveLength(1);
    });

    it('the SDK with its default retries: two simultaneous creates with one key give one and the same payment', async () => {
      const stripe = new Stripe(KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http' });
      const params = { amount: 2600, currency: 'eur', payment_method: 'pm_card_visa', confirm: true, ...CARDS_ONLY };
      const [a, b] = await Promise.all([
        stripe.paymentIntents.create(params, { idempotencyKey: 'spec-sdk-concurrent' }),
        stripe.paymentIntents.create(params, { idempotencyKey: 'spec-sdk-concurrent' }),
      ]);
      expect(b).toEqual(a);
      expect(fake.events().filter((e) => e.type === 'payment_intent.succeeded' && e.data.object.id === a.id)).toHaveLength(1);
    });
  });

  describe('webhooks', () => {
    it('the signature scheme matches the SDK: same header as generateTestHeaderString, verified by constructEvent', () => {
      const payload = JSON.stringify({ id: 'evt_spec', object: 'event', type: 'payment_intent.succeeded' });
      const timestamp = 1_800_000_000;
      const ours = signWebhookPayload(payload, WEBHOOK_SECRET, timestamp);
      expect(ours).toBe(Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp }));
      const now = signWebhookPayload(payload, WEBHOOK_SECRET);
      expect(Stripe.webhooks.constructEvent(payload, now, WEBHOOK_SECRET).id).toBe('evt_spec');
      expect(() => Stripe.webhooks.constructEvent(payload, now, 'whsec_another')).toThrow(Stripe.errors.StripeSignatureVerificationError);
    });

    it('succeeded, failed and refunded payments are delivered signed; other event types are not sent', async () => {
      const receiver = await startReceiver();
      cleanups.push(() => receiver.close());
      const fake = await start({ webhookUrl: receiver.url });
      const stripe = sdkFor(fake);
      const pi = await stripe.paymentIntents.create({
        amount: 1250,
        currency: 'eur',
        metadata: { invoice: '21' },
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      await rejection(
        stripe.paymentIntents.create({
          amount: 1250,
          currency: 'eur',
          payment_method: 'pm_card_chargeDeclined',
          confirm: true,
          ...CARDS_ONLY,
        }),
      );
      await stripe.refunds.create({ payment_intent: pi.id, amount: 250 });
      const types = ['payment_intent.succeeded', 'payment_intent.payment_failed', 'charge.refunded'];
      for (const type of types) await fake.waitForDelivery((d) => d.eventType === type && d.status === 'succeeded');
      const events = receiver.received.map((r) => Stripe.webhooks.constructEvent(r.body, r.signature, WEBHOOK_SECRET));
      expect(events.map((e) => e.type).sort()).toEqual([...types].sort());
      const succeeded = events.find((e) => e.type === 'payment_intent.succeeded')!;
      expect(succeeded.id).toMatch(/^evt_/);
      expect(succeeded.data.object).toMatchObject({ id: pi.id, status: 'succeeded', metadata: { invoice: '21' } });
      const refunded = events.find((e) => e.type === 'charge.refunded') as Stripe.ChargeRefundedEvent;
      expect(refunded.data.object).toMatchObject({ id: pi.latest_charge, amount_refunded: 250 });
      expect(refunded.data.previous_attributes).toEqual({ amount_refunded: 0, refunded: false });
      const failed = events.find((e) => e.type === 'payment_intent.payment_failed') as Stripe.PaymentIntentPaymentFailedEvent;
      expect(failed.data.object.last_payment_error?.decline_code).toBe('generic_decline');
      expect(fake.events().some((e) => e.type === 'payment_intent.created')).toBe(true);
    });

    it('retries with exponential backoff until the receiver answers 2xx (500, 500, then 200)', async () => {
      const receiver = await startReceiver([500, 500]);
      cleanups.push(() => receiver.close());
      const fake = await start({ webhookUrl: receiver.url });
      const pi = await sdkFor(fake).paymentIntents.create({
        amount: 700,
        currency: 'eur',
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      const delivery = await fake.waitForDelivery((d) => d.status === 'succeeded');
      expect(delivery.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
      const at = delivery.attempts.map((a) => Date.parse(a.at));
      // Waits of base, then 2 × base (worked by hand from the backoff rule); a little slack for timer granularity.
      expect(at[1] - at[0]).toBeGreaterThanOrEqual(RETRY_BASE_MS - 5);
      expect(at[2] - at[1]).toBeGreaterThanOrEqual(2 * RETRY_BASE_MS - 5);
      expect(receiver.received).toHaveLength(3);
      expect(new Set(receiver.received.map((r) => r.body)).size).toBe(1);
      expect(JSON.parse(receiver.received[2].body).data.object.id).toBe(pi.id);
    });

    it('control surface: pause keeps deliveries pending, resume sends them; fail-next fails the next send without calling the receiver', async () => {
      const receiver = await startReceiver();
      cleanups.push(() => receiver.close());
      const fake = await start({ webhookUrl: receiver.url });
      const control = (p: string, body?: object) =>
        fetch(`${fake.url}/_fake${p}`, {
          method: body ? 'POST' : 'GET',
          headers: { authorization: `Bearer ${KEY}`, 'content-type': 'application/json' },
          body: body ? JSON.stringify(body) : undefined,
        });
      expect((await fetch(`${fake.url}/_fake/deliveries`)).status).toBe(401);
      expect((await control('/webhooks/pause', {})).status).toBe(200);
      const stripe = sdkFor(fake);
      await stripe.paymentIntents.create({ amount: 800, currency: 'eur', payment_method: 'pm_card_visa', confirm: true, ...CARDS_ONLY });
      await new Promise((r) => setTimeout(r, 3 * RETRY_BASE_MS));
      let list = await (await control('/deliveries')).json();
      expect(list).toMatchObject({ paused: true, pending: 1 });
      expect(list.data[0].attempts).toEqual([]);
      expect(receiver.received).toHaveLength(0);
      await control('/webhooks/resume', {});
      await fake.waitForDelivery((d) => d.status === 'succeeded');
      expect(receiver.received).toHaveLength(1);

      expect((await control('/webhooks/fail-next', { count: 1 })).status).toBe(200);
      const second = await stripe.paymentIntents.create({
        amount: 900,
        currency: 'eur',
        payment_method: 'pm_card_visa',
        confirm: true,
        ...CARDS_ONLY,
      });
      const delivery = await fake.waitForDelivery((d) => d.status === 'succeeded' && JSON.parse(d.payload).data.object.id === second.id);
      expect(delivery.attempts.map((a) => a.simulated)).toEqual([true, false]);
      expect(receiver.received).toHaveLength(2);
      list = await (await control('/events?type=payment_intent.succeeded')).json();
      expect(list.data.map((e: { data: { object: { id: string } } }) => e.data.object.id)).toContain(second.id);
    });
  });

  describe('persistence', () => {
    it('a restart with the same state file keeps objects and idempotency records, resumes pending deliveries, and stores no card number', async () => {
      const dir = tempDir();
      const stateFile = path.join(dir, 'payment-fake.json');
      const receiver = await startReceiver();
      cleanups.push(() => receiver.close());
      // First run: the app is "down" (webhooks paused) when the payment succeeds.
      const first = await start({ stateFile, webhookUrl: receiver.url, webhooksPaused: true });
      let stripe = sdkFor(first);
      const customer = await stripe.customers.create({ email: 'billing@observatory.test' });
      const numbers = ['4242424242424242', '4000000000000002', '4000000000009995', '4000002760003184'];
      for (const number of numbers)
        await stripe.paymentMethods.create({ type: 'card', card: { number, exp_month: 3, exp_year: 2043, cvc: '737' } });
      const replayBody =
        'amount=4200&currency=eur&payment_method_data[type]=card&payment_method_data[card][number]=4242424242424242&payment_method_data[card][exp_month]=3&payment_method_data[card][exp_year]=2043&payment_method_data[card][cvc]=737&confirm=true&allowed_payment_method_types[0]=card';
      const firstAnswer = await (await rawPost(first, '/v1/payment_intents', replayBody, { 'idempotency-key': 'spec-restart' })).text();
      const pi = JSON.parse(firstAnswer) as Stripe.PaymentIntent;
      expect(pi.status).toBe('succeeded');
      expect(first.deliveries()).toEqual([expect.objectContaining({ status: 'pending', attemptCount: 0 })]);
      await first.close();

      const saved = readFileSync(stateFile, 'utf8');
      for (const number of numbers) expect(saved).not.toContain(number);
      expect(saved).not.toMatch(/"(cvc|exp_month|exp_year|number)"/);
      expect(saved).toContain('"last4":"9995"');
      expect(saved).not.toContain(KEY);
      expect(statSync(stateFile).mode & 0o777).toBe(0o600);
      expect(readdirSync(dir)).toEqual(['payment-fake.json']);

      // Second run on a new port: everything is still there, and the pending webhook goes out.
      const second = await start({ stateFile, webhookUrl: receiver.url });
      stripe = sdkFor(second);
      expect(await stripe.customers.retrieve(customer.id)).toMatchObject({ id: customer.id, email: 'billing@observatory.test' });
      expect(await stripe.paymentIntents.retrieve(pi.id)).toEqual(pi);
      const delivery = await second.waitForDelivery((d) => d.status === 'succeeded');
      expect(JSON.parse(delivery.payload).data.object.id).toBe(pi.id);
      expect(Stripe.webhooks.constructEvent(receiver.received[0].body, receiver.received[0].signature, WEBHOOK_SECRET).type).toBe(
        'payment_intent.succeeded',
      );
      const replay = await rawPost(second, '/v1/payment_intents', replayBody, { 'idempotency-key': 'spec-restart' });
      expect(await replay.text()).toBe(firstAnswer);
    });
  });
});
