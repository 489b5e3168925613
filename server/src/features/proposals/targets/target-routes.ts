import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { requireSignedIn } from '../../../http/auth-middleware';
import { singleFileUpload, TARGET_CSV_MAX_BYTES } from '../../../http/upload-limits';
import { requireEditableProposalBeforeUpload } from '../proposal-access';
import { createTargetController } from './target-controller';

/**
 * The target list of a proposal, mounted by createProposalRoutes (under /api/proposals,
 * signed in): one row at a time, the CSV upload and the CSV export. A target's sky windows and
 * plan (`/:id/targets/:targetId/sky`, `…/plan`) are in plans/plan-routes.ts.
 */
export function createTargetRoutes(ctx: AppContext): Router {
  const targets = createTargetController(ctx);
  const csvUpload = singleFileUpload({
    field: 'file',
    maxBytes: TARGET_CSV_MAX_BYTES,
    tooLargeMessage: 'The target list is larger than 5 MB',
  });
  // Who may upload is settled before the multipart body is read (proposal-access.ts).
  const uploadAccess = requireEditableProposalBeforeUpload(ctx);

  const router = Router();
  router.get('/:id/targets', targets.list);
  router.post('/:id/targets', targets.add);
  router.post('/:id/targets/upload', uploadAccess, csvUpload, targets.upload);
  router.get('/:id/targets.csv', targets.exportCsv);
  router.put('/:id/targets/:targetId', targets.update);
  router.delete('/:id/targets/:targetId', targets.remove);
  return router;
}

/** Mounted at /api/target-lists: GET /example.csv, a downloadable example list. */
export function createTargetListRoutes(ctx: AppContext): Router {
  const targets = createTargetController(ctx);
  const router = Router();
  router.get('/example.csv', requireSignedIn, targets.example);
  return router;
}
