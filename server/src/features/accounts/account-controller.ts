import type { Request, Response } from 'express';
import { listAccountsQuerySchema, updateAccountSchema } from '@spincycle/shared/accounts/account-schemas';
import type { AppContext } from '../../app-context';
import { idParamSchema } from '@spincycle/shared/http/ids';
import { listAccountsPage, updateAccount } from './account-service';

export function createAccountController(ctx: AppContext) {
  return {
    async list(req: Request, res: Response) {
      res.json(await listAccountsPage(ctx, listAccountsQuerySchema.parse(req.query)));
    },
    async update(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await updateAccount(ctx, req.user!, id, updateAccountSchema.parse(req.body)));
    },
  };
}
