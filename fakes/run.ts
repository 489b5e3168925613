/**
 * Runs the local fakes for `npm start` and the browser tests: the SMTP fake (and, in later
 * features, the payment provider fake). Ports come from the environment; the mailbox's access
 * token from `MAILBOX_TOKEN` (random when unset). Never in production: the fakes would accept
 * the app's mail and show password-reset links.
 */
import { startMailFake } from './mail/mail-fake';

async function main(): Promise<void> {
  if (process.env.NODE_ENV === 'production') throw new Error('the fakes do not run with NODE_ENV=production');
  const mail = await startMailFake({
    smtpPort: Number(process.env.SMTP_PORT ?? 2525),
    httpPort: Number(process.env.MAIL_FAKE_HTTP_PORT ?? 4399),
    token: process.env.MAILBOX_TOKEN || undefined,
  });
  console.log(`fakes: SMTP on 127.0.0.1:${mail.smtpPort}, mailbox on ${mail.mailboxUrl}`);
  const stop = () => {
    mail.close().finally(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(`fakes: ${err.message}`);
  process.exit(1);
});
