import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { createPanelRoutes } from './panels/panel-routes';
import { createReviewingRoutes } from './reviewing/reviewing-routes';
import { createStandingRoutes } from './standing/standing-routes';

/**
 * /api/review (signed in): the committee's journey. Three sub-features, each with its own
 * routes → controller → service → repository:
 * - panels/: the manager's review settings, panels, proposals to panels, reviewer assignment
 *   (matrix, by hand and automatic), triage, distributed review's team reviewers;
 * - reviewing/: the reviewer's conflicts, grading table, proposal reading, technical assessment;
 * - standing/: the chair's and manager's statistics, standing, pressure and CSV exports.
 */
export function createReviewRoutes(ctx: AppContext): Router {
  const router = Router();
  router.use(createPanelRoutes(ctx));
  router.use(createReviewingRoutes(ctx));
  router.use(createStandingRoutes(ctx));
  return router;
}
