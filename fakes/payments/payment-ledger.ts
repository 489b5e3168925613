import { randomBytes } from 'node:crypto';
import { ApiError, applyMetadata, DOCS, invalidParam, invalidState, missingReference, notFound, Params } from './api-params';
import type { ApiObject, FakeEvent, FakeStateData, StoredPaymentMethod } from './fake-state';
import {
  AUTHENTICATION_REQUIRED,
  passesLuhn,
  testCardByNumber,
  testCardByPaymentMethod,
  type CardBehaviour,
  type TestCard,
} from './test-cards';

const ALPHABET = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789';

/** A new object id in the provider's style: prefix, underscore, random letters and digits. */
export function newId(prefix: string, length = 24): string {
  let s = '';
  for (const b of randomBytes(length)) s += ALPHABET[b % ALPHABET.length];
  return `${prefix}_${s}`;
}

const nowSeconds = () => Math.floor(Date.now() / 1000);

/** The request behind a change, for the `request` member of the events it causes. */
export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
  apiVersion: string;
}

export type PaymentIntentStatus =
  'requires_payment_method' | 'requires_confirmation' | 'requires_action' | 'processing' | 'requires_capture' | 'canceled' | 'succeeded';

type PaymentIntentObject = ApiObject & {
  amount: number;
  currency: string;
  customer: string | null;
  description: string | null;
  metadata: Record<string, string>;
  status: PaymentIntentStatus;
  payment_method: string | null;
  latest_charge: string | null;
  automatic_payment_methods: { enabled: boolean; allow_redirects?: string } | null;
  receipt_email: string | null;
  statement_descriptor: string | null;
  statement_descriptor_suffix: string | null;
};

type ChargeObject = ApiObject & {
  amount: number;
  amount_refunded: number;
  currency: string;
  status: string;
  payment_intent: string | null;
};

/** Smallest amount per currency in minor units (the provider's "minimum and maximum charge amounts"). */
const MINIMUM_AMOUNT: Record<string, number> = {
  usd: 50,
  eur: 50,
  gbp: 30,
  chf: 50,
  cad: 50,
  aud: 50,
  nzd: 50,
  sek: 300,
  nok: 300,
  dkk: 250,
  jpy: 50,
};
const ZERO_DECIMAL = new Set([
  'jpy',
  'krw',
  'vnd',
  'clp',
  'isk',
  'ugx',
  'xaf',
  'xof',
  'pyg',
  'rwf',
  'kmf',
  'gnf',
  'bif',
  'djf',
  'mga',
  'vuv',
  'xpf',
]);
const MAXIMUM_AMOUNT = 99_999_999;

function formatAmount(amount: number, currency: string): string {
  return ZERO_DECIMAL.has(currency) ? `${amount} ${currency}` : `${(amount / 100).toFixed(2)} ${currency}`;
}

const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;
const CANCELABLE: PaymentIntentStatus[] = [
  'requires_payment_method',
  'requires_capture',
  'requires_confirmation',
  'requires_action',
  'processing',
];
const UNFINISHED: PaymentIntentStatus[] = ['requires_payment_method', 'requires_confirmation', 'requires_action'];

// Parameters the fake models, per endpoint. Any other parameter is refused: those the provider
// knows (listed from the SDK's types) with a message saying the fake does not model them, so
// that the app never relies on a parameter the fake silently ignores.
const CUSTOMER_PARAMS = ['description', 'email', 'expand', 'metadata', 'name', 'phone'];
const CUSTOMER_KNOWN = [
  'address',
  'balance',
  'business_name',
  'cash_balance',
  'default_source',
  'individual_name',
  'invoice_prefix',
  'invoice_settings',
  'next_invoice_sequence',
  'payment_method',
  'preferred_locales',
  'shipping',
  'source',
  'tax',
  'tax_exempt',
  'tax_id_data',
  'test_clock',
  'validate',
];
const CONFIRM_PARAMS = [
  'error_on_requires_action',
  'expand',
  'off_session',
  'payment_method',
  'payment_method_data',
  'receipt_email',
  'return_url',
  'setup_future_usage',
  'use_stripe_sdk',
];
const PAYMENT_INTENT_PARAMS = [
  ...CONFIRM_PARAMS,
  'allowed_payment_method_types',
  'amount',
  'automatic_payment_methods',
  'capture_method',
  'confirm',
  'confirmation_method',
  'currency',
  'customer',
  'description',
  'metadata',
  'payment_method_types',
  'statement_descriptor',
  'statement_descriptor_suffix',
];
const PAYMENT_INTENT_KNOWN = [
  'amount_details',
  'amount_to_confirm',
  'application_fee_amount',
  'confirmation_token',
  'customer_account',
  'excluded_payment_method_types',
  'hooks',
  'mandate',
  'mandate_data',
  'on_behalf_of',
  'payment_details',
  'payment_method_configuration',
  'payment_method_options',
  'radar_options',
  'shipping',
  'transfer_data',
  'transfer_group',
];
const UPDATE_PARAMS = [
  'amount',
  'currency',
  'customer',
  'description',
  'expand',
  'metadata',
  'payment_method',
  'payment_method_data',
  'receipt_email',
  'setup_future_usage',
  'statement_descriptor',
  'statement_descriptor_suffix',
];
const REFUND_PARAMS = ['amount', 'charge', 'expand', 'metadata', 'payment_intent', 'reason'];
const REFUND_KNOWN = ['currency', 'customer', 'instructions_email', 'origin', 'refund_application_fee', 'reverse_transfer'];
const PAYMENT_METHOD_DATA_PARAMS = ['type', 'card', 'billing_details', 'metadata'];

