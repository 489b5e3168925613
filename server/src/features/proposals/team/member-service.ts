import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import {
  INVITATION_RESEND_MINUTES,
  INVITATION_VALID_DAYS,
  type InvitationAccepted,
  type InviteMemberInput,
} from '@spincycle/shared/proposals/proposal-schemas';
import type { AppContext } from '../../../app-context';
import { AppError } from '../../../http/app-error';
import { deliverMail, enqueueMail } from '../../../mail/outbox';
import { findAccountByEmail } from '../../accounts/account-repository';
import { hashLinkToken, newLinkToken } from '../../auth/link-token';
import { accessProposal, requireEditable, requirePi } from '../proposal-access';
import { touchProposal } from '../proposal-repository';
import { invitationMail } from './invitation-mail';
import { findPendingInvitation, lastInvitationMailAt, recordInvitationMail } from './invitation-repository';
import type { InvitedMember } from '@spincycle/shared/proposals/team-warnings';
import { reviewerConflictWarning } from './review-conflict';
import {
  acceptInvitationRow,
  deleteMemberRow,
  deletePendingInvitationsTo,
  findActiveRole,
  findMemberByEmail,
  findMemberById,
  insertInvitation,
  renewInvitation,
} from './member-repository';

/**
 * POST /api/proposals/:id/members (the PI, while the proposal is editable): invites a
 * co-investigator by e-mail. The link carries a random token of which only the SHA-256 is
 * stored. Someone with an account gets `/invitations/<token>`; someone without one gets
 * `/sign-up?invite=<token>` (the client signs them up, then accepts). Inviting a pending
 * address again sends a fresh link (the old one stops working), but at most one mail per
 * address and proposal every INVITATION_RESEND_MINUTES (429 `invitation_throttled`, also
 * across withdrawing and inviting again), so that the form cannot be used to flood a mailbox.
 * A link works once and for INVITATION_VALID_DAYS. Answers the team row and whether it is new;
 * the row carries `warnings`: `reviewer_conflict` when the invited address belongs to a reviewer
 * (see review-conflict.ts). The invitation goes ahead either way.
 */
export async function inviteMember(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  input: InviteMemberInput,
): Promise<{ member: InvitedMember; created: boolean }> {
  const token = newLinkToken();
  const { memberId, created, warnings, mailId } = await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requirePi(access, 'invite co-investigators');
    requireEditable(access, ctx.now());
    const already = () => new AppError('already_member', `${input.email} is already on the team`, 409, { email: ['already on the team'] });
    const existing = await findMemberByEmail(trx, id, input.email);
    if (existing?.active) throw already();
    const account = await findAccountByEmail(trx, input.email);
    if (account && (await findActiveRole(trx, id, account.id))) throw already();
    const now = ctx.now();
    const last = await lastInvitationMailAt(trx, id, input.email);
    if (last && now.getTime() - last.getTime() < INVITATION_RESEND_MINUTES * 60_000) {
      const waitMinutes = Math.max(1, Math.ceil((last.getTime() + INVITATION_RESEND_MINUTES * 60_000 - now.getTime()) / 60_000));
      const message = `An invitation was sent to ${input.email} less than ${INVITATION_RESEND_MINUTES} minutes ago. Wait ${waitMinutes} minute${waitMinutes === 1 ? '' : 's'} before sending another.`;
      throw new AppError('invitation_throttled', message, 429, { email: [message] });
    }
    await recordInvitationMail(trx, { proposalId: id, email: input.email, sentBy: viewer.id, sentAt: now });
    let rowId: number;
    if (existing) {
      await renewInvitation(trx, existing.id, hashLinkToken(token), viewer.id);
      rowId = existing.id;
    } else {
      rowId = await insertInvitation(trx, { proposalId: id, email: input.email, tokenHash: hashLinkToken(token), invitedBy: viewer.id });
    }
    await touchProposal(trx, id);
    const warnings = account?.roles.includes('reviewer') ? [reviewerConflictWarning(input.email, access.cycle.code)] : [];
    const hasAccount = account !== undefined;
    const link = hasAccount ? `${ctx.config.publicUrl}/invitations/${token}` : `${ctx.config.publicUrl}/sign-up?invite=${token}`;
    // The link is the credential: its mail's body is blanked in the outbox once sent.
    const mail = invitationMail({ to: input.email, inviter: viewer.displayName, title: access.proposal.title, link, hasAccount });
    const mailId = await enqueueMail(trx, mail, 'invitation', { holdsSecret: true });
    return { memberId: rowId, created: !existing, warnings, mailId };
  });
  await deliverMail(ctx, [mailId]);
  const { proposalId: _p, ...member } = (await findMemberById(ctx.db, id, memberId))!;
  return { member: { ...member, warnings }, created };
}

/**
 * POST /api/invitations/accept: the signed-in account joins the team as a co-investigator.
 * The link is the credential: the account's address need not be the invited one (people
 * have several). The token works once and for INVITATION_VALID_DAYS after it was sent (400
 * `invitation_expired` after that); an account already on the team gets 409.
 */
export async function acceptInvitation(ctx: AppContext, viewer: SessionUser, token: string): Promise<InvitationAccepted> {
  return ctx.db.transaction(async (trx) => {
    const invitation = await findPendingInvitation(trx, hashLinkToken(token));
    if (!invitation) {
      throw new AppError(
        'invalid_invitation',
        'This invitation link is not valid: it was used already, or the PI withdrew it. Ask the PI for a new one.',
        400,
        {
          token: ['used, withdrawn or unknown'],
        },
      );
    }
    if (ctx.now().getTime() - invitation.invitedAt.getTime() > INVITATION_VALID_DAYS * 86_400_000) {
      throw new AppError(
        'invitation_expired',
        `This invitation link has expired: links work for ${INVITATION_VALID_DAYS} days. Ask the PI to invite you again.`,
        400,
        {
          token: ['expired'],
        },
      );
    }
    if (await findActiveRole(trx, invitation.proposalId, viewer.id)) {
      throw new AppError('already_member', 'You are already on the team of this proposal', 409);
    }
    await acceptInvitationRow(trx, invitation.id, viewer.id);
    // Other pending invitations of this proposal to the same person are moot now.
    await deletePendingInvitationsTo(trx, invitation.proposalId, viewer.email);
    await touchProposal(trx, invitation.proposalId);
    return { proposalId: invitation.proposalId };
  });
}

/** DELETE /api/proposals/:id/members/:memberId (the PI, while editable): removes a co-investigator or withdraws an invitation. */
export async function removeMember(ctx: AppContext, viewer: SessionUser, id: number, memberId: number): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    const access = await accessProposal(trx, viewer, id, { forUpdate: true });
    requirePi(access, 'remove team members');
    requireEditable(access, ctx.now());
    const member = await findMemberById(trx, id, memberId);
    if (!member) throw new AppError('member_not_found', `No team member ${memberId} on proposal ${id}`, 404);
    if (member.role === 'pi') throw new AppError('cannot_remove_pi', 'The PI cannot be removed from the team', 409);
    await deleteMemberRow(trx, memberId);
    await touchProposal(trx, id);
  });
}
