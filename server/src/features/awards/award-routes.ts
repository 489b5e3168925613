import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { createAwardController } from './award-controller';

/**
 * Mounted at /api/awards: the facility manager's award board, decisions, release and audit
 * log (facility managers only); and the team's view of its released decision (signed in;
 * the service answers 404 to anyone outside the team who is not a facility manager).
 */
export function createAwardRoutes(ctx: AppContext): Router {
  const c = createAwardController(ctx);
  const router = Router();
  router.get('/cycles', requireRole('facility_manager'), c.cycles);
  router.get('/cycles/:cycleId', requireRole('facility_manager'), c.board);
  router.post('/cycles/:cycleId/release', requireRole('facility_manager'), c.release);
  router.get('/cycles/:cycleId/audit', requireRole('facility_manager'), c.audit);
  router.put('/proposals/:proposalId', requireRole('facility_manager'), c.decide);
  router.get('/proposals/:proposalId/decision', requireSignedIn, c.teamDecision);
  return router;
}
