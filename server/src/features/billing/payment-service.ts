import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import type { PayInvoiceInput, PaymentOutcome } from '@spincycle/shared/billing/billing';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { insertAudit } from '../awards/award-repository';
import {
  findAttemptByKey,
  findInvoice,
  insertAttempt,
  invoiceRecipients,
  isBillingContact,
  isPi,
  listInvoiceLines,
  recordEvent,
  updateInvoice,
  type StoredInvoice,
} from './billing-repository';
import { deliverMail } from '../../mail/outbox';
import { queueInvoiceMail } from './billing-mail';
import { invoiceDetail, invoiceNotFound, providerUnavailable, staleInvoice } from './invoice-service';
import { renderInvoicePdf } from './invoice-pdf';
import {
  isCardError,
  isConnectionError,
  isSignatureError,
  paymentClient,
  type PaymentIntent,
  type ProviderEvent,
} from './payment-provider';
import Stripe from 'stripe';

/** The brand a card number's leading digits say (ISO/IEC 7812 issuer ranges; common practice, no source). */
export function cardBrand(number: string): string {
  if (/^4/.test(number)) return 'Visa';
  if (/^(5[1-5]|2[2-7])/.test(number)) return 'Mastercard';
  if (/^3[47]/.test(number)) return 'American Express';
  return 'Card';
}

/**
 * The idempotency key of a payment: the invoice (its id and creation time, so that a database
 * set up again never meets the keys of an older one at the provider) and its version (a new
 * version after a decline).
 */
export const paymentKey = (invoice: { id: number; version: number; createdAt: Date }) =>
  `invoice-${invoice.id}-${invoice.createdAt.getTime()}-v${invoice.version}`;

const NEEDS_AUTHENTICATION =
  'This card asks for an extra check by the bank (authentication), which payments in Spincycle cannot do. Nothing was charged. Use another card, or ask the consortium’s finance office for another way to pay.';

const PROCESSING =
  'The card processor accepted the payment. The invoice shows as paid as soon as the processor confirms it, usually within seconds.';

/** Serialises the payments of one invoice (a double click waits for the first request, then sees its attempt). */
async function lockPayments(trx: Knex.Transaction, invoiceId: number): Promise<void> {
  await trx.raw('SELECT pg_advisory_xact_lock(?, ?)', [20270225, invoiceId]);
}

/**
 * POST /api/billing/invoices/:id/payments (a billing contact of the program): pays an issued invoice
 * by card through the payment provider's SDK. The card fields go from the request to the provider
 * and nowhere else: not to the database (only the brand and last four digits), not to the logs.
 *
 * - The payment intent is created and confirmed with the idempotency key `invoice-<id>-v<version>`,
 *   so a double click or a retried request is one charge.
 * - The invoice becomes paid only when the provider's signed event arrives (handlePaymentEvent),
 *   never because this request or the browser says so.
 * - A decline answers 402 with the provider's message and moves the invoice to a new version, so the
 *   next card gets a new key; a card that needs authentication is refused clearly (its intent is
 *   cancelled); an unreachable provider answers 503 and leaves the version, so a retry with the same
 *   card is the same request to the provider.
 */
