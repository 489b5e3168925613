import { Router } from 'express';
import { LIGHT_CURVE_LIMITS } from '@spincycle/shared/photometry/photometry';
import type { AppContext } from '../../app-context';
import { requireSignedIn } from '../../http/auth-middleware';
import { multiFileUpload } from '../../http/upload-limits';
import { createPhotometryController } from './photometry-controller';

/**
 * Mounted at /api/proposals/:id/photometry, for the program's team (the service answers the
 * proposal's 404 to everyone else): the program's light curves and measurements, uploads (up to
 * LIGHT_CURVE_LIMITS.maxFiles files of at most maxFileBytes each, written to temporary files and
 * read as streams), a new analysis with other detrending choices, the run's progress, a target's
 * measurement and the table as CSV. Every route is listed in test/api/photometry-permissions.spec.ts.
 */
export function createPhotometryRoutes(ctx: AppContext): Router {
  const c = createPhotometryController(ctx);
  const mb = LIGHT_CURVE_LIMITS.maxFileBytes / (1024 * 1024);
  const upload = multiFileUpload({
    field: 'files',
    maxBytes: LIGHT_CURVE_LIMITS.maxFileBytes,
    maxFiles: LIGHT_CURVE_LIMITS.maxFiles,
    tooLargeMessage: `A light-curve file is larger than ${mb} MB: split it by target or by season`,
  });
  const router = Router({ mergeParams: true });
  router.get('/', requireSignedIn, c.program);
  // Who may upload is checked before the files are received.
  router.post('/uploads', requireSignedIn, c.mayUpload, upload, c.upload);
  router.post('/analyses', requireSignedIn, c.analyse);
  router.get('/run', requireSignedIn, c.run);
  router.get('/targets/:targetId', requireSignedIn, c.target);
  router.get('/export.csv', requireSignedIn, c.exportCsv);
  return router;
}
