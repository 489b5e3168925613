import { Router } from 'express';
import type { AppContext } from '../../../app-context';

/** Routes of review's reviewing/ sub-feature (mounted by review-routes.ts under /api/review). */
export function createReviewingRoutes(_ctx: AppContext): Router {
  const router = Router();
  return router;
}
