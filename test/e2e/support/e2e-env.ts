/** Where the browser suite's own server listens (never the `npm start` port). */
export const E2E_PORT = Number(process.env.E2E_PORT ?? 4310);
export const E2E_SMTP_PORT = Number(process.env.E2E_SMTP_PORT ?? 2535);
export const E2E_MAIL_HTTP_PORT = Number(process.env.E2E_MAIL_HTTP_PORT ?? 4398);
/** The suite's own payment fake (never the `npm start` one on 4397). */
export const E2E_PAYMENT_PORT = Number(process.env.E2E_PAYMENT_PORT ?? 4396);
export const BASE_URL = `http://127.0.0.1:${E2E_PORT}`;
export const E2E_DB = process.env.SPINCYCLE_E2E_DB ?? 'spincycle_e2e';

/**
 * The development mailbox of the suite's mail fake (its own origin, 127.0.0.1 only), with the
 * access token that global-setup made for this run, optionally for one recipient.
 */
export function e2eMailboxUrl(to?: string): string {
  const token = process.env.SPINCYCLE_E2E_MAILBOX_TOKEN;
  if (!token)
    throw new Error('SPINCYCLE_E2E_MAILBOX_TOKEN is not set: run the browser suite through jest (its global setup starts the mail fake)');
  return `http://127.0.0.1:${E2E_MAIL_HTTP_PORT}/?token=${encodeURIComponent(token)}${to ? `&to=${encodeURIComponent(to)}` : ''}`;
}
