/**
 * Runs the local fakes for `npm start` and the browser tests: the SMTP fake (and, in later
 * features, the payment provider fake). Ports come from the environment.
 */
import { startMailFake } from './mail/mail-fake';

async function main(): Promise<void> {
  const mail = await startMailFake({
    smtpPort: Number(process.env.SMTP_PORT ?? 2525),
    httpPort: Number(process.env.MAIL_FAKE_HTTP_PORT ?? 4399),
  });
  console.log(`fakes: SMTP on 127.0.0.1:${mail.smtpPort}, mailbox on http://127.0.0.1:${mail.httpPort}`);
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
