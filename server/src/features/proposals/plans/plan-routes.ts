import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { createPlanController } from './plan-controller';

/**
 * The target plans of a proposal, mounted by createProposalRoutes (under /api/proposals,
 * signed in): the paged list, the run status, the chart markers, a recompute, and one
 * target's sky windows and explained plan on a node.
 */
export function createPlanRoutes(ctx: AppContext): Router {
  const plans = createPlanController(ctx);
  const router = Router();
  router.get('/:id/targets/:targetId/sky', plans.sky);
  router.get('/:id/targets/:targetId/plan', plans.explanation);
  router.get('/:id/plans', plans.plans);
  router.get('/:id/plans/status', plans.status);
  router.get('/:id/plans/markers', plans.markers);
  router.post('/:id/plans/recompute', plans.recompute);
  return router;
}
