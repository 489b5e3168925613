import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { singleFileUpload } from '../../http/upload-limits';
import { EXECUTION_CSV_MAX_BYTES } from './execution-csv';
import { createNightPlanController } from './night-plan-controller';

/**
 * Mounted at /api/night-plans: facility managers' cycles, builds, timelines, nights, lost
 * nights, execution log, exports and each node's calendar subscription link (see whether one
 * works, make a new one, which stops the previous one, or stop it; the link's secret is answered
 * once, by the POST, and the feed itself is served without a session by calendar-feed-routes.ts
 * at /api/calendar-feeds/:token.ics); a program's progress for its team and facility managers
 * (the service answers 404 to everyone else). Every route is listed in
 * test/api/night-plans-permissions.spec.ts.
 */
export function createNightPlanRoutes(ctx: AppContext): Router {
  const c = createNightPlanController(ctx);
  const manager = requireRole('facility_manager');
  const upload = singleFileUpload({
    field: 'file',
    maxBytes: EXECUTION_CSV_MAX_BYTES,
    tooLargeMessage: 'The execution log is larger than 2 MB',
  });
  const router = Router();
  router.get('/cycles', manager, c.cycles);
  router.get('/cycles/:cycleId', manager, c.overview);
  router.post('/cycles/:cycleId/builds', manager, c.build);
  router.get('/cycles/:cycleId/builds/latest', manager, c.latestBuild);
  router.get('/cycles/:cycleId/nodes/:nodeId/timeline', manager, c.timeline);
  router.get('/cycles/:cycleId/nodes/:nodeId/nights/:date', manager, c.night);
  router.post('/cycles/:cycleId/nodes/:nodeId/lost-nights', manager, c.markLost);
  router.delete('/cycles/:cycleId/nodes/:nodeId/lost-nights/:date', manager, c.unmarkLost);
  router.get('/cycles/:cycleId/nodes/:nodeId/plan.csv', manager, c.planCsv);
  router.get('/cycles/:cycleId/nodes/:nodeId/plan.ics', manager, c.planIcs);
  router.get('/cycles/:cycleId/nodes/:nodeId/calendar-feed', manager, c.calendarFeed);
  router.post('/cycles/:cycleId/nodes/:nodeId/calendar-feed', manager, c.makeCalendarFeed);
  router.delete('/cycles/:cycleId/nodes/:nodeId/calendar-feed', manager, c.stopCalendarFeed);
  router.post('/cycles/:cycleId/execution', manager, upload, c.execution);
  router.put('/visits/:visitId', manager, c.visitStatus);
  router.get('/programs/:proposalId', requireSignedIn, c.program);
  return router;
}
