import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { requireSignedIn } from '../../../http/auth-middleware';
import { createStandingController } from './standing-controller';

/**
 * Routes of review's standing/ sub-feature (mounted by review-routes.ts under /api/review).
 * Every route: signed in (401), then the service decides: facility managers, or the panel's
 * chair once the cycle's review deadline has passed (403 for everyone else). Triage is for
 * managers only.
 */
export function createStandingRoutes(ctx: AppContext): Router {
  const c = createStandingController(ctx);
  const router = Router();
  router.get('/panels/:panelId/statistics', requireSignedIn, c.statistics);
  router.put('/panels/:panelId/spread-threshold', requireSignedIn, c.spreadThreshold);
  router.put('/panels/:panelId/triage', requireSignedIn, c.triage);
  router.get('/panels/:panelId/standing', requireSignedIn, c.standing);
  router.post('/panels/:panelId/standing/initialise', requireSignedIn, c.standing);
  router.post('/panels/:panelId/standing/moves', requireSignedIn, c.move);
  router.post('/panels/:panelId/standing/lock', requireSignedIn, c.lock);
  router.get('/panels/:panelId/matrix.csv', requireSignedIn, c.matrixCsv);
  router.get('/panels/:panelId/standing.csv', requireSignedIn, c.standingCsv);
  router.get('/cycles/:cycleId/pressure', requireSignedIn, c.pressure);
  return router;
}
