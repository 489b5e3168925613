import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole } from '../../http/auth-middleware';
import { createMailOutboxController } from './mail-outbox-controller';

/** Mounted at /api/admin/mail-outbox: administrators only. */
export function createMailOutboxRoutes(ctx: AppContext): Router {
  const c = createMailOutboxController(ctx);
  const router = Router();
  router.use(requireRole('administrator'));
  router.get('/', c.list);
  router.post('/:id/resend', c.resend);
  return router;
}
