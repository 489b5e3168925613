import type { RequestHandler } from 'express';
import type { Role } from '@spincycle/shared/accounts/roles';
import { AppError } from './app-error';

const notSignedIn = () => new AppError('not_signed_in', 'Sign in to continue', 401);

/** 401 unless someone is signed in. */
export const requireSignedIn: RequestHandler = (req, _res, next) => {
  if (!req.user) throw notSignedIn();
  next();
};

/** 401 when signed out, 403 when signed in without any of the roles. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) throw notSignedIn();
    if (!roles.some((r) => req.user!.roles.includes(r))) {
      throw new AppError('forbidden', `This needs the ${roles.join(' or ').replace(/_/g, ' ')} role`, 403);
    }
    next();
  };
}
