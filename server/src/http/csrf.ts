import type { Request, RequestHandler, Response } from 'express';
import { csrfSync } from 'csrf-sync';
import { AppError } from './app-error';

/**
 * CSRF protection for cookie sessions: the synchronizer-token pattern (csrf-sync). The
 * token lives in the session and is mirrored into a readable `XSRF-TOKEN` cookie, which
 * Angular's HttpClient sends back as the `X-XSRF-TOKEN` header on every unsafe request.
 */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

export function createCsrf(secureCookies: boolean) {
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.headers[XSRF_HEADER] as string | undefined,
  });

  const setCookie = (res: Response, token: string) =>
    res.cookie(XSRF_COOKIE, token, { httpOnly: false, sameSite: 'strict', secure: secureCookies, path: '/' });

  /** Issues (or re-sends) the token cookie when the request does not carry the current one. */
  const issue: RequestHandler = (req, res, next) => {
    const token = generateToken(req);
    if (req.cookies?.[XSRF_COOKIE] !== token) setCookie(res, token);
    next();
  };

  /** After sign-in or sign-out the session is new: give it a new token at once. */
  const renew = (req: Request, res: Response) => setCookie(res, generateToken(req, true));

  const protect: RequestHandler = (req, res, next) => {
    csrfSynchronisedProtection(req, res, (err?: unknown) => {
      if (err) {
        next(new AppError('csrf_failed', 'The page’s security token is missing or out of date. Reload the page and try again.', 403));
        return;
      }
      next();
    });
  };

  return { issue, renew, protect };
}

export type Csrf = ReturnType<typeof createCsrf>;
