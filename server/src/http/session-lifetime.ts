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
 * Renews a session's stored expiry at most once per `intervalMs` (per process). express-session
 * with a rolling cookie touches the store on every request it does not save, and holds the
 * answer until that UPDATE returns; a signed-in user's every call paid a write for an expiry
 * that moves by seconds. The cookie is still renewed on every answer; the stored expiry lags
 * it by at most `intervalMs`, which the rolling lifetime (hours) does not notice. A save
 * (a changed session) always writes and counts as a touch.
 */
export function throttleSessionTouch(store: Store, intervalMs: number, now: () => Date): void {
  const touch = store.touch?.bind(store);
  if (!touch) return;
  const lastWrite = new Map<string, number>();
  const forget = () => {
    // Bounded: forget renewals older than the interval (they would be written again anyway).
    const cutoff = now().getTime() - intervalMs;
    for (const [sid, at] of lastWrite) if (at < cutoff) lastWrite.delete(sid);
  };
  const remember = (sid: string) => {
    if (lastWrite.size >= 10_000) forget();
    lastWrite.set(sid, now().getTime());
  };
  store.touch = (sid: string, sess: SessionData, callback?: (err?: unknown) => void) => {
    const at = lastWrite.get(sid);
    if (at !== undefined && now().getTime() - at < intervalMs) {
      callback?.();
      return;
    }
    remember(sid);
    touch(sid, sess, (err?: unknown) => {
      if (err) lastWrite.delete(sid);
      callback?.(err);
    });
  };
  const set = store.set.bind(store);
  store.set = (sid: string, sess: SessionData, callback?: (err?: unknown) => void) => {
    remember(sid);
    set(sid, sess, callback);
  };
  const destroy = store.destroy.bind(store);
  store.destroy = (sid: string, callback?: (err?: unknown) => void) => {
    lastWrite.delete(sid);
    destroy(sid, callback);
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
