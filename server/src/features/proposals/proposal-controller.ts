import type { Request, Response } from 'express';
import { createProposalSchema, updateProposalSchema } from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../app-context';
import { idParamSchema } from '../../http/params';
import { createProposal, deleteProposal, getProposal, listMyProposals, updateProposal } from './proposal-service';

/** Handlers of /api/proposals and /api/proposals/:id. */
export function createProposalController(ctx: AppContext) {
  return {
    async list(req: Request, res: Response) {
      res.json(await listMyProposals(ctx, req.user!));
    },
    async create(req: Request, res: Response) {
      res.status(201).json(await createProposal(ctx, req.user!, createProposalSchema.parse(req.body)));
    },
    async get(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await getProposal(ctx, req.user!, id));
    },
    async update(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await updateProposal(ctx, req.user!, id, updateProposalSchema.parse(req.body)));
    },
    async remove(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      await deleteProposal(ctx, req.user!, id);
      res.status(204).end();
    },
  };
}
