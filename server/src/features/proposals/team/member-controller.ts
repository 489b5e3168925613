import type { Request, Response } from 'express';
import { acceptInvitationSchema, inviteMemberSchema } from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../../app-context';
import { idParamSchema, memberParamsSchema } from '@spincycle/shared/http/ids';
import { acceptInvitation, inviteMember, removeMember } from './member-service';

/** Handlers of the team routes and of /api/invitations/accept. */
export function createMemberController(ctx: AppContext) {
  return {
    async invite(req: Request, res: Response) {
      const { id } = idParamSchema.parse(req.params);
      const { member, created } = await inviteMember(ctx, req.user!, id, inviteMemberSchema.parse(req.body));
      res.status(created ? 201 : 200).json(member);
    },
    async remove(req: Request, res: Response) {
      const { id, memberId } = memberParamsSchema.parse(req.params);
      await removeMember(ctx, req.user!, id, memberId);
      res.status(204).end();
    },
    async accept(req: Request, res: Response) {
      const { token } = acceptInvitationSchema.parse(req.body);
      res.json(await acceptInvitation(ctx, req.user!, token));
    },
  };
}
