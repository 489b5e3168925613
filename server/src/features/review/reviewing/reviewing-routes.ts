import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { requireRole } from '../../../http/auth-middleware';
import { createReviewingController } from './reviewing-controller';

/**
 * Routes of review's reviewing/ sub-feature (mounted by review-routes.ts under /api/review), all
 * for the reviewer role and about the signed-in reviewer's own assignments only:
 * GET /my (grading table), POST /my/submit, GET /my/:proposalId (reading),
 * GET /my/:proposalId/justification (PDF inline), GET /my/:proposalId/targets/:targetId/sky
 * (a target's sky windows from a node), PUT /my/:proposalId/review (save),
 * POST /my/:proposalId/conflict (declare a conflict).
 */
export function createReviewingRoutes(ctx: AppContext): Router {
  const c = createReviewingController(ctx);
  const reviewer = requireRole('reviewer');
  const router = Router();
  router.get('/my', reviewer, c.list);
  router.post('/my/submit', reviewer, c.submit);
  router.get('/my/:proposalId', reviewer, c.get);
  router.get('/my/:proposalId/justification', reviewer, c.justification);
  router.get('/my/:proposalId/targets/:targetId/sky', reviewer, c.sky);
  router.put('/my/:proposalId/review', reviewer, c.save);
  router.post('/my/:proposalId/conflict', reviewer, c.conflict);
  return router;
}
