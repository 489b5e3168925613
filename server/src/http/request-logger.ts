import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Logger } from 'pino';
import { pinoHttp, type HttpLogger } from 'pino-http';

const REDACTED = '[redacted]';

/** Query parameters whose values are secrets (reset and invitation links carry `token` and `invite`). */
const SECRET_QUERY_KEY = /token|invite|secret|password|key|code|sig/i;

/**
 * Paths whose next segment is a secret: the client's `/invitations/:token` (and any `/reset/:token`),
 * a node's calendar subscription `/api/calendar-feeds/:token.ics`, and a billing contact's
 * invitation (`/fees/contact-invitations/:token`, `/api/billing/contact-invitations/:token`).
 */
const SECRET_PATH_SEGMENT =
  /^((?:\/api)?\/(?:invitations|reset|reset-password|calendar-feeds|fees\/contact-invitations|billing\/contact-invitations)\/)(?!accept(?:[/?]|$))[^/?#]+/;

/**
 * A URL as it may be logged: the segment after `/invitations/` or `/reset/` and the values of
 * secret-looking query parameters replaced by `[redacted]`. Link tokens are bearer secrets: a
 * log line must not be enough to take over an account or join a proposal team.
 */
export function redactUrl(url: string): string {
  const q = url.indexOf('?');
  const pathPart = (q < 0 ? url : url.slice(0, q)).replace(SECRET_PATH_SEGMENT, `$1${REDACTED}`);
  if (q < 0) return pathPart;
  const query = url
    .slice(q + 1)
    .split('&')
    .map((pair) => {
      const eq = pair.indexOf('=');
      if (eq < 0) return pair;
      let key = pair.slice(0, eq);
      try {
        key = decodeURIComponent(key.replace(/\+/g, ' '));
      } catch {
        return `${pair.slice(0, eq)}=${REDACTED}`;
      }
      return SECRET_QUERY_KEY.test(key) ? `${pair.slice(0, eq)}=${REDACTED}` : pair;
    })
    .join('&');
  return `${pathPart}?${query}`;
}

type Req = IncomingMessage & { originalUrl?: string; id?: unknown };

/**
 * pino-http with a short line per request: request id, method, redacted URL, status and
 * response time. No headers (cookies, tokens, referers with links in them) and no params or
 * query objects, whatever the log level.
 */
export function createRequestLogger(logger: Logger): HttpLogger {
  return pinoHttp({
    logger,
    genReqId: (req, res) => {
      const id = randomUUID();
      res.setHeader('X-Request-Id', id);
      return id;
    },
    autoLogging: { ignore: (req) => (req as Req).url === '/api/health' },
    // Serializers receive pino-http's raw objects through `wrapSerializers: false`.
    wrapSerializers: false,
    serializers: {
      req: (req: Req) => ({ id: req.id, method: req.method, url: redactUrl(req.originalUrl ?? req.url ?? '') }),
      res: (res: ServerResponse) => ({ statusCode: res.statusCode }),
    },
  });
}
