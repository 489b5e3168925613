import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { createCalendarFeedController } from './calendar-feed-controller';

/**
 * Mounted at /api/calendar-feeds, outside the signed-in API (no session and no CSRF cookie):
 * GET /:token.ics answers a node's night plan as iCalendar to anyone holding the link, for
 * calendar applications that cannot sign in. Facility managers make and stop the links under
 * /api/night-plans/cycles/:cycleId/nodes/:nodeId/calendar-feed. Listed in
 * test/api/night-plans-permissions.spec.ts.
 */
export function createCalendarFeedRoutes(ctx: AppContext): Router {
  const c = createCalendarFeedController(ctx);
  const router = Router();
  router.get('/:token.ics', c.feed);
  return router;
}
