import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { createJustificationRoutes } from './justification/justification-routes';
import { createPlanRoutes } from './plans/plan-routes';
import { createProposalController } from './proposal-controller';
import { createSubmissionRoutes } from './submission/submission-routes';
import { createTargetRoutes } from './targets/target-routes';
import { createMemberRoutes } from './team/member-routes';

/**
 * Mounted at /api/proposals. Every route needs a signed-in person; creating one needs the
 * proposer role. Everything under `/:id` is for the proposal's active team members only
 * (everyone else gets 404); the services check who may do what (only the PI submits,
 * withdraws, deletes, invites and removes members). The sub-features' routers (team,
 * justification, targets, plans, submission) are mounted here, after `requireSignedIn`, and
 * carry their full paths under /api/proposals (`/:id/targets`, `/:id/targets.csv`, …).
 */
export function createProposalRoutes(ctx: AppContext): Router {
  const proposals = createProposalController(ctx);

  const router = Router();
  router.use(requireSignedIn);
  router.get('/', proposals.list);
  router.post('/', requireRole('proposer'), proposals.create);
  router.get('/:id', proposals.get);
  router.patch('/:id', proposals.update);
  router.delete('/:id', proposals.remove);

  router.use(createMemberRoutes(ctx));
  router.use(createJustificationRoutes(ctx));
  router.use(createTargetRoutes(ctx));
  router.use(createPlanRoutes(ctx));
  router.use(createSubmissionRoutes(ctx));
  return router;
}
