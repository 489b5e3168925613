import type { Request, Response } from 'express';
import { cycleInputSchema, cycleUpdateSchema } from '@spincycle/shared/cycles/cycle-schemas';
import type { AppContext } from '../../app-context';
import { idParamSchema } from '../../http/params';
import { createCycle, getCycleFor, listCyclesFor, updateCycle } from './cycle-service';

/** Handlers of /api/cycles: parse, call the service, choose the status. */
export function createCycleController(ctx: AppContext) {
  return {
    async list(req: Request, res: Response) {
      res.json(await listCyclesFor(ctx, req.user!));
    },
    async get(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getCycleFor(ctx, req.user!, id));
    },
    async create(req: Request, res: Response) {
      res.status(201).json(await createCycle(ctx, req.user!, cycleInputSchema.parse(req.body)));
    },
    async update(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await updateCycle(ctx, id, cycleUpdateSchema.parse(req.body)));
    },
  };
}
