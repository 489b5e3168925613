import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireSignedIn } from '../../http/auth-middleware';
import { createFacilityController } from './facility-controller';

/** Read-only views of the network (sites and nodes), for every signed-in person. Cycles: see features/cycles. */
export function createFacilityRoutes(ctx: AppContext): Router {
  const c = createFacilityController(ctx);
  const router = Router();
  router.get('/sites', requireSignedIn, c.sites);
  router.get('/nodes', requireSignedIn, c.nodes);
  return router;
}
