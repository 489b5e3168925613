import type { Knex } from 'knex';

/** When the last invitation mail to this address (case-insensitive) for this proposal was sent, if any. */
export async function lastInvitationMailAt(db: Knex, proposalId: number, email: string): Promise<Date | undefined> {
  const row: { last: Date | null } | undefined = await db('proposal_invitation_mails')
    .where({ proposal_id: proposalId })
    .whereRaw('lower(email) = lower(?)', [email])
    .first(db.raw('max(sent_at) AS last'));
  return row?.last ?? undefined;
}

/** Notes an invitation mail (the throttle's record). */
export async function recordInvitationMail(
  db: Knex,
  input: { proposalId: number; email: string; sentBy: number; sentAt: Date },
): Promise<void> {
  await db('proposal_invitation_mails').insert({
    proposal_id: input.proposalId,
    email: input.email,
    sent_by: input.sentBy,
    sent_at: input.sentAt,
  });
}

/** A pending invitation behind a token hash, locked for acceptance, with the instant its link was sent. */
export async function findPendingInvitation(
  db: Knex,
  tokenHash: string,
): Promise<{ id: number; proposalId: number; email: string; invitedAt: Date } | undefined> {
  const row = await db('proposal_members')
    .where({ invite_token_hash: tokenHash })
    .whereNull('accepted_at')
    .forUpdate()
    .first('id', 'proposal_id', 'email', 'invited_at');
  return row ? { id: row.id, proposalId: row.proposal_id, email: row.email, invitedAt: row.invited_at } : undefined;
}
