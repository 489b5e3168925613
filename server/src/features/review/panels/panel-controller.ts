import type { Request, Response } from 'express';
import { z } from 'zod';
import { versionSchema } from '@spincycle/shared/http/ids';
import {
  assignmentToggleSchema,
  cycleParamsSchema,
  expertiseSchema,
  panelInputSchema,
  panelParamsSchema,
  panelProposalsSchema,
  panelUpdateSchema,
  proposalParamsSchema,
  reviewSettingsSchema,
  teamReviewerSchema,
} from '@spincycle/shared/review/panels';
import type { AppContext } from '../../../app-context';
import { assignAutomatically, getMatrixBody, toggleAssignment } from './assignment-service';
import { KeptAnswers } from '../kept-answers';
import {
  createPanel,
  deletePanel,
  getExpertise,
  getMyPanels,
  getPanel,
  getReviewSettings,
  listCycleReviewProposals,
  listPanels,
  listReviewers,
  putExpertise,
  putPanelProposals,
  putReviewSettings,
  updatePanel,
} from './panel-service';
import { distribute, getTeamReviewer, listTeamReviewers, putTeamReviewer } from './team-review-service';

/** `?version=` of DELETE /api/review/panels/:panelId. */
const deleteQuerySchema = z.object({
  version: z
    .string({ message: 'give the version you read' })
    .regex(/^\d{1,10}$/, { message: 'must be a positive whole number' })
    .transform(Number)
    .pipe(versionSchema),
});

/** Handlers of the panels sub-feature: parse, call the service, choose the status. */
export function createPanelController(ctx: AppContext) {
  /** Matrix answers kept while the review's read versions are unchanged (see kept-answers.ts). */
  const matrices = new KeptAnswers();
  return {
    async reviewers(_req: Request, res: Response) {
      res.json(await listReviewers(ctx));
    },
    async getSettings(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await getReviewSettings(ctx, cycleId));
    },
    async putSettings(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await putReviewSettings(ctx, cycleId, reviewSettingsSchema.parse(req.body)));
    },
    async listPanels(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await listPanels(ctx, cycleId));
    },
    async createPanel(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.status(201).json(await createPanel(ctx, cycleId, panelInputSchema.parse(req.body)));
    },
    async cycleProposals(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await listCycleReviewProposals(ctx, cycleId));
    },
    async getPanel(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await getPanel(ctx, panelId));
    },
    async updatePanel(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await updatePanel(ctx, panelId, panelUpdateSchema.parse(req.body)));
    },
    async deletePanel(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      const { version } = deleteQuerySchema.parse(req.query);
      await deletePanel(ctx, panelId, version);
      res.status(204).end();
    },
    async putProposals(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await putPanelProposals(ctx, panelId, panelProposalsSchema.parse(req.body)));
    },
    async matrix(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      const matrix = await getMatrixBody(ctx, panelId, matrices);
      // With its ETag set, send answers 304 to a request that already holds this answer.
      res.set('ETag', matrix.etag).type('application/json').send(matrix.body);
    },
    async toggle(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await toggleAssignment(ctx, req.user!, panelId, assignmentToggleSchema.parse(req.body)));
    },
    async assignAutomatically(req: Request, res: Response) {
      const { panelId } = panelParamsSchema.parse(req.params);
      res.json(await assignAutomatically(ctx, req.user!, panelId));
    },
    async getTeamReviewer(req: Request, res: Response) {
      const { proposalId } = proposalParamsSchema.parse(req.params);
      res.json(await getTeamReviewer(ctx, req.user!, proposalId));
    },
    async putTeamReviewer(req: Request, res: Response) {
      const { proposalId } = proposalParamsSchema.parse(req.params);
      res.json(await putTeamReviewer(ctx, req.user!, proposalId, teamReviewerSchema.parse(req.body)));
    },
    async distribute(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await distribute(ctx, req.user!, cycleId));
    },
    async teamReviewers(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await listTeamReviewers(ctx, cycleId));
    },
    async myPanels(req: Request, res: Response) {
      res.json(await getMyPanels(ctx, req.user!));
    },
    async getExpertise(req: Request, res: Response) {
      res.json(await getExpertise(ctx, req.user!));
    },
    async putExpertise(req: Request, res: Response) {
      res.json(await putExpertise(ctx, req.user!, expertiseSchema.parse(req.body)));
    },
  };
}
