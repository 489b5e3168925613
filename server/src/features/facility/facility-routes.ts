import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { createFacilityController } from './facility-controller';

/**
 * The network (sites and nodes): reads for every signed-in person; a node's external rate is
 * changed by facility managers (PATCH /api/nodes/:id). Cycles: see features/cycles.
 */
export function createFacilityRoutes(ctx: AppContext): Router {
  const c = createFacilityController(ctx);
  const router = Router();
  router.get('/sites', requireSignedIn, c.sites);
  router.get('/nodes', requireSignedIn, c.nodes);
  router.patch('/nodes/:id', requireRole('facility_manager'), c.updateNode);
  return router;
}
