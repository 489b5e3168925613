import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import { createServer, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { renderMailboxPage } from './mailbox-page';

/** One message as the fake received it. */
export interface FakeMessage {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; size: number }[];
  /** The Message-ID header (`<…@…>`), or null without one. */
  messageId: string | null;
}

export interface MailFake {
  smtpPort: number;
  httpPort: number | null;
  /** The mailbox page with its access token (`http://127.0.0.1:<port>/?token=…`), or null without `httpPort`. */
  mailboxUrl: string | null;
  messages(): FakeMessage[];
  /** Resolves with the first message (received now or later) that matches. */
  waitFor(match: (m: FakeMessage) => boolean, timeoutMs?: number): Promise<FakeMessage>;
  /**
   * Message-IDs of copies that arrived again and were dropped (accepted over SMTP, not kept):
   * a second delivery of one outbox mail carries the same Message-ID, and a mailbox keeps one.
   */
  droppedDuplicates(): string[];
  clear(): void;
  close(): Promise<void>;
}

const MAX_KEPT = 500;

const LOOPBACK = new Set(['127.0.0.1', '::1']);

/** Headers of every mailbox answer: no scripts, no framing, no referer (reset links carry tokens), no caching. */
function securityHeaders(res: ServerResponse): void {
  res.setHeader(
    'Content-Security-Policy',
    "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'",
  );
  res.setHeader('Referrer-Policy', 'no-referrer');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  res.setHeader('Cache-Control', 'no-store');
}

/** Constant-time comparison of the given token with the mailbox's own (hashes make the lengths equal). */
function sameToken(given: string | null, expected: string): boolean {
  if (!given) return false;
  const digest = (s: string) => createHash('sha256').update(s).digest();
  return timingSafeEqual(digest(given), digest(expected));
}

/**
 * A local SMTP server standing in for a mail relay: accepts everything on loopback, keeps
 * the last messages in memory, and (with `httpPort`) serves a page and a JSON list of them.
 * Like a mailbox, it keeps one copy per Message-ID: a message whose Message-ID it has received
 * before is accepted and dropped (see `droppedDuplicates`).
 *
 * The mailbox holds password-reset and invitation links, so it is guarded: it listens on
 * loopback only (another address is refused), on its own origin (never proxied through the
 * app), and answers 403 unless the request carries `?token=` with the access token, random
 * per start unless `token` is given (`npm start` prints the URL with it).
 */
export async function startMailFake(
  options: { smtpPort?: number; httpPort?: number | null; host?: string; token?: string } = {},
): Promise<MailFake> {
  const host = options.host ?? '127.0.0.1';
  if (!LOOPBACK.has(host)) throw new Error(`the mail fake listens on loopback only (127.0.0.1 or ::1), not ${host}`);
  const token = options.token ?? randomBytes(24).toString('base64url');
  if (token.length < 16) throw new Error('the mailbox token must have at least 16 characters');
  const messages: FakeMessage[] = [];
  const waiters: { match: (m: FakeMessage) => boolean; resolve: (m: FakeMessage) => void }[] = [];
  let nextId = 1;
  // Every Message-ID received since the start (not only the kept messages), and the repeats dropped.
  const seenMessageIds = new Set<string>();
  const duplicates: string[] = [];

  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const messageId = parsed.messageId ?? null;
          if (messageId !== null && seenMessageIds.has(messageId)) {
            duplicates.push(messageId);
            callback();
            return;
          }
          if (messageId !== null) seenMessageIds.add(messageId);
          const to = session.envelope.rcptTo.map((r) => r.address);
          const message: FakeMessage = {
            id: nextId++,
            receivedAt: new Date().toISOString(),
            from: parsed.from?.text ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            to,
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
            attachments: parsed.attachments.map((a) => ({
              filename: a.filename ?? 'attachment',
              contentType: a.contentType,
              size: a.size,
            })),
            messageId,
          };
          messages.push(message);
          if (messages.length > MAX_KEPT) messages.shift();
          for (const w of [...waiters]) {
            if (w.match(message)) {
              waiters.splice(waiters.indexOf(w), 1);
              w.resolve(message);
            }
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(options.smtpPort ?? 0, host, () => resolve());
  });
  const smtpPort = (smtp.server.address() as AddressInfo).port;

  let http: Server | null = null;
  if (options.httpPort !== undefined && options.httpPort !== null) {
    http = createServer((req, res) => {
      const url = new URL(req.url ?? '/', 'http://fake');
      securityHeaders(res);
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        res.writeHead(405, { 'content-type': 'text/plain', allow: 'GET, HEAD' });
        res.end('method not allowed');
        return;
      }
      if (!sameToken(url.searchParams.get('token'), token)) {
        res.writeHead(403, { 'content-type': 'text/plain' });
        res.end('forbidden: open the mailbox with the URL that npm start printed (it carries ?token=)');
        return;
      }
      if (url.pathname === '/api/messages') {
        res.writeHead(200, { 'content-type': 'application/json' });
        res.end(JSON.stringify([...messages].reverse()));
        return;
      }
      if (url.pathname === '/' || url.pathname === '') {
        res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
        res.end(renderMailboxPage([...messages].reverse(), url.searchParams.get('to') ?? undefined));
        return;
      }
      res.writeHead(404, { 'content-type': 'text/plain' });
      res.end('not found');
    });
    await new Promise<void>((resolve, reject) => {
      http!.once('error', reject);
      http!.listen(options.httpPort!, host, () => resolve());
    });
  }

  const httpPort = http ? (http.address() as AddressInfo).port : null;
  return {
    smtpPort,
    httpPort,
    mailboxUrl:
      httpPort === null ? null : `http://${host.includes(':') ? `[${host}]` : host}:${httpPort}/?token=${encodeURIComponent(token)}`,
    messages: () => [...messages],
    waitFor(match, timeoutMs = 5000) {
      const found = messages.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const waiter = { match, resolve: (m: FakeMessage) => (clearTimeout(timer), resolve(m)) };
        const timer = setTimeout(() => {
          waiters.splice(waiters.indexOf(waiter), 1);
          reject(new Error(`no matching message within ${timeoutMs} ms`));
        }, timeoutMs);
        waiters.push(waiter);
      });
    },
    droppedDuplicates: () => [...duplicates],
    clear: () => void messages.splice(0),
    async close() {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      if (http) await new Promise<void>((resolve) => http!.close(() => resolve()));
    },
  };
}
