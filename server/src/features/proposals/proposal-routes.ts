import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireRole, requireSignedIn } from '../../http/auth-middleware';
import { JUSTIFICATION_MAX_BYTES, singleFileUpload, TARGET_CSV_MAX_BYTES } from '../../http/upload-limits';
import { createJustificationController } from './justification-controller';
import { createMemberController } from './member-controller';
import { createPlanController } from './plan-controller';
import { requireEditableProposalBeforeUpload } from './proposal-access';
import { createProposalController } from './proposal-controller';
import { createSubmissionController } from './submission-controller';
import { createTargetController } from './target-controller';

/**
 * Mounted at /api/proposals. Every route needs a signed-in person; creating one needs the
 * proposer role. Everything under `/:id` is for the proposal's active team members only
 * (everyone else gets 404); the services check who may do what (only the PI submits,
 * withdraws, deletes, invites and removes members).
 */
export function createProposalRoutes(ctx: AppContext): Router {
  const proposals = createProposalController(ctx);
  const members = createMemberController(ctx);
  const justification = createJustificationController(ctx);
  const targets = createTargetController(ctx);
  const plans = createPlanController(ctx);
  const submission = createSubmissionController(ctx);
  const pdfUpload = singleFileUpload({ field: 'file', maxBytes: JUSTIFICATION_MAX_BYTES, tooLargeMessage: 'The justification PDF is larger than 10 MB' });
  const csvUpload = singleFileUpload({ field: 'file', maxBytes: TARGET_CSV_MAX_BYTES, tooLargeMessage: 'The target list is larger than 5 MB' });
  // Who may upload is settled before the multipart body is read (proposal-access.ts).
  const uploadAccess = requireEditableProposalBeforeUpload(ctx);

  const router = Router();
  router.use(requireSignedIn);
  router.get('/', proposals.list);
  router.post('/', requireRole('proposer'), proposals.create);
  router.get('/:id', proposals.get);
  router.patch('/:id', proposals.update);
  router.delete('/:id', proposals.remove);

  router.post('/:id/members', members.invite);
  router.delete('/:id/members/:memberId', members.remove);

  router.put('/:id/justification', uploadAccess, pdfUpload, justification.upload);
  router.get('/:id/justification', justification.download);

  router.get('/:id/targets', targets.list);
  router.post('/:id/targets', targets.add);
  router.post('/:id/targets/upload', uploadAccess, csvUpload, targets.upload);
  router.get('/:id/targets.csv', targets.exportCsv);
  router.put('/:id/targets/:targetId', targets.update);
  router.delete('/:id/targets/:targetId', targets.remove);
  router.get('/:id/targets/:targetId/sky', plans.sky);
  router.get('/:id/targets/:targetId/plan', plans.explanation);

  router.get('/:id/plans', plans.plans);
  router.get('/:id/plans/status', plans.status);
  router.get('/:id/plans/markers', plans.markers);
  router.post('/:id/plans/recompute', plans.recompute);

  router.get('/:id/readiness', submission.readiness);
  router.post('/:id/submit', submission.submit);
  router.post('/:id/withdraw', submission.withdraw);
  router.get('/:id/summary.pdf', submission.summaryPdf);
  return router;
}

/** Mounted at /api/invitations: POST /accept for any signed-in person holding an invitation link. */
export function createInvitationRoutes(ctx: AppContext): Router {
  const members = createMemberController(ctx);
  const router = Router();
  router.post('/accept', requireSignedIn, members.accept);
  return router;
}

/** Mounted at /api/target-lists: GET /example.csv, a downloadable example list. */
export function createTargetListRoutes(ctx: AppContext): Router {
  const targets = createTargetController(ctx);
  const router = Router();
  router.get('/example.csv', requireSignedIn, targets.example);
  return router;
}