function refuse(p: Params, modelled: readonly string[], known: readonly string[] = []): void {
  for (const key of Object.keys(p.hash)) {
    if (modelled.includes(key)) continue;
    if (known.includes(key))
      throw invalidParam(
        `The payment fake does not model the parameter ${p.name(key)} (the provider accepts it): extend fakes/payments before relying on it`,
        p.name(key),
        'parameter_unknown',
      );
    throw invalidParam(`Received unknown parameter: ${p.name(key)}`, p.name(key), 'parameter_unknown');
  }
}

function cardError(status: number, code: string, message: string, param: string | undefined, declineCode?: string): ApiError {
  return new ApiError(
    status,
    { type: 'card_error', code, decline_code: declineCode, message, param, doc_url: `${DOCS}/${code.replaceAll('_', '-')}` },
    false,
  );
}

export interface LedgerOptions {
  /** The fake's own URL (for next_action links). */
  baseUrl: () => string;
  /** The API version of events caused without a request (authentication finished on the control surface). */
  defaultApiVersion: string;
  /** Called for every new event, after it is stored (the webhook sender queues its delivery). */
  onEvent: (event: FakeEvent) => void;
}

/**
 * The provider's objects and their life cycle, on the fake's state: customers, card
 * PaymentMethods (brand and last four digits only), PaymentIntents with their charges, refunds,
 * and the events they cause. Methods take decoded parameters, change the state and return the
 * object to answer with, or throw an ApiError (a declined card throws after recording the
 * failed charge, as the provider does).
 */
export class PaymentLedger {
  constructor(
    private readonly state: FakeStateData,
    private readonly options: LedgerOptions,
  ) {}

  // ---- customers ----

  createCustomer(p: Params, ctx: RequestContext): ApiObject {
    refuse(p, CUSTOMER_PARAMS, CUSTOMER_KNOWN);
    const email = this.email(p);
    const customer: ApiObject = {
      id: newId('cus', 14),
      object: 'customer',
      address: null,
      balance: 0,
      created: nowSeconds(),
      currency: null,
      default_source: null,
      delinquent: false,
      description: p.clearableString('description', 350) ?? null,
      discount: null,
      email: email ?? null,
      invoice_prefix: randomBytes(4).toString('hex').toUpperCase(),
      invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
      livemode: false,
      metadata: applyMetadata({}, p.metadata()),
      name: p.clearableString('name', 256) ?? null,
      next_invoice_sequence: 1,
      phone: p.clearableString('phone', 20) ?? null,
      preferred_locales: [],
      shipping: null,
      tax_exempt: 'none',
      test_clock: null,
    };
    this.state.customers[customer.id] = customer;
    this.emit('customer.created', customer, ctx);
    return this.expand(customer, p);
  }

  retrieveCustomer(id: string, p: Params): ApiObject {
    refuse(p, ['expand']);
    return this.expand(this.customer(id), p);
  }

  updateCustomer(id: string, p: Params, ctx: RequestContext): ApiObject {
    refuse(p, CUSTOMER_PARAMS, CUSTOMER_KNOWN);
    const customer = this.customer(id);
    const email = this.email(p);
    const previous: Record<string, unknown> = {};
    const set = (field: string, value: unknown) => {
      if (value === undefined) return;
      previous[field] = customer[field];
      customer[field] = value;
    };
    set('email', email);
    set('name', p.clearableString('name', 256));
    set('description', p.clearableString('description', 350));
    set('phone', p.clearableString('phone', 20));
    const metadata = p.metadata();
    if (metadata) set('metadata', applyMetadata(customer.metadata as Record<string, string>, metadata));
    this.emit('customer.updated', customer, ctx, previous);
    return this.expand(customer, p);
  }

  private email(p: Params): string | null | undefined {
    const email = p.clearableString('email', 512);
    if (email && !EMAIL.test(email)) throw invalidParam(`Invalid email address: ${email}`, 'email', 'email_invalid');
    return email;
  }

  private customer(id: string): ApiObject {
    const c = this.state.customers[id];
    if (!c) throw notFound('customer', id);
    return c;
  }

  // ---- payment methods ----

  createPaymentMethod(p: Params, ctx: RequestContext): ApiObject {
    refuse(p, ['type', 'card', 'billing_details', 'metadata', 'expand']);
    const stored = this.paymentMethodFromData(p);
    this.emit('payment_method.created', stored.object, ctx);
    return this.expand(stored.object, p);
  }

  retrievePaymentMethod(id: string, p: Params): ApiObject {
    refuse(p, ['expand']);
    const pm = this.state.paymentMethods[id];
    if (!pm) throw notFound('PaymentMethod', id);
    return this.expand(pm.object, p);
  }

  /** A card PaymentMethod from `type`, `card[…]`, `billing_details[…]`, `metadata[…]`; keeps only brand and last four digits. */
  private paymentMethodFromData(p: Params): StoredPaymentMethod {
    const type = p.string('type', { required: true });
    if (type !== 'card') throw invalidParam(`The payment fake supports only card payment methods, not ${type}`, p.name('type'));
    const card = p.nested('card');
    if (!card) throw invalidParam(`Missing required param: ${p.name('card')}.`, p.name('card'), 'parameter_missing');
    const testCard = this.testCardFrom(card);
    return this.storePaymentMethod(testCard, card.has('cvc'), p.nested('billing_details'), applyMetadata({}, p.metadata()));
  }

