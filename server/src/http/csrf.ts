import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { csrfSync } from 'csrf-sync';
import { AppError } from './app-error';

/**
 * CSRF protection for cookie sessions. The token travels in a readable `XSRF-TOKEN` cookie,
 * which Angular's HttpClient sends back as the `X-XSRF-TOKEN` header on every unsafe request.
 *
 * - Signed in: the synchronizer-token pattern (csrf-sync); the token lives in the stored session.
 * - Signed out: a signed double-submit token (`nonce.HMAC(secret, nonce)`) that needs no stored
 *   session, so that visitors who only read pages or open the sign-in, sign-up and reset forms
 *   leave no session row behind. An unsafe request must echo the cookie in the header, and the
 *   token must carry the server's signature (a cookie planted by someone else cannot be forged).
 */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export function createCsrf(options: { secureCookies: boolean; secret: string }) {
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.headers[XSRF_HEADER] as string | undefined,
  });

  const sign = (nonce: string) => createHmac('sha256', options.secret).update(`xsrf-signed-out:${nonce}`).digest('base64url');
  const newSignedOutToken = () => {
    const nonce = randomBytes(18).toString('base64url');
    return `${nonce}.${sign(nonce)}`;
  };
  const isSignedOutToken = (token: unknown): token is string => {
    if (typeof token !== 'string') return false;
    const [nonce, mac, extra] = token.split('.');
    if (!nonce || !mac || extra !== undefined) return false;
    const expected = Buffer.from(sign(nonce));
    const given = Buffer.from(mac);
    return given.length === expected.length && timingSafeEqual(given, expected);
  };

  const setCookie = (res: Response, token: string) =>
    res.cookie(XSRF_COOKIE, token, { httpOnly: false, sameSite: 'strict', secure: options.secureCookies, path: '/' });

  /** Issues (or re-sends) the token cookie when the request does not carry the current one. */
  const issue: RequestHandler = (req, res, next) => {
    const current = req.cookies?.[XSRF_COOKIE] as string | undefined;
    const token = req.user ? generateToken(req) : isSignedOutToken(current) ? current : newSignedOutToken();
    if (current !== token) setCookie(res, token);
    next();
  };

  /** After sign-in or sign-out the session is new: give it a new token at once. */
  const renew = (req: Request, res: Response) => setCookie(res, req.user ? generateToken(req, true) : newSignedOutToken());

  const refuse = () =>
    new AppError('csrf_failed', 'The page’s security token is missing or out of date. Reload the page and try again.', 403);

  const protect: RequestHandler = (req, res, next) => {
    if (SAFE_METHODS.has(req.method)) {
      next();
      return;
    }
    if (!req.user) {
      const header = req.headers[XSRF_HEADER];
      const ok = isSignedOutToken(header) && header === req.cookies?.[XSRF_COOKIE];
      next(ok ? undefined : refuse());
      return;
    }
    csrfSynchronisedProtection(req, res, (err?: unknown) => next(err ? refuse() : undefined));
  };

  return { issue, renew, protect };
}

export type Csrf = ReturnType<typeof createCsrf>;
