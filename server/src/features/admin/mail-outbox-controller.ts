import type { Request, Response } from 'express';
import { idParamSchema } from '@spincycle/shared/http/ids';
import { listOutboxQuerySchema } from '@spincycle/shared/mail/mail-outbox';
import type { AppContext } from '../../app-context';
import { listOutboxPage, resendFailedMail } from './mail-outbox-service';

export function createMailOutboxController(ctx: AppContext) {
  return {
    /** GET /api/admin/mail-outbox?state=&page=&pageSize= */
    async list(req: Request, res: Response) {
      res.json(await listOutboxPage(ctx, listOutboxQuerySchema.parse(req.query)));
    },
    /** POST /api/admin/mail-outbox/:id/resend → the mail after the new attempt. */
    async resend(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      res.json(await resendFailedMail(ctx, req.user!, id));
    },
  };
}
