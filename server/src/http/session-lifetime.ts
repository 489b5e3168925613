import type { RequestHandler } from 'express';
import type { SessionData, Store } from 'express-session';

/**
 * Stores signed-in sessions only, stamped with the time they were first stored (`createdAt`,
 * epoch ms). A session without a signed-in account (a visitor, or what sign-out and an expired
 * session leave behind) is deleted instead of written: signed-out visitors keep their CSRF
 * token in a cookie (http/csrf.ts), so nothing of theirs needs a row. Sign-in regenerates the
 * session, so `createdAt` is the sign-in time.
 */
export function storeSignedInSessionsOnly(store: Store, now: () => Date): void {
  const set = store.set.bind(store);
  store.set = (sid: string, sess: SessionData, callback?: (err?: unknown) => void) => {
    const passport = (sess as { passport?: { user?: unknown } }).passport;
    if (passport?.user === undefined) {
      store.destroy(sid, callback);
      return;
    }
    if (typeof sess.createdAt !== 'number') sess.createdAt = now().getTime();
    set(sid, sess, callback);
  };
}

/**
 * The absolute lifetime of a session: however active it stays (the rolling cookie is renewed
 * on every request), it ends `hours` after sign-in. Runs after express-session and before
 * passport, so an expired session is replaced by an empty one (the old row is deleted) and the
 * request continues signed out.
 */
export function endSessionsOlderThan(hours: number, now: () => Date): RequestHandler {
  const maxMs = hours * 3600_000;
  return (req, _res, next) => {
    const createdAt = req.session?.createdAt;
    if (typeof createdAt === 'number' && now().getTime() - createdAt > maxMs) {
      req.session.regenerate((err) => next(err));
      return;
    }
    next();
  };
}
