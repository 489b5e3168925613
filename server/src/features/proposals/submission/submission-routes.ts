import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { createSubmissionController } from './submission-controller';

/**
 * Submission of a proposal, mounted by createProposalRoutes (under /api/proposals, signed in):
 * the readiness checklist, submit and withdraw (the PI only), and the summary PDF.
 */
export function createSubmissionRoutes(ctx: AppContext): Router {
  const submission = createSubmissionController(ctx);
  const router = Router();
  router.get('/:id/readiness', submission.readiness);
  router.post('/:id/submit', submission.submit);
  router.post('/:id/withdraw', submission.withdraw);
  router.get('/:id/summary.pdf', submission.summaryPdf);
  return router;
}
