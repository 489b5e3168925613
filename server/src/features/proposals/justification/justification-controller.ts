import type { Request, Response } from 'express';
import type { AppContext } from '../../../app-context';
import { idParamSchema } from '@spincycle/shared/http/ids';
import { downloadJustification, uploadJustification } from './justification-service';

/** Handlers of /api/proposals/:id/justification (upload and download). */
export function createJustificationController(ctx: AppContext) {
  return {
    async upload(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await uploadJustification(ctx, req.user!, id, req.file));
    },
    async download(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      const file = await downloadJustification(ctx, req.user!, id);
      res.attachment(file.filename).type(file.contentType).setHeader('Cache-Control', 'no-store');
      res.send(file.content);
    },
  };
}