export async function payInvoice(ctx: AppContext, viewer: SessionUser, id: number, input: PayInvoiceInput): Promise<PaymentOutcome> {
  const now = ctx.now();
  const provider = paymentClient(ctx);
  const outcome = await ctx.db.transaction(async (trx) => {
    await lockPayments(trx, id);
    const invoice = await findInvoice(trx, id);
    if (!invoice || invoice.state === 'draft') throw invoiceNotFound(id);
    if (!(await isBillingContact(trx, invoice.proposalId, viewer.id))) {
      // The PI sees the invoice but pays through a billing contact; others do not see it at all.
      if (!(await isPi(trx, invoice.proposalId, viewer.id))) throw invoiceNotFound(id);
      throw new AppError(
        'not_billing_contact',
        'Only the program’s billing contacts pay its invoices. Invite yourself or someone else as billing contact.',
        403,
      );
    }
    if (invoice.state !== 'issued') {
      const why = invoice.state === 'paid' || invoice.state === 'refunded' ? 'is already paid' : 'is void';
      throw new AppError('invoice_not_payable', `Invoice ${invoice.number} ${why}.`, 409);
    }
    // The same click again (or a retried request): answer what the first one did, without a second charge.
    const asked = paymentKey({ id, version: input.version, createdAt: invoice.createdAt });
    if (await findAttemptByKey(trx, id, asked)) return { state: 'processing' as const, message: PROCESSING };
    if (input.version !== invoice.version) throw staleInvoice();
    const key = paymentKey(invoice);

    const last4 = input.cardNumber.slice(-4);
    const brand = cardBrand(input.cardNumber);
    const attempt = (
      state: 'processing' | 'succeeded' | 'declined' | 'needs_authentication' | 'failed',
      extra: { intentId?: string | null; message?: string | null; declineCode?: string | null } = {},
    ) =>
      insertAttempt(trx, {
        invoiceId: id,
        idempotencyKey: key,
        paymentIntentId: extra.intentId ?? null,
        state,
        message: extra.message ?? null,
        declineCode: extra.declineCode ?? null,
        cardBrand: brand,
        cardLast4: last4,
        amountMinor: invoice.totalMinor,
        createdBy: viewer.id,
      });

    let intent: PaymentIntent;
    try {
      const customer = await programCustomer(trx, provider, invoice, viewer);
      intent = await provider.paymentIntents.create(
        {
          amount: invoice.totalMinor,
          currency: invoice.currency.toLowerCase(),
          customer,
          description: `Invoice ${invoice.number}`,
          metadata: { invoice_id: String(id), invoice_number: invoice.number ?? '' },
          // Cards only, confirmed here: no redirect-based method, so no return URL.
          automatic_payment_methods: { enabled: true, allow_redirects: 'never' },
          // Card details passed straight to the provider (the local fake accepts them; a hosted account
          // would take a token from its own card field instead).
          payment_method_data: {
            type: 'card',
            card: { number: input.cardNumber, exp_month: input.expMonth, exp_year: input.expYear, cvc: input.cvc },
            billing_details: input.nameOnCard ? { name: input.nameOnCard } : undefined,
          } as unknown as Stripe.PaymentIntentCreateParams.PaymentMethodData,
          confirm: true,
        },
        { idempotencyKey: key },
      );
    } catch (err) {
      if (isCardError(err)) {
        await attempt('declined', {
          intentId: err.payment_intent?.id ?? null,
          message: err.message,
          declineCode: err.decline_code ?? null,
        });
        await updateInvoice(trx, id, invoice.version, {});
        return { declined: { message: err.message, declineCode: err.decline_code ?? null } };
      }
      if (err instanceof Stripe.errors.StripeIdempotencyError) {
        return { inDoubt: true };
      }
      if (isConnectionError(err)) {
        await attempt('failed', { message: 'The card processor could not be reached.' });
        ctx.logger.warn(
          { invoiceId: id, err: { type: (err as Error).name, message: (err as Error).message } },
          'payment provider unreachable',
        );
        return { unavailable: true };
      }
      throw err;
    }
    if (intent.status === 'requires_action') {
      await provider.paymentIntents.cancel(intent.id, {}, { idempotencyKey: `${key}-cancel` }).catch(() => undefined);
      await attempt('needs_authentication', { intentId: intent.id, message: NEEDS_AUTHENTICATION });
      await updateInvoice(trx, id, invoice.version, {});
      return { needsAuthentication: true };
    }
    if (intent.status !== 'succeeded' && intent.status !== 'processing') {
      const message = intent.last_payment_error?.message ?? 'The card processor did not accept the payment.';
      await attempt('declined', { intentId: intent.id, message, declineCode: intent.last_payment_error?.decline_code ?? null });
      await updateInvoice(trx, id, invoice.version, {});
      return { declined: { message, declineCode: intent.last_payment_error?.decline_code ?? null } };
    }
    await attempt('processing', { intentId: intent.id });
    return { state: 'processing' as const, message: PROCESSING };
  });

  // Errors are answered after the transaction committed, so that the attempt and the new version stay.
  if ('declined' in outcome && outcome.declined) {
    throw new AppError('card_declined', outcome.declined.message, 402, undefined, { declineCode: outcome.declined.declineCode });
  }
  if ('needsAuthentication' in outcome) throw new AppError('card_needs_authentication', NEEDS_AUTHENTICATION, 402);
  if ('unavailable' in outcome) throw providerUnavailable();
  if ('inDoubt' in outcome) {
    throw new AppError(
      'payment_in_progress',
      'An earlier payment of this invoice with other card details reached the card processor and its outcome is not known yet. Reload the invoice in a minute: it shows as paid, or you can pay again.',
      409,
    );
  }
  const invoice = (await findInvoice(ctx.db, id))!;
  return { state: outcome.state, message: outcome.message, invoice: await invoiceDetail(ctx.db, viewer, invoice, now) };
}

