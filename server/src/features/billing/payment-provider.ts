import Stripe from 'stripe';
import type { AppContext } from '../../app-context';

/**
 * The payment provider's official SDK, aimed by configuration at its API: in development and
 * tests the local fake in fakes/payments, reached through the SDK's own host/port/protocol options,
 * so the code path is the one production uses. One client per application context.
 *
 * The SDK retries network failures itself with the same idempotency key (maxNetworkRetries), so a
 * lost answer never becomes a second charge.
 */
const clients = new WeakMap<AppContext['config'], Stripe>();

export function paymentClient(ctx: Pick<AppContext, 'config'>): Stripe {
  let client = clients.get(ctx.config);
  if (!client) {
    const url = new URL(ctx.config.PAYMENT_API_URL);
    client = new Stripe(ctx.config.PAYMENT_SECRET_KEY, {
      host: url.hostname,
      port: url.port || (url.protocol === 'https:' ? 443 : 80),
      protocol: url.protocol === 'https:' ? 'https' : 'http',
      maxNetworkRetries: 2,
      timeout: 15_000,
      telemetry: false,
    });
    clients.set(ctx.config, client);
  }
  return client;
}

export const isCardError = (err: unknown): err is Stripe.errors.StripeCardError => err instanceof Stripe.errors.StripeCardError;
export const isConnectionError = (err: unknown): err is Stripe.errors.StripeConnectionError =>
  err instanceof Stripe.errors.StripeConnectionError || err instanceof Stripe.errors.StripeAPIError;
export const isSignatureError = (err: unknown): boolean => err instanceof Stripe.errors.StripeSignatureVerificationError;
export type PaymentIntent = Stripe.PaymentIntent;
export type ProviderEvent = Stripe.Event;
