import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { requireRole, requireSignedIn } from '../../../http/auth-middleware';
import { createPanelController } from './panel-controller';

/**
 * Routes of review's panels/ sub-feature (mounted by review-routes.ts under /api/review):
 * facility managers set a cycle's review, form panels, put proposals in them and assign
 * reviewers (by hand or automatically), or run distributed review; a team's PI names the
 * team's reviewer (404 for anyone outside the team); reviewers declare their expertise.
 */
export function createPanelRoutes(ctx: AppContext): Router {
  const c = createPanelController(ctx);
  const manager = requireRole('facility_manager');
  const router = Router();
  router.get('/reviewers', manager, c.reviewers);
  router.get('/cycles/:cycleId/settings', manager, c.getSettings);
  router.put('/cycles/:cycleId/settings', manager, c.putSettings);
  router.get('/cycles/:cycleId/panels', manager, c.listPanels);
  router.post('/cycles/:cycleId/panels', manager, c.createPanel);
  router.get('/cycles/:cycleId/proposals', manager, c.cycleProposals);
  router.post('/cycles/:cycleId/distribute', manager, c.distribute);
  router.get('/cycles/:cycleId/team-reviewers', manager, c.teamReviewers);
  router.get('/panels/:panelId', manager, c.getPanel);
  router.put('/panels/:panelId', manager, c.updatePanel);
  router.delete('/panels/:panelId', manager, c.deletePanel);
  router.put('/panels/:panelId/proposals', manager, c.putProposals);
  router.get('/panels/:panelId/matrix', manager, c.matrix);
  router.put('/panels/:panelId/assignments', manager, c.toggle);
  router.post('/panels/:panelId/assign-automatically', manager, c.assignAutomatically);
  router.get('/proposals/:proposalId/team-reviewer', requireSignedIn, c.getTeamReviewer);
  router.put('/proposals/:proposalId/team-reviewer', requireSignedIn, c.putTeamReviewer);
  router.get('/me/panels', requireRole('reviewer'), c.myPanels);
  router.get('/me/expertise', requireRole('reviewer'), c.getExpertise);
  router.put('/me/expertise', requireRole('reviewer'), c.putExpertise);
  return router;
}
