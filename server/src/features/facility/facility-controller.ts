import type { Request, Response } from 'express';
import type { AppContext } from '../../app-context';
import { getNodes, getSites } from './facility-service';

/** Handlers of /api/sites and /api/nodes. */
export function createFacilityController(ctx: AppContext) {
  return {
    async sites(_req: Request, res: Response) {
      res.json(await getSites(ctx));
    },
    async nodes(_req: Request, res: Response) {
      res.json(await getNodes(ctx));
    },
  };
}
