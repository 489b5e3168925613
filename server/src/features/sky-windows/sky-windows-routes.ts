import { Router } from 'express';
import type { AppContext } from '../../app-context';
import { requireSignedIn } from '../../http/auth-middleware';
import { createSkyWindowsController } from './sky-windows-controller';

/** POST /api/sky-windows: windows of up to 500 targets on chosen nodes over a cycle's campaign. */
export function createSkyWindowsRoutes(ctx: AppContext): Router {
  const c = createSkyWindowsController(ctx);
  const router = Router();
  router.post('/', requireSignedIn, c.compute);
  return router;
}
