import type { Request, Response } from 'express';
import { z } from 'zod';
import { awardInputSchema, releaseSchema } from '@spincycle/shared/awards/awards';
import { idParam } from '@spincycle/shared/http/ids';
import type { AppContext } from '../../app-context';
import { decideAward, getAuditLog, getAwardBoard, getTeamDecision, listAwardCycles, releaseAwards } from './award-service';

const cycleParamsSchema = z.object({ cycleId: idParam });
const proposalParamsSchema = z.object({ proposalId: idParam });

/** Handlers of /api/awards: parse, call the service, choose the status. */
export function createAwardController(ctx: AppContext) {
  return {
    async cycles(_req: Request, res: Response) {
      res.json(await listAwardCycles(ctx));
    },
    async board(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await getAwardBoard(ctx, cycleId));
    },
    async decide(req: Request, res: Response) {
      const { proposalId } = proposalParamsSchema.parse(req.params);
      const input = awardInputSchema.parse(req.body);
      res.json(await decideAward(ctx, req.user!, proposalId, input));
    },
    async release(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      releaseSchema.parse(req.body);
      res.json(await releaseAwards(ctx, req.user!, cycleId));
    },
    async audit(req: Request, res: Response) {
      const { cycleId } = cycleParamsSchema.parse(req.params);
      res.json(await getAuditLog(ctx, cycleId));
    },
    async teamDecision(req: Request, res: Response) {
      const { proposalId } = proposalParamsSchema.parse(req.params);
      res.json(await getTeamDecision(ctx, req.user!, proposalId));
    },
  };
}
