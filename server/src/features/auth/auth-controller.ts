import type { NextFunction, Request, Response } from 'express';
import type { AppPassport } from './passport-setup';
import {
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  SIGN_UP_ACCEPTED_MESSAGE,
  signInSchema,
  signUpSchema,
  type SessionUser,
  type SignUpAccepted,
} from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import type { AppError } from '../../http/app-error';
import type { Csrf } from '../../http/csrf';
import { confirmPasswordReset, invalidCredentials, noteSignIn, requestPasswordReset, signUp } from './auth-service';
import { requireAcceptablePassword } from './password-policy';

/** Answer of POST /api/auth/password-reset, whatever the address. */
export const RESET_REQUESTED_MESSAGE = 'If an account exists for that address, a reset link is on its way.';

/**
 * Runs work that must not shape the answer (whether an account exists, how long the lookup,
 * hashing and SMTP take) after the response has been sent; failures are logged, never shown.
 */
function continueAfterResponse(ctx: AppContext, what: string, work: () => Promise<void>): void {
  setImmediate(() => {
    work().catch((err: unknown) => ctx.logger.error({ err }, `${what} failed after the response`));
  });
}
function logIn(req: Request, user: SessionUser): Promise<void> {
  // passport ≥ 0.6 regenerates the session here, which defeats session fixation.
  return new Promise((resolve, reject) => req.login(user, (err) => (err ? reject(err) : resolve())));
}

export function createAuthController(ctx: AppContext, passport: AppPassport, csrf: Csrf) {
  return {
    session(req: Request, res: Response) {
      res.json({ user: req.user ?? null });
    },

    async signIn(req: Request, res: Response, next: NextFunction) {
      req.body = signInSchema.parse(req.body);
      const user = await new Promise<SessionUser>((resolve, reject) => {
        passport.authenticate('local', { session: false }, (err: unknown, found: SessionUser | false, info?: { error?: AppError }) => {
          if (err) reject(err);
          else if (!found) reject(info?.error ?? invalidCredentials());
          else resolve(found);
        })(req, res, next);
      });
      await logIn(req, user);
      await noteSignIn(ctx, user.id);
      csrf.renew(req, res);
      res.json({ user });
    },

    async signOut(req: Request, res: Response) {
      await new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : resolve())));
      csrf.renew(req, res);
      res.status(204).end();
    },

    /**
     * 202 with the same body whether or not the address has an account; no session is
     * started (signing in would tell the two cases apart). The input is judged first, on its
     * own (schema, password rules), then the rest happens after the answer: see signUp.
     */
    async signUp(req: Request, res: Response) {
      const input = signUpSchema.parse(req.body);
      requireAcceptablePassword(input.password, input.email);
      const body: SignUpAccepted = { message: SIGN_UP_ACCEPTED_MESSAGE };
      res.status(202).json(body);
      continueAfterResponse(ctx, 'sign-up', () => signUp(ctx, input));
    },

    /** 202 at once with the same body for every address; lookup, token and mail follow the answer. */
    async requestReset(req: Request, res: Response) {
      const { email } = passwordResetRequestSchema.parse(req.body);
      res.status(202).json({ message: RESET_REQUESTED_MESSAGE });
      continueAfterResponse(ctx, 'password reset request', () => requestPasswordReset(ctx, email));
    },

    async confirmReset(req: Request, res: Response) {
      const input = passwordResetConfirmSchema.parse(req.body);
      await confirmPasswordReset(ctx, input);
      res.status(204).end();
    },
  };
}
