import { Authenticator } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { ROLES, type Role } from '@spincycle/shared/accounts/roles';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { loadSessionUser, verifyCredentials } from './auth-service';

/** The session's copy of its account, or undefined if it is not one (roles in their usual order). */
export function toStoredSessionUser(stored: unknown): SessionUser | undefined {
  if (typeof stored !== 'object' || stored === null) return undefined;
  const u = stored as Partial<Record<keyof SessionUser, unknown>>;
  if (typeof u.id !== 'number' || typeof u.email !== 'string' || typeof u.displayName !== 'string') return undefined;
  if (typeof u.affiliation !== 'string' || !Array.isArray(u.roles)) return undefined;
  const roles = u.roles.filter((r): r is Role => (ROLES as readonly unknown[]).includes(r));
  roles.sort((a, b) => ROLES.indexOf(a) - ROLES.indexOf(b));
  return { id: u.id, email: u.email, displayName: u.displayName, affiliation: u.affiliation, roles };
}

/** A passport instance of this app (not the global one, so several apps can live in one test process). */
export function createPassport(ctx: AppContext) {
  const passport = new Authenticator();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      verifyCredentials(ctx, email, password).then(
        (user) => done(null, user),
        (err) => (err instanceof AppError ? done(null, false, { message: err.message, error: err } as never) : done(err)),
      );
    }),
  );
  // The session keeps the account as a request needs it; the database rewrites that copy on
  // every change of the account or its roles (migration 20270110000200), so a request reads
  // the session row alone. A session stored with the bare id (before) loads the account.
  passport.serializeUser((user, done) => done(null, user));
  passport.deserializeUser((stored: unknown, done) => {
    if (typeof stored === 'number') {
      loadSessionUser(ctx, stored).then((user) => done(null, user ?? false), done);
      return;
    }
    done(null, toStoredSessionUser(stored) ?? false);
  });
  return passport;
}

export type AppPassport = ReturnType<typeof createPassport>;
