import { Router, type Request, type Response } from 'express';
import { skyWindowsRequestSchema } from '@spincycle/shared/planning/sky-windows-request';
import type { AppContext } from '../../app-context';
import { requireSignedIn } from '../../http/auth-middleware';
import { computeCycleSkyWindows } from './sky-windows-service';

/** POST /api/sky-windows: windows of up to 500 targets on chosen nodes over a cycle's campaign. */
export function createSkyWindowsRoutes(ctx: AppContext): Router {
  const router = Router();
  router.post('/', requireSignedIn, async (req: Request, res: Response) => {
    res.json(await computeCycleSkyWindows(ctx, skyWindowsRequestSchema.parse(req.body)));
  });
  return router;
}
