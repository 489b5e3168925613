import type { Request, Response } from 'express';
import {
  declareConflictSchema,
  myReviewsQuerySchema,
  reviewProposalParamsSchema,
  reviewSkyQuerySchema,
  reviewTargetParamsSchema,
  saveReviewSchema,
  submitReviewsSchema,
} from '@spincycle/shared/review/reviewing';
import type { AppContext } from '../../../app-context';
import { KeptAnswers } from '../kept-answers';
import { AssessmentCache } from './assessment-cache';
import {
  declareConflict,
  getMyReviewsBody,
  getReviewJustification,
  getReviewProposal,
  getReviewTargetSky,
  saveReview,
  submitReviews,
} from './reviewing-service';

/** Handlers of /api/review/my… (the reviewer's own reviews). */
export function createReviewingController(ctx: AppContext) {
  /** Technical assessments computed once per version of a proposal's plans (see assessment-cache.ts). */
  const assessments = new AssessmentCache();
  /** Grading tables kept while the review's read versions are unchanged (see kept-answers.ts). */
  const tables = new KeptAnswers();
  return {
    async list(req: Request, res: Response) {
      const { cycleId } = myReviewsQuerySchema.parse(req.query);
      const table = await getMyReviewsBody(ctx, req.user!, cycleId, assessments, tables);
      // With its ETag set, send answers 304 to a request that already holds this answer.
      res.set('ETag', table.etag).type('application/json').send(table.body);
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
    async sky(req: Request, res: Response) {
      const { proposalId, targetId } = reviewTargetParamsSchema.parse(req.params);
      const { nodeId } = reviewSkyQuerySchema.parse(req.query);
      res.json(await getReviewTargetSky(ctx, req.user!, proposalId, targetId, nodeId));
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
