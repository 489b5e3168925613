import type { NextFunction, Request, Response } from 'express';
import type { AppPassport } from './passport-setup';
import {
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  signInSchema,
  signUpSchema,
  type SessionUser,
} from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import type { AppError } from '../../http/app-error';
import type { Csrf } from '../../http/csrf';
import { confirmPasswordReset, invalidCredentials, noteSignIn, requestPasswordReset, signUp } from './auth-service';

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

    async signUp(req: Request, res: Response) {
      const input = signUpSchema.parse(req.body);
      const user = await signUp(ctx, input);
      await logIn(req, user);
      csrf.renew(req, res);
      res.status(201).json({ user });
    },

    async requestReset(req: Request, res: Response) {
      const { email } = passwordResetRequestSchema.parse(req.body);
      await requestPasswordReset(ctx, email);
      res.status(202).json({ message: 'If an account exists for that address, a reset link is on its way.' });
    },

    async confirmReset(req: Request, res: Response) {
      const input = passwordResetConfirmSchema.parse(req.body);
      await confirmPasswordReset(ctx, input);
      res.status(204).end();
    },
  };
}
