import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole } from '../../http/auth-middleware';
import { createAccountController } from './account-controller';

/** Mounted at /api/admin/accounts: administrators only. */
export function createAccountRoutes(ctx: AppContext): Router {
  const c = createAccountController(ctx);
  const router = Router();
  router.use(requireRole('administrator'));
  router.get('/', c.list);
  router.patch('/:id', c.update);
  return router;
}
