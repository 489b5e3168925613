import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: { filename: string; content: Buffer; contentType: string }[];
}

/** Sends mail through SMTP (in development and tests: the local fake in fakes/mail). */
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
