import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
  /**
   * The Message-ID header (`<local@domain>`). The outbox fixes it when the mail is written, so
   * that a copy sent twice (a crash between the relay's acceptance and our record of it) carries
   * the same id; without it nodemailer makes one up.
   */
  messageId?: string;
}

/**
 * Sends mail through SMTP (in development and tests: the local fake in fakes/mail). Features do
 * not call it: they write to the outbox (outbox.ts), whose delivery calls it.
 */
export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  close(): void;
}

export function createSmtpMailer(config: Pick<Config, 'SMTP_HOST' | 'SMTP_PORT' | 'MAIL_FROM'>): Mailer {
  const transport: Transporter = nodemailer.createTransport({
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    secure: false,
    // The local fake speaks plain SMTP on loopback; a real relay would be configured with TLS.
    ignoreTLS: config.SMTP_HOST === '127.0.0.1' || config.SMTP_HOST === 'localhost',
    connectionTimeout: 5000,
    // Bounded, so that one send never outlives its outbox claim (MAIL_CLAIM_STALE_SECONDS, 5 min by default).
    greetingTimeout: 15_000,
    socketTimeout: 60_000,
  });
  return {
    async send(mail) {
      await transport.sendMail({ from: config.MAIL_FROM, ...mail });
    },
    close() {
      transport.close();
    },
  };
}