  /**
   * Checks the card fields as the provider does (number by the Luhn check, expiry not past, CVC
   * digits) and finds the test card; the fields themselves go no further than this function.
   */
  private testCardFrom(card: Params): TestCard {
    refuse(card, ['number', 'exp_month', 'exp_year', 'cvc', 'token']);
    const token = card.string('token');
    if (token !== undefined) {
      const found = testCardByPaymentMethod(token.replace(/^tok_/, 'pm_card_'));
      if (!token.startsWith('tok_') || !found) throw missingReference('token', token, card.name('token'));
      return found;
    }
    const number = card.string('number', { required: true })!.replace(/[\s-]/g, '');
    if (!/^\d{12,19}$/.test(number) || !passesLuhn(number))
      throw cardError(402, 'incorrect_number', 'Your card number is incorrect.', card.name('number'));
    const month = card.integer('exp_month', { required: true })!;
    if (month < 1 || month > 12)
      throw cardError(402, 'invalid_expiry_month', "Your card's expiration month is invalid.", card.name('exp_month'));
    let year = card.integer('exp_year', { required: true })!;
    if (year < 100) year += 2000;
    const now = new Date();
    const thisMonth = now.getUTCFullYear() * 12 + now.getUTCMonth() + 1;
    if (year > 9999 || year * 12 + month < thisMonth)
      throw cardError(402, 'invalid_expiry_year', "Your card's expiration year is invalid.", card.name('exp_year'));
    const cvc = card.string('cvc');
    if (cvc !== undefined && !/^\d{3,4}$/.test(cvc))
      throw cardError(402, 'invalid_cvc', "Your card's security code is invalid.", card.name('cvc'));
    const found = testCardByNumber(number);
    if (!found)
      throw cardError(
        402,
        'card_declined',
        'Your card was declined. Your request was in test mode, but used a non test (live) card. For a list of valid test cards, visit: https://docs.stripe.com/testing.',
        undefined,
        'test_mode_live_card',
      );
    return found;
  }

