import type { Request, Response } from 'express';
import type { AppContext } from '../../app-context';
import { idParamSchema, nodeIdQuerySchema, targetParamsSchema } from '../../http/params';
import { getPlanExplanation, getProposalPlans, getTargetSky, recomputeProposalPlans } from './plan-service';

/** Handlers of the plan routes (plans, recompute, sky windows of a target). */
export function createPlanController(ctx: AppContext) {
  return {
    async plans(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getProposalPlans(ctx, req.user!, id));
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
