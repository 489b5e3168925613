import type { Request, Response } from 'express';
import type { AppContext } from '../../../app-context';
import { idParamSchema, nodeIdQuerySchema, targetParamsSchema } from '../../../http/params';
import { planListQuerySchema } from '@spincycle/shared/proposals/plan-types';
import {
  getPlanExplanation,
  getPlanMarkers,
  getPlanRunStatus,
  getProposalPlans,
  getTargetSky,
  recomputeProposalPlans,
} from './plan-service';
import { PlanPageCache } from './plan-page-cache';

/** Handlers of the plan routes (plans, run status, recompute, sky windows of a target). */
export function createPlanController(ctx: AppContext) {
  const pages = new PlanPageCache();
  return {
    async plans(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      const query = planListQuerySchema.parse(req.query);
      const page = await getProposalPlans(ctx, req.user!, id, query, pages);
      // With its ETag set, send answers 304 to a request that already holds this page.
      res.set('ETag', page.etag).type('application/json').send(page.body);
    },
    async status(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getPlanRunStatus(ctx, req.user!, id));
    },
    async markers(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getPlanMarkers(ctx, req.user!, id));
    },
    async recompute(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.status(202).json(await recomputeProposalPlans(ctx, req.user!, id));
    },
    async explanation(req: Request, res: Response) {
      const { id, targetId } = targetParamsSchema.parse(req.params);
      const { nodeId } = nodeIdQuerySchema.parse(req.query);
      res.json(await getPlanExplanation(ctx, req.user!, id, targetId, nodeId));
    },
    async sky(req: Request, res: Response) {
      const { id, targetId } = targetParamsSchema.parse(req.params);
      const { nodeId } = nodeIdQuerySchema.parse(req.query);
      res.json(await getTargetSky(ctx, req.user!, id, targetId, nodeId));
    },
  };
}
