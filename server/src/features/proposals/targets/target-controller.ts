import type { Request, Response } from 'express';
import { targetInputSchema, targetUpdateSchema, targetUploadQuerySchema } from '@spincycle/shared/proposals/target-schemas';
import type { AppContext } from '../../../app-context';
import { idParamSchema, targetParamsSchema } from '@spincycle/shared/http/ids';
import { EXAMPLE_TARGET_CSV } from './target-csv';
import { addTarget, deleteTarget, exportTargetsCsv, listProposalTargets, updateTarget, uploadTargets } from './target-service';

function sendCsv(res: Response, filename: string, csv: string): void {
  res.attachment(filename).type('text/csv; charset=utf-8').setHeader('Cache-Control', 'no-store');
  res.send(csv);
}

/** Handlers of the target routes, the CSV upload and export, and the example list. */
export function createTargetController(ctx: AppContext) {
  return {
    async list(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await listProposalTargets(ctx, req.user!, id));
    },
    async add(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.status(201).json(await addTarget(ctx, req.user!, id, targetInputSchema.parse(req.body)));
    },
    async update(req: Request, res: Response) {
      const { id, targetId } = targetParamsSchema.parse(req.params);
      res.json(await updateTarget(ctx, req.user!, id, targetId, targetUpdateSchema.parse(req.body)));
    },
    async remove(req: Request, res: Response) {
      const { id, targetId } = targetParamsSchema.parse(req.params);
      await deleteTarget(ctx, req.user!, id, targetId);
      res.status(204).end();
    },
    async upload(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await uploadTargets(ctx, req.user!, id, req.file, () => targetUploadQuerySchema.parse(req.query).mode));
    },
    async exportCsv(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      const { filename, csv } = await exportTargetsCsv(ctx, req.user!, id);
      sendCsv(res, filename, csv);
    },
    example(_req: Request, res: Response) {
      sendCsv(res, 'spincycle-target-list-example.csv', EXAMPLE_TARGET_CSV);
    },
  };
}
