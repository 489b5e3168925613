import type { NextFunction, Request, Response } from 'express';
import { z } from 'zod';
import { idParam } from '@spincycle/shared/http/ids';
import { lightCurveUploadFieldsSchema, reanalyseSchema } from '@spincycle/shared/photometry/photometry';
import type { AppContext } from '../../app-context';
import {
  exportProgramPhotometry,
  getProgramPhotometry,
  getRunStatus,
  getTargetPhotometry,
  reanalyse,
  requireUploader,
  uploadLightCurves,
} from './photometry-service';

const programParams = z.object({ id: idParam });
const targetParams = z.object({ id: idParam, targetId: idParam });

/** Handlers of /api/proposals/:id/photometry: parse, call the service, choose the status. */
export function createPhotometryController(ctx: AppContext) {
  return {
    async program(req: Request, res: Response) {
      const { id } = programParams.parse(req.params);
      res.json(await getProgramPhotometry(ctx, req.user!, id));
    },
    async mayUpload(req: Request, _res: Response, next: NextFunction) {
      const { id } = programParams.parse(req.params);
      await requireUploader(ctx, req.user!, id);
      next();
    },
    async upload(req: Request, res: Response) {
      const { id } = programParams.parse(req.params);
      const fields = lightCurveUploadFieldsSchema.parse(req.body ?? {});
      const files = Array.isArray(req.files) ? req.files : [];
      res.status(202).json(await uploadLightCurves(ctx, req.user!, id, files, fields));
    },
    async analyse(req: Request, res: Response) {
      const { id } = programParams.parse(req.params);
      const { detrend } = reanalyseSchema.parse(req.body);
      res.status(202).json(await reanalyse(ctx, req.user!, id, detrend));
    },
    async run(req: Request, res: Response) {
      const { id } = programParams.parse(req.params);
      res.setHeader('Cache-Control', 'no-store');
      res.json(await getRunStatus(ctx, req.user!, id));
    },
    async target(req: Request, res: Response) {
      const { id, targetId } = targetParams.parse(req.params);
      res.json(await getTargetPhotometry(ctx, req.user!, id, targetId));
    },
    async exportCsv(req: Request, res: Response) {
      const { id } = programParams.parse(req.params);
      const file = await exportProgramPhotometry(ctx, req.user!, id);
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
      res.setHeader('Cache-Control', 'no-store');
      res.send(file.body);
    },
  };
}
