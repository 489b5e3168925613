import type { Request, Response } from 'express';
import { skyWindowsRequestSchema } from '@spincycle/shared/planning/sky-windows-request';
import type { AppContext } from '../../app-context';
import { computeCycleSkyWindows } from './sky-windows-service';

/** Handler of POST /api/sky-windows. */
export function createSkyWindowsController(ctx: AppContext) {
  return {
    async compute(req: Request, res: Response) {
      res.json(await computeCycleSkyWindows(ctx, req.user!, skyWindowsRequestSchema.parse(req.body)));
    },
  };
}