/** The program's customer at the provider, made once (idempotent) and kept on the program. */
async function programCustomer(trx: Knex.Transaction, provider: Stripe, invoice: StoredInvoice, viewer: SessionUser): Promise<string> {
  const program = await trx('programs').where({ proposal_id: invoice.proposalId }).forUpdate().first('payment_customer_id');
  if (program?.payment_customer_id) return program.payment_customer_id;
  const customer = await provider.customers.create(
    { name: invoice.programTitle, email: viewer.email, metadata: { program: String(invoice.proposalId) } },
    { idempotencyKey: `program-${invoice.proposalId}-customer-${invoice.createdAt.getTime()}` },
  );
  await trx('programs').where({ proposal_id: invoice.proposalId }).update({ payment_customer_id: customer.id });
  return customer.id;
}

// ---------------------------------------------------------------- the provider's events

/**
 * POST /api/billing/webhook: an event from the payment provider, with its signature header. The
 * signature is checked with the SDK's `webhooks.constructEvent` (HMAC of the raw body with the
 * webhook secret, and a timestamp no older than five minutes); anything else answers 400 and
 * changes nothing. Each event id is handled once: a replay answers 200 and changes nothing.
 * Handling runs in one transaction with the invoice row locked, so an event racing the payment
 * request that caused it waits for that request to commit.
 */
export async function handlePaymentEvent(
  ctx: AppContext,
  raw: Buffer,
  signature: string | undefined,
): Promise<{ received: true; duplicate?: true }> {
  if (!signature) throw new AppError('signature_missing', 'The event has no signature header.', 400);
  let event: ProviderEvent;
  try {
    event = paymentClient(ctx).webhooks.constructEvent(raw, signature, ctx.config.PAYMENT_WEBHOOK_SECRET);
  } catch (err) {
    if (isSignatureError(err))
      throw new AppError('signature_invalid', 'The event’s signature does not verify (forged, altered or too old).', 400);
    throw new AppError('event_invalid', 'The event could not be read.', 400);
  }
  const now = ctx.now();
  const mailIds: number[] = [];
  const result = await ctx.db.transaction(async (trx) => {
    if (!(await recordEvent(trx, { eventId: event.id, type: event.type, invoiceId: null, outcome: 'received' }))) {
      return { received: true as const, duplicate: true as const };
    }
    const done = async (invoiceId: number | null, outcome: string, mailId: number | null = null) => {
      if (mailId !== null) mailIds.push(mailId);
      await trx('payment_events').where({ event_id: event.id }).update({ invoice_id: invoiceId, outcome });
    };
    switch (event.type) {
      case 'payment_intent.succeeded':
        await done(...(await onPaymentSucceeded(trx, ctx, event.data.object as PaymentIntent, now)));
        break;
      case 'payment_intent.payment_failed':
        await done(...(await onPaymentFailed(trx, event.data.object as PaymentIntent)));
        break;
      case 'charge.refunded':
        await done(...(await onChargeRefunded(trx, ctx, event.data.object as Stripe.Charge, now)));
        break;
      default:
        await done(null, 'ignored: not an event Spincycle uses');
    }
    return { received: true as const };
  });
  if (mailIds.length) await deliverMail(ctx, mailIds);
  return result;
}

const invoiceIdOf = (metadata: Stripe.Metadata | null | undefined) => {
  const n = Number(metadata?.invoice_id);
  return Number.isSafeInteger(n) && n > 0 ? n : null;
};

