import type { Request, Response } from 'express';
import {
  declareConflictSchema,
  myReviewsQuerySchema,
  reviewProposalParamsSchema,
  saveReviewSchema,
  submitReviewsSchema,
} from '@spincycle/shared/review/reviewing';
import type { AppContext } from '../../../app-context';
import { AssessmentCache } from './assessment-cache';
import { declareConflict, getReviewJustification, getReviewProposal, listMyReviews, saveReview, submitReviews } from './reviewing-service';

/** Handlers of /api/review/my… (the reviewer's own reviews). */
export function createReviewingController(ctx: AppContext) {
  /** Technical assessments computed once per version of a proposal's plans (see assessment-cache.ts). */
  const assessments = new AssessmentCache();
  return {
    async list(req: Request, res: Response) {
      const { cycleId } = myReviewsQuerySchema.parse(req.query);
      res.json(await listMyReviews(ctx, req.user!, cycleId, assessments));
    },
    async get(req: Request, res: Response) {
      const { proposalId } = reviewProposalParamsSchema.parse(req.params);
      res.json(await getReviewProposal(ctx, req.user!, proposalId, assessments));
    },
    async justification(req: Request, res: Response) {
      const { proposalId } = reviewProposalParamsSchema.parse(req.params);
      const file = await getReviewJustification(ctx, req.user!, proposalId);
      // Inline, so that the reading page shows it in a frame; the name is neutral (never the team's).
      res.type('application/pdf').setHeader('Content-Disposition', `inline; filename="${file.filename}"`);
      res.setHeader('Cache-Control', 'no-store');
      res.send(file.content);
    },
    async save(req: Request, res: Response) {
      const { proposalId } = reviewProposalParamsSchema.parse(req.params);
      const input = saveReviewSchema.parse(req.body);
      res.json(await saveReview(ctx, req.user!, proposalId, input));
    },
    async submit(req: Request, res: Response) {
      const { cycleId } = submitReviewsSchema.parse(req.body);
      res.json(await submitReviews(ctx, req.user!, cycleId));
    },
    async conflict(req: Request, res: Response) {
      const { proposalId } = reviewProposalParamsSchema.parse(req.params);
      const input = declareConflictSchema.parse(req.body);
      res.status(201).json(await declareConflict(ctx, req.user!, proposalId, input));
    },
  };
}
