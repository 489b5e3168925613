import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { createCycleController } from './cycle-controller';

/**
 * Mounted at /api/cycles: reads for every signed-in person (filtered by role), writes and the
 * list of a cycle's submitted proposals for facility managers (who manage cycles).
 */
export function createCycleRoutes(ctx: AppContext): Router {
  const c = createCycleController(ctx);
  const router = Router();
  router.get('/', requireSignedIn, c.list);
  router.get('/:id', requireSignedIn, c.get);
  router.get('/:id/proposals', requireRole('facility_manager'), c.proposals);
  router.post('/', requireRole('facility_manager'), c.create);
  router.put('/:id', requireRole('facility_manager'), c.update);
  return router;
}
