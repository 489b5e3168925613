import type { Request, Response } from 'express';
import { nodeUpdateSchema } from '@spincycle/shared/facility/node-schemas';
import { idParamSchema } from '@spincycle/shared/http/ids';
import type { AppContext } from '../../app-context';
import { getNodes, getSites, updateNode } from './facility-service';

/** Handlers of /api/sites and /api/nodes. */
export function createFacilityController(ctx: AppContext) {
  return {
    async sites(_req: Request, res: Response) {
      res.json(await getSites(ctx));
    },
    async nodes(_req: Request, res: Response) {
      res.json(await getNodes(ctx));
    },
    async updateNode(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await updateNode(ctx, id, nodeUpdateSchema.parse(req.body)));
    },
  };
}
