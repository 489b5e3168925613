import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { requireSignedIn } from '../../../http/auth-middleware';
import { createMemberController } from './member-controller';

/**
 * The team of a proposal, mounted by createProposalRoutes (under /api/proposals, signed in):
 * POST /:id/members invites a co-investigator, DELETE /:id/members/:memberId removes one.
 */
export function createMemberRoutes(ctx: AppContext): Router {
  const members = createMemberController(ctx);
  const router = Router();
  router.post('/:id/members', members.invite);
  router.delete('/:id/members/:memberId', members.remove);
  return router;
}

/** Mounted at /api/invitations: POST /accept for any signed-in person holding an invitation link. */
export function createInvitationRoutes(ctx: AppContext): Router {
  const members = createMemberController(ctx);
  const router = Router();
  router.post('/accept', requireSignedIn, members.accept);
  return router;
}
