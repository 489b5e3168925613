import type { Request, Response } from 'express';
import type { AppContext } from '../../../app-context';
import { idParamSchema } from '../../../http/params';
import { getReadiness, proposalSummaryPdf, submitProposal, withdrawProposal } from './submission-service';

/** Handlers of readiness, submit, withdraw and the summary PDF. */
export function createSubmissionController(ctx: AppContext) {
  return {
    async readiness(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getReadiness(ctx, req.user!, id));
    },
    async submit(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await submitProposal(ctx, req.user!, id));
    },
    async withdraw(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await withdrawProposal(ctx, req.user!, id));
    },
    async summaryPdf(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      const { filename, pdf } = await proposalSummaryPdf(ctx, req.user!, id);
      res.attachment(filename).type('application/pdf').setHeader('Cache-Control', 'no-store');
      res.send(pdf);
    },
  };
}
