import type { Request, Response } from 'express';
import type { z } from 'zod';
import { cycleInputSchema, cycleUpdateSchema, type CycleInput } from '@spincycle/shared/cycles/cycle-schemas';
import { idParamSchema, MAX_DB_ID } from '@spincycle/shared/http/ids';
import { CONTROL_CHARACTER_MESSAGE, hasControlCharacters, refuseNul } from '@spincycle/shared/http/text';
import type { AppContext } from '../../app-context';
import { createCycle, getCycleFor, getCycleProposals, listCyclesFor, updateCycle } from './cycle-service';

/**
 * Edge checks the shared cycle schema leaves open (it belongs to the cycles contract): ids and
 * versions within the database's integer range, no NUL anywhere, no control characters in the
 * one-line texts. Each issue names its field, like the schema's own.
 */
function checkCycleEdge(cycle: CycleInput, ctx: z.RefinementCtx, prefix: (string | number)[] = []): void {
  refuseNul(cycle, ctx);
  if (hasControlCharacters(cycle.title)) ctx.addIssue({ code: 'custom', path: [...prefix, 'title'], message: CONTROL_CHARACTER_MESSAGE });
  cycle.categories.forEach((c, i) => {
    if (hasControlCharacters(c)) ctx.addIssue({ code: 'custom', path: [...prefix, 'categories', i], message: CONTROL_CHARACTER_MESSAGE });
  });
  cycle.nodes.forEach((n, i) => {
    if (n.nodeId > MAX_DB_ID)
      ctx.addIssue({ code: 'custom', path: [...prefix, 'nodes', i, 'nodeId'], message: `must be at most ${MAX_DB_ID}` });
  });
}

const cycleInputAtEdge = cycleInputSchema.superRefine((c, ctx) => checkCycleEdge(c, ctx));
const cycleUpdateAtEdge = cycleUpdateSchema.superRefine((u, ctx) => {
  if (u.version > MAX_DB_ID) ctx.addIssue({ code: 'custom', path: ['version'], message: `must be at most ${MAX_DB_ID}` });
  checkCycleEdge(u.cycle, ctx, ['cycle']);
});

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
    async proposals(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getCycleProposals(ctx, id));
    },
    async create(req: Request, res: Response) {
      res.status(201).json(await createCycle(ctx, req.user!, cycleInputAtEdge.parse(req.body)));
    },
    async update(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await updateCycle(ctx, id, cycleUpdateAtEdge.parse(req.body)));
    },
  };
}
