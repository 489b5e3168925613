import { Authenticator } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { loadSessionUser, verifyCredentials } from './auth-service';

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
  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: number, done) => {
    loadSessionUser(ctx, id).then((user) => done(null, user ?? false), done);
  });
  return passport;
}

export type AppPassport = ReturnType<typeof createPassport>;
