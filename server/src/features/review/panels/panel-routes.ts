import { Router } from 'express';
import type { AppContext } from '../../../app-context';

/** Routes of review's panels/ sub-feature (mounted by review-routes.ts under /api/review). */
export function createPanelRoutes(_ctx: AppContext): Router {
  const router = Router();
  return router;
}
