import type { Knex } from 'knex';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import type { BillingContactView, ProgramBilling } from '@spincycle/shared/billing/billing';
import type { AppContext } from '../../app-context';
import { AppError } from '../../http/app-error';
import { findAccountByEmail } from '../accounts/account-repository';
import { hashLinkToken, newLinkToken } from '../auth/link-token';
import { deliverMail, enqueueMail } from '../../mail/outbox';
import { isPi, listContacts } from './billing-repository';
import { billingContactInvitation } from './billing-mail';

/** Days a billing-contact invitation link works. */
export const CONTACT_INVITATION_DAYS = 14;

const programNotFound = (id: number) => new AppError('program_not_found', `No program ${id}`, 404);

/** The program and whether the viewer may manage its contacts (PI or facility manager); 404 for everyone else but its contacts. */
async function programAccess(db: Knex, viewer: SessionUser, proposalId: number) {
  const program = await db('programs as g')
    .join('proposals as p', 'p.id', 'g.proposal_id')
    .where('g.proposal_id', proposalId)
    .first('g.proposal_id', 'p.title', 'g.rate_class');
  if (!program) throw programNotFound(proposalId);
  const manager = hasAnyRole(viewer, 'facility_manager');
  const pi = await isPi(db, proposalId, viewer.id);
  const contact = !!(await db('program_billing_contacts').where({ proposal_id: proposalId, account_id: viewer.id }).first('id'));
  if (!manager && !pi && !contact) throw programNotFound(proposalId);
  return { title: program.title as string, rateClass: program.rate_class, canManage: manager || pi };
}

const view = (c: Awaited<ReturnType<typeof listContacts>>[number]): BillingContactView => ({
  id: c.id,
  email: c.email,
  name: c.name,
  acceptedAt: c.acceptedAt?.toISOString() ?? null,
  invitedAt: c.invitedAt.toISOString(),
});

/** GET /api/billing/programs/:proposalId: the program's billing contacts and rate. */
export async function getProgramBilling(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<ProgramBilling> {
  const access = await programAccess(ctx.db, viewer, proposalId);
  const contacts = await listContacts(ctx.db, proposalId);
  return {
    proposalId,
    programTitle: access.title,
    rateClass: access.rateClass,
    contacts: contacts.map(view),
    canManageContacts: access.canManage,
  };
}

/**
 * POST /api/billing/programs/:proposalId/contacts (the PI or a facility manager): invites a billing
 * contact by e-mail. The link carries a random token of which only the SHA-256 is stored; inviting a
 * pending address again sends a fresh link (the old one stops working). The mail is queued in the
 * same transaction.
 */
export async function inviteContact(ctx: AppContext, viewer: SessionUser, proposalId: number, email: string): Promise<ProgramBilling> {
  const token = newLinkToken();
  const mailId = await ctx.db.transaction(async (trx) => {
    const access = await programAccess(trx, viewer, proposalId);
    if (!access.canManage) throw new AppError('forbidden', 'Only the PI and the facility managers invite billing contacts.', 403);
    await trx('programs').where({ proposal_id: proposalId }).forUpdate().first('proposal_id');
    const existing = await trx('program_billing_contacts').where({ proposal_id: proposalId, email }).first('id', 'accepted_at');
    if (existing?.accepted_at)
      throw new AppError('already_contact', `${email} is already a billing contact of this program.`, 409, {
        email: ['already a billing contact'],
      });
    if (existing) {
      await trx('program_billing_contacts')
        .where({ id: existing.id })
        .update({ token_hash: hashLinkToken(token), invited_by: viewer.id, invited_at: ctx.now() });
    } else {
      await trx('program_billing_contacts').insert({
        proposal_id: proposalId,
        email,
        token_hash: hashLinkToken(token),
        invited_by: viewer.id,
        invited_at: ctx.now(),
      });
    }
    const hasAccount = (await findAccountByEmail(trx, email)) !== undefined;
    const link = `${ctx.config.publicUrl}/fees/contact-invitations/${token}`;
    const signUp = hasAccount ? null : `${ctx.config.publicUrl}/sign-up`;
    return enqueueMail(
      trx,
      { to: email, ...billingContactInvitation({ programTitle: access.title, inviter: viewer.displayName, link, signUp }) },
      'billing_invitation',
      { holdsSecret: true },
    );
  });
  await deliverMail(ctx, [mailId]);
  return getProgramBilling(ctx, viewer, proposalId);
}

/** DELETE /api/billing/programs/:proposalId/contacts/:contactId (the PI or a facility manager). */
export async function removeContact(ctx: AppContext, viewer: SessionUser, proposalId: number, contactId: number): Promise<ProgramBilling> {
  await ctx.db.transaction(async (trx) => {
    const access = await programAccess(trx, viewer, proposalId);
    if (!access.canManage) throw new AppError('forbidden', 'Only the PI and the facility managers remove billing contacts.', 403);
    const n = await trx('program_billing_contacts').where({ id: contactId, proposal_id: proposalId }).del();
    if (!n) throw new AppError('contact_not_found', `No billing contact ${contactId} on this program`, 404);
  });
  return getProgramBilling(ctx, viewer, proposalId);
}

/**
 * POST /api/billing/contact-invitations/:token (signed in): accepts an invitation sent to the
 * viewer's own address; the account gains the billing contact role. A link works once and for
 * CONTACT_INVITATION_DAYS days.
 */
export async function acceptContactInvitation(
  ctx: AppContext,
  viewer: SessionUser,
  token: string,
): Promise<{ proposalId: number; programTitle: string }> {
  return ctx.db.transaction(async (trx) => {
    const row = await trx('program_billing_contacts as b')
      .join('proposals as p', 'p.id', 'b.proposal_id')
      .where('b.token_hash', hashLinkToken(token))
      .forUpdate('b')
      .first('b.id', 'b.proposal_id', 'b.email', 'b.invited_at', 'b.accepted_at', 'p.title');
    const expired = row && ctx.now().getTime() - new Date(row.invited_at).getTime() > CONTACT_INVITATION_DAYS * 86_400_000;
    if (!row || row.accepted_at || expired) {
      throw new AppError(
        'invitation_not_found',
        'This invitation link is not valid any more (used, replaced or older than 14 days). Ask for a new one.',
        404,
      );
    }
    if (row.email !== viewer.email.toLowerCase()) {
      throw new AppError(
        'invitation_other_address',
        `This invitation was sent to ${row.email}. Sign in with that address to accept it.`,
        403,
      );
    }
    await trx('program_billing_contacts').where({ id: row.id }).update({ account_id: viewer.id, accepted_at: ctx.now(), token_hash: null });
    await trx('account_roles')
      .insert({ account_id: viewer.id, role: 'billing_contact', granted_by: null })
      .onConflict(['account_id', 'role'])
      .ignore();
    return { proposalId: row.proposal_id, programTitle: row.title };
  });
}
