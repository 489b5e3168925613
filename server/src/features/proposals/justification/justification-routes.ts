import { Router } from 'express';
import type { AppContext } from '../../../app-context';
import { JUSTIFICATION_MAX_BYTES, singleFileUpload } from '../../../http/upload-limits';
import { requireEditableProposalBeforeUpload } from '../proposal-access';
import { createJustificationController } from './justification-controller';

/**
 * The justification PDF, mounted by createProposalRoutes (under /api/proposals, signed in):
 * PUT /:id/justification uploads it, GET /:id/justification downloads it.
 */
export function createJustificationRoutes(ctx: AppContext): Router {
  const justification = createJustificationController(ctx);
  const pdfUpload = singleFileUpload({
    field: 'file',
    maxBytes: JUSTIFICATION_MAX_BYTES,
    tooLargeMessage: 'The justification PDF is larger than 10 MB',
  });
  // Who may upload is settled before the multipart body is read (proposal-access.ts).
  const uploadAccess = requireEditableProposalBeforeUpload(ctx);

  const router = Router();
  router.put('/:id/justification', uploadAccess, pdfUpload, justification.upload);
  router.get('/:id/justification', justification.download);
  return router;
}