async function onPaymentSucceeded(
  trx: Knex.Transaction,
  ctx: AppContext,
  intent: PaymentIntent,
  now: Date,
): Promise<[number | null, string, (number | null)?]> {
  const id = invoiceIdOf(intent.metadata);
  if (id === null) return [null, 'ignored: no invoice in the payment'];
  // Waits for the payment request that made this intent to commit its attempt.
  await lockPayments(trx, id);
  const invoice = await findInvoice(trx, id, { forUpdate: true });
  if (!invoice) return [null, `ignored: no invoice ${id}`];
  await trx('payment_attempts')
    .where({ invoice_id: id, payment_intent_id: intent.id })
    .whereIn('state', ['processing', 'failed'])
    .update({ state: 'succeeded' });
  if (invoice.state === 'paid' && invoice.paymentIntentId === intent.id) return [id, 'already paid by this payment'];
  const amountMatches = intent.amount === invoice.totalMinor && intent.currency.toUpperCase() === invoice.currency;
  if (invoice.state !== 'issued' || !amountMatches) {
    // Money arrived that the invoice does not expect (paid twice, voided meanwhile, another amount): the managers decide.
    const why = !amountMatches ? 'the amount differs from the invoice' : `the invoice is ${invoice.state}`;
    await insertAudit(trx, [
      {
        actorAccountId: null,
        cycleId: invoice.cycleId,
        entity: 'invoice',
        entityId: id,
        action: 'payment_unexpected',
        before: { state: invoice.state },
        after: { paymentIntent: intent.id, amountMinor: intent.amount, currency: intent.currency.toUpperCase() },
        reason: `A card payment arrived but ${why}; refund it at the card processor or settle it as the finance office decides.`,
        at: now,
      },
    ]);
    return [id, `needs attention: ${why}`];
  }
  const chargeId = typeof intent.latest_charge === 'string' ? intent.latest_charge : (intent.latest_charge?.id ?? null);
  await updateInvoice(trx, id, invoice.version, { state: 'paid', paid_at: now, payment_intent_id: intent.id, charge_id: chargeId });
  await insertAudit(trx, [
    {
      actorAccountId: null,
      cycleId: invoice.cycleId,
      entity: 'invoice',
      entityId: id,
      action: 'paid',
      before: { state: 'issued' },
      after: { state: 'paid', paymentIntent: intent.id },
      reason: null,
      at: now,
    },
  ]);
  const paid = (await findInvoice(trx, id))!;
  const [lines, billTo] = await Promise.all([listInvoiceLines(trx, id), invoiceRecipients(trx, paid.proposalId)]);
  const attempt = await trx('payment_attempts').where({ invoice_id: id, payment_intent_id: intent.id }).first('card_brand', 'card_last4');
  const pdf = await renderInvoicePdf('receipt', {
    invoice: paid,
    lines,
    billTo,
    payment: { cardBrand: attempt?.card_brand ?? null, cardLast4: attempt?.card_last4 ?? null, reference: intent.id },
    generatedAt: now,
  });
  return [id, 'paid', await queueInvoiceMail(trx, ctx, 'receipt', paid, billTo, pdf)];
}

async function onPaymentFailed(trx: Knex.Transaction, intent: PaymentIntent): Promise<[number | null, string]> {
  const id = invoiceIdOf(intent.metadata);
  if (id === null) return [null, 'ignored: no invoice in the payment'];
  // Waits for the payment request that made this intent to commit its attempt.
  await lockPayments(trx, id);
  const invoice = await findInvoice(trx, id, { forUpdate: true });
  if (!invoice) return [null, `ignored: no invoice ${id}`];
  const message = intent.last_payment_error?.message ?? 'The card processor did not accept the payment.';
  const changed = await trx('payment_attempts')
    .where({ invoice_id: id, payment_intent_id: intent.id })
    .whereIn('state', ['processing', 'failed'])
    .update({ state: 'declined', message, decline_code: intent.last_payment_error?.decline_code ?? null });
  // A decline not yet known to the invoice frees the next payment to use a new key.
  if (changed && invoice.state === 'issued') await updateInvoice(trx, id, invoice.version, {});
  return [id, changed ? 'declined' : 'declined (already known)'];
}

async function onChargeRefunded(
  trx: Knex.Transaction,
  ctx: AppContext,
  charge: Stripe.Charge,
  now: Date,
): Promise<[number | null, string, (number | null)?]> {
  const intentId = typeof charge.payment_intent === 'string' ? charge.payment_intent : (charge.payment_intent?.id ?? null);
  const row = intentId ? await trx('invoices').where({ payment_intent_id: intentId }).first('id') : undefined;
  if (!row) return [null, 'ignored: no invoice paid by this charge'];
  const invoice = (await findInvoice(trx, row.id, { forUpdate: true }))!;
  if (invoice.state === 'refunded') return [invoice.id, 'already refunded'];
  if (invoice.state !== 'paid') return [invoice.id, `ignored: the invoice is ${invoice.state}`];
  if (!charge.refunded || charge.amount_refunded < invoice.totalMinor) return [invoice.id, 'partial refund: the invoice stays paid'];
  await updateInvoice(trx, invoice.id, invoice.version, { state: 'refunded', refunded_at: now });
  await insertAudit(trx, [
    {
      actorAccountId: null,
      cycleId: invoice.cycleId,
      entity: 'invoice',
      entityId: invoice.id,
      action: 'refunded',
      before: { state: 'paid' },
      after: { state: 'refunded', charge: charge.id },
      reason: null,
      at: now,
    },
  ]);
  const refunded = (await findInvoice(trx, invoice.id))!;
  return [
    invoice.id,
    'refunded',
    await queueInvoiceMail(trx, ctx, 'refund', refunded, await invoiceRecipients(trx, invoice.proposalId), null),
  ];
}
