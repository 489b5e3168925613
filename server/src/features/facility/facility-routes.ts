import { Router, type Request, type Response } from 'express';
import { callStatusAt, type CycleSummary } from '@spincycle/shared/facility/facility-types';
import type { AppContext } from '../../app-context';
import { requireSignedIn } from '../../http/auth-middleware';
import { listCycles, listNodes, listSites } from './facility-repository';

/** Read-only views of the network and its cycles, for every signed-in person. */
export function createFacilityRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/sites', requireSignedIn, async (_req: Request, res: Response) => {
    res.json(await listSites(ctx.db));
  });
  router.get('/nodes', requireSignedIn, async (_req: Request, res: Response) => {
    res.json(await listNodes(ctx.db));
  });
  router.get('/cycles', requireSignedIn, async (_req: Request, res: Response) => {
    const now = new Date();
    const cycles: CycleSummary[] = (await listCycles(ctx.db)).map((c) => ({ ...c, status: callStatusAt(c, now) }));
    res.json(cycles);
  });
  return router;
}
