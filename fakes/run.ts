/**
 * Runs the local fakes for `npm start` and the browser tests: the SMTP fake and the payment
 * provider fake. Ports come from the environment; the mailbox's access token from
 * `MAILBOX_TOKEN` (random when unset). Never in production: the fakes would accept the app's
 * mail and show password-reset links, and take its payments.
 *
 * Payment fake (fakes/payments): `PAYMENT_FAKE_PORT` (default 4397; `off` to not start it),
 * `PAYMENT_SECRET_KEY` (the test secret key it accepts), `PAYMENT_WEBHOOK_SECRET` (signing secret
 * of the webhooks), `PAYMENT_WEBHOOK_URL` (default the app's /api/billing/webhook on `PORT`),
 * `PAYMENT_FAKE_STATE` (its state file, default .data/payment-fake.json in the project),
 * `PAYMENT_WEBHOOK_RETRY_BASE_MS` (first retry delay, default 1000). The app must be configured
 * with the same key, secret and port.
 */
import path from 'node:path';
import { startMailFake } from './mail/mail-fake';
import { startPaymentFake, type PaymentFake } from './payments/payment-fake';

/** Development defaults, known to the app's development configuration; never real credentials. */
const DEV_PAYMENT_SECRET_KEY = 'sk_test_spincycle_local_fake_key';
const DEV_PAYMENT_WEBHOOK_SECRET = 'whsec_spincycle_local_fake_secret';

async function startPayments(): Promise<PaymentFake | null> {
  const portSetting = process.env.PAYMENT_FAKE_PORT?.trim();
  if (portSetting === 'off') return null;
  const port = Number(portSetting || 4397);
  if (!Number.isInteger(port) || port < 1 || port > 65535)
    throw new Error(`PAYMENT_FAKE_PORT must be a port number or off, not ${portSetting}`);
  const stateFile = process.env.PAYMENT_FAKE_STATE
    ? path.resolve(process.env.PAYMENT_FAKE_STATE)
    : path.resolve(__dirname, '..', '.data', 'payment-fake.json');
  const retryBase = Number(process.env.PAYMENT_WEBHOOK_RETRY_BASE_MS || 1000);
  if (!Number.isFinite(retryBase) || retryBase < 10)
    throw new Error('PAYMENT_WEBHOOK_RETRY_BASE_MS must be a number of milliseconds, at least 10');
  try {
    return await startPaymentFake({
      port,
      secretKey: process.env.PAYMENT_SECRET_KEY || DEV_PAYMENT_SECRET_KEY,
      webhookSecret: process.env.PAYMENT_WEBHOOK_SECRET || DEV_PAYMENT_WEBHOOK_SECRET,
      webhookUrl: process.env.PAYMENT_WEBHOOK_URL || `http://127.0.0.1:${process.env.PORT || 4300}/api/billing/webhook`,
      stateFile,
      webhookRetryBaseMs: retryBase,
    });
  } catch (err) {
    // A second set of fakes (the browser suite beside `npm start`) finds the default port taken:
    // without a port of its own it runs without payments rather than stopping the mail fake.
    if ((err as NodeJS.ErrnoException).code === 'EADDRINUSE' && !portSetting) {
      console.error(`fakes: payment fake not started: port ${port} is in use (set PAYMENT_FAKE_PORT to another port, or off)`);
      return null;
    }
    throw err;
  }
}

async function main(): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('the fakes do not run with NODE_ENV=production');
  const mail = await startMailFake({
    smtpPort: Number(process.env.SMTP_PORT ?? 2525),
    httpPort: Number(process.env.MAIL_FAKE_HTTP_PORT ?? 4399),
    token: process.env.MAILBOX_TOKEN || undefined,
  });
  console.log(`fakes: SMTP on 127.0.0.1:${mail.smtpPort}, mailbox on ${mail.mailboxUrl}`);
  let payments: PaymentFake | null = null;
  try {
    payments = await startPayments();
  } catch (err) {
    await mail.close();
    throw err;
  }
  if (payments) console.log(`fakes: payment provider on ${payments.url} (control surface under /_fake)`);
  const stop = () => {
    Promise.allSettled([mail.close(), payments?.close()]).finally(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(`fakes: ${err.message}`);
  process.exit(1);
});
