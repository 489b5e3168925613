import { Router } from 'express';
import rateLimit, { ipKeyGenerator } from 'express-rate-limit';
import type { AppPassport } from './passport-setup';
import type { AppContext } from '../../app-context';
import type { Csrf } from '../../http/csrf';
import { createAuthController } from './auth-controller';

/** Limits guesses per address and per client, answering in the API's error shape. */
function limiter(max: number, windowMinutes: number, by: 'ip' | 'ip+email', what: string) {
  return rateLimit({
    windowMs: windowMinutes * 60_000,
    limit: max,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const ip = ipKeyGenerator(req.ip ?? '');
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return by === 'ip' ? ip : `${ip}|${email}`;
    },
    handler: (_req, res) => {
      res
        .status(429)
        .json({ code: 'too_many_attempts', message: `Too many ${what} attempts. Wait ${windowMinutes} minutes and try again.` });
    },
  });
}

export function createAuthRoutes(ctx: AppContext, passport: AppPassport, csrf: Csrf): Router {
  const c = createAuthController(ctx, passport, csrf);
  const { LOGIN_RATE_LIMIT: max, LOGIN_RATE_WINDOW_MINUTES: minutes } = ctx.config;
  const router = Router();
  router.get('/session', c.session);
  router.post('/sign-in', limiter(max * 5, minutes, 'ip', 'sign-in'), limiter(max, minutes, 'ip+email', 'sign-in'), c.signIn);
  router.post('/sign-out', c.signOut);
  router.post('/sign-up', limiter(max, minutes, 'ip', 'sign-up'), c.signUp);
  router.post('/password-reset', limiter(max, 60, 'ip+email', 'password reset'), c.requestReset);
  router.post('/password-reset/confirm', limiter(max, minutes, 'ip', 'password reset'), c.confirmReset);
  return router;
}