  private storePaymentMethod(
    card: TestCard,
    cvcGiven: boolean,
    billing: Params | undefined,
    metadata: Record<string, string>,
  ): StoredPaymentMethod {
    if (billing) refuse(billing, ['name', 'email', 'phone']);
    const object: ApiObject = {
      id: newId('pm'),
      object: 'payment_method',
      allow_redisplay: 'unspecified',
      billing_details: {
        address: null,
        email: billing?.clearableString('email', 800) ?? null,
        name: billing?.clearableString('name', 256) ?? null,
        phone: billing?.clearableString('phone', 20) ?? null,
        tax_id: null,
      },
      // Brand and last four digits only: the number, expiry and CVC are never kept.
      card: {
        brand: card.brand,
        checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: cvcGiven ? 'unchecked' : null },
        country: card.country,
        display_brand: card.brand === 'amex' ? 'american_express' : card.brand,
        funding: card.funding,
        generated_from: null,
        last4: card.number.slice(-4),
        networks: { available: [card.brand], preferred: null },
        regulated_status: 'unregulated',
        three_d_secure_usage: { supported: true },
        wallet: null,
      },
      created: nowSeconds(),
      customer: null,
      customer_account: null,
      livemode: false,
      metadata,
      type: 'card',
    };
    const stored = { object, behaviour: card.behaviour };
    this.state.paymentMethods[object.id] = stored;
    return stored;
  }

  /** The PaymentMethod named by `payment_method` (a stored one, or a test id such as pm_card_visa) or given by `payment_method_data`. */
  private resolvePaymentMethod(p: Params): StoredPaymentMethod | undefined {
    const id = p.string('payment_method');
    const data = p.nested('payment_method_data');
    if (id && data)
      throw invalidParam(
        'You may only specify one of these parameters: payment_method, payment_method_data.',
        'payment_method',
        'parameters_exclusive',
      );
    if (data) {
      refuse(data, PAYMENT_METHOD_DATA_PARAMS);
      return this.paymentMethodFromData(data);
    }
    if (!id) return undefined;
    const stored = this.state.paymentMethods[id];
    if (stored) return stored;
    // A test PaymentMethod id stands for a new PaymentMethod with that card, each time it is used.
    const testCard = testCardByPaymentMethod(id);
    if (testCard) return this.storePaymentMethod(testCard, false, undefined, {});
    throw missingReference('PaymentMethod', id, 'payment_method');
  }

  // ---- payment intents ----

  createPaymentIntent(p: Params, ctx: RequestContext): ApiObject {
    refuse(p, PAYMENT_INTENT_PARAMS, PAYMENT_INTENT_KNOWN);
    const amount = p.integer('amount', { required: true })!;
    const currency = this.currency(p);
    this.checkAmount(amount, currency);
    const customer = p.string('customer') || null;
    if (customer && !this.state.customers[customer]) throw missingReference('customer', customer, 'customer');
    const confirm = p.boolean('confirm') ?? false;
    const types = p.strings('allowed_payment_method_types') ?? p.strings('payment_method_types');
    if (types && (types.length === 0 || types.some((t) => t !== 'card')))
      throw invalidParam(
        'The payment fake supports only card payments: allowed_payment_method_types must be [card]',
        'allowed_payment_method_types',
      );
    const automatic = p.nested('automatic_payment_methods');
    let automaticPaymentMethods: PaymentIntentObject['automatic_payment_methods'] = null;
    if (automatic) {
      refuse(automatic, ['enabled', 'allow_redirects']);
      const enabled = automatic.boolean('enabled');
      if (enabled === undefined)
        throw invalidParam(
          'Missing required param: automatic_payment_methods[enabled].',
          'automatic_payment_methods[enabled]',
          'parameter_missing',
        );
      const allowRedirects = automatic.enumeration('allow_redirects', ['always', 'never'] as const) ?? 'always';
      if (enabled && types)
        throw invalidParam(
          'You may only specify one of these parameters: automatic_payment_methods, allowed_payment_method_types.',
          'automatic_payment_methods',
          'parameters_exclusive',
        );
      automaticPaymentMethods = enabled ? { allow_redirects: allowRedirects, enabled: true } : null;
    } else if (!types) {
      // The provider's default since its 2023-08-16 version: the Dashboard's payment methods, redirects allowed.
      automaticPaymentMethods = { allow_redirects: 'always', enabled: true };
    }
    const captureMethod = p.enumeration('capture_method', ['automatic', 'automatic_async', 'manual'] as const) ?? 'automatic_async';
    if (captureMethod === 'manual')
      throw invalidParam('The payment fake does not model capture_method=manual (separate capture)', 'capture_method');
    const confirmationMethod = p.enumeration('confirmation_method', ['automatic', 'manual'] as const) ?? 'automatic';
    const receiptEmail = p.string('receipt_email', { max: 800 });
    if (receiptEmail && !EMAIL.test(receiptEmail))
      throw invalidParam(`Invalid email address: ${receiptEmail}`, 'receipt_email', 'email_invalid');
    const setupFutureUsage = p.enumeration('setup_future_usage', ['off_session', 'on_session'] as const) ?? null;
    const confirmOptions = this.confirmOptions(p, automaticPaymentMethods, confirm);
    if (!confirm) {
      for (const only of ['return_url', 'off_session', 'error_on_requires_action', 'use_stripe_sdk'])
        if (p.has(only)) throw invalidParam(`You can only pass ${only} when confirm=true.`, only);
    }
    const metadata = applyMetadata({}, p.metadata());
    const description = p.string('description', { max: 1000 }) ?? null;
    const statementDescriptor = p.string('statement_descriptor', { max: 22 }) ?? null;
    const statementSuffix = p.string('statement_descriptor_suffix', { max: 22 }) ?? null;
    // The PaymentMethod is made last: every parameter has been checked before anything is stored.
    const pm = this.resolvePaymentMethod(p);
    if (confirm && !pm)
      throw invalidParam(
        'You cannot confirm this PaymentIntent because it is missing a payment method: pass payment_method or payment_method_data.',
        'payment_method',
        'parameter_missing',
      );
    const id = newId('pi');
    const pi: PaymentIntentObject = {
      id,
      object: 'payment_intent',
      allowed_payment_method_types: types ? ['card'] : null,
      amount,
      amount_capturable: 0,
      amount_details: { tip: {} },
      amount_received: 0,
      application: null,
      application_fee_amount: null,
      automatic_payment_methods: automaticPaymentMethods,
      canceled_at: null,
      cancellation_reason: null,
      capture_method: captureMethod,
      client_secret: `${id}_secret_${newId('x', 25).slice(2)}`,
      confirmation_method: confirmationMethod,
      created: nowSeconds(),
      currency,
      customer,
      customer_account: null,
      description,
      excluded_payment_method_types: null,
      last_payment_error: null,
      latest_charge: null,
      livemode: false,
      metadata,
      next_action: null,
      on_behalf_of: null,
      payment_method: pm?.object.id ?? null,
      payment_method_configuration_details: null,
      payment_method_options: { card: { installments: null, mandate_options: null, network: null, request_three_d_secure: 'automatic' } },
      payment_method_types: ['card'],
      processing: null,
      receipt_email: receiptEmail ?? null,
      review: null,
      setup_future_usage: setupFutureUsage,
      shipping: null,
      source: null,
      statement_descriptor: statementDescriptor,
      statement_descriptor_suffix: statementSuffix,
      status: pm ? 'requires_confirmation' : 'requires_payment_method',
      transfer_data: null,
      transfer_group: null,
    };
    this.state.paymentIntents[id] = pi;
    this.emit('payment_intent.created', pi, ctx);
    if (confirm) this.runConfirmation(pi, pm!, confirmOptions, ctx);
    return this.expand(pi, p);
  }

  retrievePaymentIntent(id: string, p: Params): ApiObject {
    refuse(p, ['expand', 'client_secret']);
    return this.expand(this.paymentIntent(id), p);
  }

  updatePaymentIntent(id: string, p: Params, _ctx: RequestContext): ApiObject {
    refuse(p, UPDATE_PARAMS, PAYMENT_INTENT_KNOWN);
    const pi = this.paymentIntent(id);
    if (pi.status === 'canceled')
      throw invalidState('You cannot update this PaymentIntent because it has a status of canceled.', 'payment_intent_unexpected_state');
    const paymentChange = ['amount', 'currency', 'customer', 'payment_method', 'payment_method_data'].filter((k) => p.has(k));
    if (paymentChange.length && !UNFINISHED.includes(pi.status))
      throw invalidState(
        `You cannot update ${paymentChange.join(', ')} of this PaymentIntent because it has a status of ${pi.status}.`,
        'payment_intent_unexpected_state',
        paymentChange[0],
      );
    const amount = p.integer('amount');
    const currency = p.has('currency') ? this.currency(p) : pi.currency;
    if (amount !== undefined || p.has('currency')) this.checkAmount(amount ?? pi.amount, currency);
    const customer = p.string('customer');
    if (customer && !this.state.customers[customer]) throw missingReference('customer', customer, 'customer');
    const receiptEmail = p.clearableString('receipt_email', 800);
    if (receiptEmail && !EMAIL.test(receiptEmail))
      throw invalidParam(`Invalid email address: ${receiptEmail}`, 'receipt_email', 'email_invalid');
    const description = p.clearableString('description', 1000);
    const metadata = p.metadata();
    const setupFutureUsage = p.enumeration('setup_future_usage', ['off_session', 'on_session'] as const);
    const statementDescriptor = p.clearableString('statement_descriptor', 22);
    const statementSuffix = p.clearableString('statement_descriptor_suffix', 22);
    const pm = this.resolvePaymentMethod(p);
    const previous: Record<string, unknown> = {};
    const set = (field: string, value: unknown) => {
      if (value === undefined) return;
      previous[field] = pi[field];
      pi[field] = value;
    };
    set('amount', amount);
    if (p.has('currency')) set('currency', currency);
    set('customer', customer === '' ? null : customer);
    set('receipt_email', receiptEmail);
    set('description', description);
    if (metadata) set('metadata', applyMetadata(pi.metadata, metadata));
    set('setup_future_usage', setupFutureUsage);
    set('statement_descriptor', statementDescriptor);
    set('statement_descriptor_suffix', statementSuffix);
    if (pm) set('payment_method', pm.object.id);
    // A change to what is paid, or how, needs a new confirmation.
    if (paymentChange.length) {
      set('next_action', null);
      set('status', pi.payment_method ? 'requires_confirmation' : 'requires_payment_method');
    }
    return this.expand(pi, p);
  }

  confirmPaymentIntent(id: string, p: Params, ctx: RequestContext): ApiObject {
    refuse(p, CONFIRM_PARAMS, PAYMENT_INTENT_KNOWN);
    const pi = this.paymentIntent(id);
    if (pi.status === 'succeeded')
      throw invalidState('You cannot confirm this PaymentIntent because it has already succeeded after being previously confirmed.');
    if (!UNFINISHED.includes(pi.status))
      throw invalidState(
        `You cannot confirm this PaymentIntent because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be confirmed: ${UNFINISHED.join(', ')}.`,
      );
    const options = this.confirmOptions(p, pi.automatic_payment_methods, true);
    const receiptEmail = p.string('receipt_email', { max: 800 });
    if (receiptEmail && !EMAIL.test(receiptEmail))
      throw invalidParam(`Invalid email address: ${receiptEmail}`, 'receipt_email', 'email_invalid');
    const setupFutureUsage = p.enumeration('setup_future_usage', ['off_session', 'on_session'] as const);
    const pm = this.resolvePaymentMethod(p) ?? (pi.payment_method ? this.state.paymentMethods[pi.payment_method] : undefined);
    if (!pm)
      throw invalidState(
        "You cannot confirm this PaymentIntent because it's missing a payment method. Update the PaymentIntent with a payment_method, or pass payment_method or payment_method_data when confirming.",
      );
    if (receiptEmail) pi.receipt_email = receiptEmail;
    if (setupFutureUsage) pi.setup_future_usage = setupFutureUsage;
    this.runConfirmation(pi, pm, options, ctx);
    return this.expand(pi, p);
  }

  cancelPaymentIntent(id: string, p: Params, ctx: RequestContext): ApiObject {
    refuse(p, ['cancellation_reason', 'expand']);
    const pi = this.paymentIntent(id);
    const reason = p.enumeration('cancellation_reason', ['abandoned', 'duplicate', 'fraudulent', 'requested_by_customer'] as const) ?? null;
    if (!CANCELABLE.includes(pi.status))
      throw invalidState(
        `You cannot cancel this PaymentIntent because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be canceled: ${CANCELABLE.join(', ')}.`,
      );
    pi.status = 'canceled';
    pi.canceled_at = nowSeconds();
    pi.cancellation_reason = reason;
    pi.next_action = null;
    this.emit('payment_intent.canceled', pi, ctx);
    return this.expand(pi, p);
  }

  listPaymentIntents(p: Params): ApiObject {
    refuse(p, ['customer', 'limit', 'starting_after', 'expand']);
    const customer = p.string('customer');
    const all = Object.values(this.state.paymentIntents).filter((pi) => !customer || pi.customer === customer);
    return this.list(all, p, '/v1/payment_intents');
  }

  /**
   * Finishes the authentication a `requires_action` PaymentIntent waits for (the fake's control
   * surface: what the customer's bank page would do): success charges the card; failure leaves
   * the PaymentIntent waiting for another payment method, with the provider's error.
   */
  completeAuthentication(id: string, outcome: 'succeed' | 'fail'): ApiObject {
    const pi = this.paymentIntent(id);
    if (pi.status !== 'requires_action')
      throw invalidState(`This PaymentIntent has a status of ${pi.status}, not requires_action: there is no authentication to complete.`);
    const pm = this.state.paymentMethods[pi.payment_method ?? ''];
    if (!pm) throw invalidState('This PaymentIntent has no payment method to authenticate.');
    const ctx = null;
    pi.next_action = null;
    if (outcome === 'succeed') {
      this.succeed(pi, pm, ctx);
    } else {
      pi.status = 'requires_payment_method';
      pi.payment_method = null;
      pi.last_payment_error = {
        code: 'payment_intent_authentication_failure',
        doc_url: `${DOCS}/payment-intent-authentication-failure`,
        message:
          'The provided PaymentMethod has failed authentication. You can provide payment_method_data or a new PaymentMethod to attempt to fulfill this PaymentIntent again.',
        payment_method: structuredClone(pm.object),
        payment_method_type: 'card',
        type: 'invalid_request_error',
      };
      this.emit('payment_intent.payment_failed', pi, ctx);
    }
    return pi;
  }

  private paymentIntent(id: string): PaymentIntentObject {
    const pi = this.state.paymentIntents[id];
    if (!pi) throw notFound('payment_intent', id);
    return pi as PaymentIntentObject;
  }

  private currency(p: Params): string {
    const raw = p.string('currency', { required: true })!;
    const currency = raw.toLowerCase();
    if (!/^[a-z]{3}$/.test(currency))
      throw invalidParam(`Invalid currency: ${raw}. Currencies are three-letter ISO codes in lowercase.`, 'currency');
    return currency;
  }

  private checkAmount(amount: number, currency: string): void {
    const minimum = MINIMUM_AMOUNT[currency] ?? 50;
    if (amount < minimum) throw invalidParam(`Amount must be at least ${formatAmount(minimum, currency)}`, 'amount', 'amount_too_small');
    if (amount > MAXIMUM_AMOUNT)
      throw invalidParam(`Amount must be no more than ${formatAmount(MAXIMUM_AMOUNT, currency)}`, 'amount', 'amount_too_large');
  }

  /** The confirmation parameters; `confirming` is false for a PaymentIntent created without confirm=true. */
  private confirmOptions(p: Params, automatic: PaymentIntentObject['automatic_payment_methods'], confirming: boolean) {
    const returnUrl = p.string('return_url', { max: 2048 }) || null;
    if (returnUrl) {
      let ok = false;
      try {
        ok = ['http:', 'https:'].includes(new URL(returnUrl).protocol);
      } catch {
        ok = false;
      }
      if (!ok) throw invalidParam('Not a valid URL', 'return_url', 'url_invalid');
    }
    const offSession = p.boolean('off_session') ?? false;
    const errorOnRequiresAction = p.boolean('error_on_requires_action') ?? false;
    p.boolean('use_stripe_sdk');
    if (confirming && automatic?.enabled && automatic.allow_redirects !== 'never' && !returnUrl)
      throw invalidParam(
        'This PaymentIntent accepts payment methods that may redirect the customer away from your page, so confirming it needs a return_url. ' +
          'To accept cards only, create it with automatic_payment_methods[enabled]=true and automatic_payment_methods[allow_redirects]=never, ' +
          'or with allowed_payment_method_types[0]=card.',
        'return_url',
      );
    return { returnUrl, offSession, errorOnRequiresAction };
  }

  /** Confirms with the card: success, decline (throws 402 after recording the failed charge) or requires_action. */
  private runConfirmation(
    pi: PaymentIntentObject,
    pm: StoredPaymentMethod,
    options: ReturnType<PaymentLedger['confirmOptions']>,
    ctx: RequestContext,
  ): void {
    pi.payment_method = pm.object.id;
    pi.last_payment_error = null;
    pi.next_action = null;
    let behaviour: CardBehaviour = pm.behaviour;
    // A payment that needs authentication fails at once when the customer is away or the app asked not to be sent to it.
    if (behaviour.kind === 'authenticate' && (options.offSession || options.errorOnRequiresAction)) behaviour = AUTHENTICATION_REQUIRED;
    if (behaviour.kind === 'succeed') return this.succeed(pi, pm, ctx);
    if (behaviour.kind === 'decline') return this.decline(pi, pm, behaviour, ctx);
    const url = `${this.options.baseUrl()}/_fake/payment_intents/${pi.id}/authenticate`;
    pi.status = 'requires_action';
    pi.next_action = options.returnUrl
      ? { type: 'redirect_to_url', redirect_to_url: { return_url: options.returnUrl, url } }
      : { type: 'use_stripe_sdk', use_stripe_sdk: { type: 'three_d_secure_redirect', stripe_js: url, source: newId('src') } };
    this.emit('payment_intent.requires_action', pi, ctx);
  }

  private succeed(pi: PaymentIntentObject, pm: StoredPaymentMethod, ctx: RequestContext | null): void {
    const charge = this.newCharge(pi, pm, null);
    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    pi.latest_charge = charge.id;
    pi.last_payment_error = null;
    this.emit('charge.succeeded', charge, ctx);
    this.emit('payment_intent.succeeded', pi, ctx);
  }

  private decline(
    pi: PaymentIntentObject,
    pm: StoredPaymentMethod,
    behaviour: Extract<CardBehaviour, { kind: 'decline' }>,
    ctx: RequestContext,
  ): never {
    const charge = this.newCharge(pi, pm, behaviour);
    const error = {
      charge: charge.id,
      code: behaviour.code,
      decline_code: behaviour.declineCode,
      doc_url: `${DOCS}/${behaviour.code.replaceAll('_', '-')}`,
      message: behaviour.message,
      payment_method: structuredClone(pm.object),
      payment_method_type: 'card',
      type: 'card_error' as const,
    };
    pi.status = 'requires_payment_method';
    pi.payment_method = null;
    pi.latest_charge = charge.id;
    pi.last_payment_error = error;
    this.emit('charge.failed', charge, ctx);
    this.emit('payment_intent.payment_failed', pi, ctx);
    throw new ApiError(402, { ...error, payment_intent: structuredClone(pi) }, true);
  }

  private newCharge(
    pi: PaymentIntentObject,
    pm: StoredPaymentMethod,
    declined: Extract<CardBehaviour, { kind: 'decline' }> | null,
  ): ChargeObject {
    const card = pm.object.card as Record<string, unknown>;
    const ok = !declined;
    const charge: ChargeObject = {
      id: newId('ch'),
      object: 'charge',
      amount: pi.amount,
      amount_captured: ok ? pi.amount : 0,
      amount_refunded: 0,
      application: null,
      application_fee: null,
      application_fee_amount: null,
      balance_transaction: ok ? newId('txn') : null,
      billing_details: structuredClone(pm.object.billing_details),
      calculated_statement_descriptor: pi.statement_descriptor,
      captured: ok,
      created: nowSeconds(),
      currency: pi.currency,
      customer: pi.customer,
      description: pi.description,
      disputed: false,
      failure_balance_transaction: null,
      failure_code: declined?.code ?? null,
      failure_message: declined?.message ?? null,
      fraud_details: {},
      livemode: false,
      metadata: { ...pi.metadata },
      on_behalf_of: null,
      outcome: ok
        ? {
            advice_code: null,
            network_advice_code: null,
            network_decline_code: null,
            network_status: 'approved_by_network',
            reason: null,
            risk_level: 'normal',
            seller_message: 'Payment complete.',
            type: 'authorized',
          }
        : {
            advice_code: null,
            network_advice_code: null,
            network_decline_code: null,
            network_status: 'declined_by_network',
            reason: declined.declineCode ?? declined.code,
            risk_level: 'normal',
            seller_message: declined.declineCode
              ? `The bank returned the decline code \`${declined.declineCode}\`.`
              : 'The bank did not return any further details with this decline.',
            type: 'issuer_declined',
          },
      paid: ok,
      payment_intent: pi.id,
      payment_method: pm.object.id,
      payment_method_details: {
        card: {
          amount_authorization: null,
          brand: card.brand,
          checks: card.checks,
          country: card.country,
          funding: card.funding,
          last4: card.last4,
          network: card.brand,
          three_d_secure: null,
          wallet: null,
        },
        type: 'card',
      },
      receipt_email: pi.receipt_email,
      receipt_number: null,
      receipt_url: null,
      refunded: false,
      review: null,
      shipping: null,
      source: null,
      source_transfer: null,
      statement_descriptor: pi.statement_descriptor,
      statement_descriptor_suffix: pi.statement_descriptor_suffix,
      status: ok ? 'succeeded' : 'failed',
      transfer_data: null,
      transfer_group: null,
    };
    this.state.charges[charge.id] = charge;
    return charge;
  }

  // ---- charges and refunds ----

  retrieveCharge(id: string, p: Params): ApiObject {
    refuse(p, ['expand']);
    const charge = this.state.charges[id];
    if (!charge) throw notFound('charge', id);
    return this.expand(charge, p);
  }

  createRefund(p: Params, ctx: RequestContext): ApiObject {
    refuse(p, REFUND_PARAMS, REFUND_KNOWN);
    const piId = p.string('payment_intent');
    const chargeId = p.string('charge');
    if (!piId && !chargeId)
      throw invalidParam(
        'One of the following params should be provided for this request: payment_intent or charge.',
        'payment_intent',
        'parameter_missing',
      );
    let charge: ChargeObject | undefined;
    if (piId) {
      const pi = this.state.paymentIntents[piId] as PaymentIntentObject | undefined;
      if (!pi) throw missingReference('payment_intent', piId, 'payment_intent');
      if (chargeId && pi.latest_charge !== chargeId)
        throw invalidParam(`The charge ${chargeId} does not belong to the PaymentIntent ${piId}.`, 'charge');
      if (pi.status !== 'succeeded')
        throw invalidState(
          `This PaymentIntent (${piId}) does not have a successful charge to refund: it has a status of ${pi.status}.`,
          'payment_intent_unexpected_state',
          'payment_intent',
        );
      charge = this.state.charges[pi.latest_charge!] as ChargeObject;
    } else {
      charge = this.state.charges[chargeId!] as ChargeObject | undefined;
      if (!charge) throw missingReference('charge', chargeId!, 'charge');
      if (charge.status !== 'succeeded')
        throw invalidState(`The charge ${chargeId} did not succeed: there is nothing to refund.`, 'charge_not_refundable', 'charge');
    }
    const reason = p.enumeration('reason', ['duplicate', 'fraudulent', 'requested_by_customer'] as const) ?? null;
    const requested = p.integer('amount', { min: 1 });
    const metadata = applyMetadata({}, p.metadata());
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0) throw invalidState(`Charge ${charge.id} has already been refunded.`, 'charge_already_refunded');
    const amount = requested ?? remaining;
    if (amount > remaining)
      throw invalidState(
        `Refund amount (${formatAmount(amount, charge.currency)}) is greater than unrefunded amount on charge (${formatAmount(remaining, charge.currency)})`,
        'amount_too_large',
        'amount',
      );
    const refund: ApiObject = {
      id: newId('re'),
      object: 'refund',
      amount,
      balance_transaction: newId('txn'),
      charge: charge.id,
      created: nowSeconds(),
      currency: charge.currency,
      customer: charge.customer ?? null,
      customer_account: null,
      destination_details: {
        card: { reference_status: 'pending', reference_type: 'acquirer_reference_number', type: 'refund' },
        type: 'card',
      },
      metadata,
      payment_intent: charge.payment_intent,
      payment_method: charge.payment_method ?? null,
      reason,
      receipt_number: null,
      source_transfer_reversal: null,
      status: 'succeeded',
      transfer_reversal: null,
    };
    this.state.refunds[refund.id] = refund;
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    this.emit('refund.created', refund, ctx);
    this.emit('charge.refunded', charge, ctx, previous);
    return this.expand(refund, p);
  }

  retrieveRefund(id: string, p: Params): ApiObject {
    refuse(p, ['expand']);
    const refund = this.state.refunds[id];
    if (!refund) throw notFound('refund', id);
    return this.expand(refund, p);
  }

  listRefunds(p: Params): ApiObject {
    refuse(p, ['payment_intent', 'charge', 'limit', 'starting_after', 'expand']);
    const pi = p.string('payment_intent');
    const charge = p.string('charge');
    const all = Object.values(this.state.refunds).filter((r) => (!pi || r.payment_intent === pi) && (!charge || r.charge === charge));
    return this.list(all, p, '/v1/refunds');
  }

  // ---- events ----

  retrieveEvent(id: string, p: Params): ApiObject {
    refuse(p, ['expand']);
    const event = this.state.events.find((e) => e.id === id);
    if (!event) throw notFound('event', id);
    return event as unknown as ApiObject;
  }

  listEvents(p: Params): ApiObject {
    refuse(p, ['type', 'limit', 'starting_after', 'expand']);
    const type = p.string('type');
    const pattern = type ? new RegExp(`^${type.replace(/[.+?^${}()|[\]\\]/g, '\\$&').replace(/\*/g, '[^.]+')}$`) : null;
    const all = (this.state.events as unknown as ApiObject[]).filter((e) => !pattern || pattern.test(e.type as string));
    return this.list(all, p, '/v1/events');
  }

  private emit(type: string, object: ApiObject, ctx: RequestContext | null, previous?: Record<string, unknown>): void {
    const event: FakeEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: ctx?.apiVersion ?? this.options.defaultApiVersion,
      created: nowSeconds(),
      data:
        previous && Object.keys(previous).length
          ? { object: structuredClone(object), previous_attributes: previous }
          : { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: ctx?.requestId ?? null, idempotency_key: ctx?.idempotencyKey ?? null },
      type,
    };
    this.state.events.push(event);
    this.options.onEvent(event);
  }

  // ---- helpers ----

  /** Oldest-first objects as the provider's list (newest first, `limit`, `starting_after`). */
  private list(all: ApiObject[], p: Params, url: string): ApiObject {
    const limit = p.integer('limit', { min: 1 }) ?? 10;
    if (limit > 100) throw invalidParam('This value must be less than or equal to 100.', 'limit', 'parameter_invalid_integer');
    const newestFirst = [...all].reverse();
    const after = p.string('starting_after');
    let start = 0;
    if (after) {
      const i = newestFirst.findIndex((o) => o.id === after);
      if (i < 0) throw missingReference('object', after, 'starting_after');
      start = i + 1;
    }
    const data = newestFirst.slice(start, start + limit);
    return { object: 'list', data, has_more: start + limit < newestFirst.length, url } as unknown as ApiObject;
  }

  /** A copy of the object with the `expand[]` fields replaced by their objects (one level, as the fake models). */
  private expand(object: ApiObject, p: Params): ApiObject {
    const paths = p.strings('expand');
    if (!paths?.length) return object;
    const lookups: Record<string, Record<string, (id: string) => unknown>> = {
      payment_intent: {
        customer: (id) => this.state.customers[id],
        latest_charge: (id) => this.state.charges[id],
        payment_method: (id) => this.state.paymentMethods[id]?.object,
      },
      charge: { customer: (id) => this.state.customers[id], payment_intent: (id) => this.state.paymentIntents[id] },
      refund: { charge: (id) => this.state.charges[id], payment_intent: (id) => this.state.paymentIntents[id] },
    };
    const out = structuredClone(object);
    for (const path of paths) {
      const lookup = lookups[object.object]?.[path];
      if (!lookup) throw invalidParam(`This property cannot be expanded (${path}).`, 'expand');
      const id = out[path];
      if (typeof id === 'string') out[path] = structuredClone(lookup(id) ?? id);
    }
    return out;
  }
}
