import type { Knex } from 'knex';
import type { MemberRole, ProposalMember } from '@spincycle/shared/proposals/proposal-schemas';

interface MemberRow {
  id: number;
  proposal_id: number;
  account_id: number | null;
  email: string;
  role: MemberRole;
  invited_at: Date;
  accepted_at: Date | null;
  display_name: string | null;
  account_email: string | null;
}

/** A team row with what the services need besides the API shape. */
export interface StoredMember extends ProposalMember {
  proposalId: number;
}

function toMember(r: MemberRow): StoredMember {
  const active = r.accepted_at !== null;
  return {
    id: r.id,
    proposalId: r.proposal_id,
    accountId: active ? r.account_id : null,
    // An active member is shown with their account's address (the invitation may have gone elsewhere).
    email: active && r.account_email ? r.account_email : r.email,
    displayName: active ? r.display_name : null,
    role: r.role,
    status: active ? 'active' : 'invited',
    invitedAt: r.invited_at.toISOString(),
  };
}

function membersQuery(db: Knex) {
  return db('proposal_members as m')
    .leftJoin('accounts as a', 'a.id', 'm.account_id')
    .select(
      'm.id',
      'm.proposal_id',
      'm.account_id',
      'm.email',
      'm.role',
      'm.invited_at',
      'm.accepted_at',
      'a.display_name',
      'a.email as account_email',
    );
}

/** The team: the PI first, then active co-investigators, then pending invitations, each by date. */
export async function listMembers(db: Knex, proposalId: number): Promise<StoredMember[]> {
  const rows: MemberRow[] = await membersQuery(db)
    .where('m.proposal_id', proposalId)
    .orderByRaw("CASE WHEN m.role = 'pi' THEN 0 WHEN m.accepted_at IS NOT NULL THEN 1 ELSE 2 END")
    .orderBy('m.invited_at')
    .orderBy('m.id');
  return rows.map(toMember);
}

/** One team row of the proposal. */
export async function findMemberById(db: Knex, proposalId: number, memberId: number): Promise<StoredMember | undefined> {
  const row: MemberRow | undefined = await membersQuery(db).where({ 'm.proposal_id': proposalId, 'm.id': memberId }).first();
  return row ? toMember(row) : undefined;
}

/** The account's role on the proposal when it is an active member, else undefined. */
export async function findActiveRole(db: Knex, proposalId: number, accountId: number): Promise<MemberRole | undefined> {
  const row = await db('proposal_members')
    .where({ proposal_id: proposalId, account_id: accountId })
    .whereNotNull('accepted_at')
    .first('role');
  return row?.role;
}

/** The team row with this invitation address (case-insensitive), pending or active. */
export async function findMemberByEmail(db: Knex, proposalId: number, email: string): Promise<{ id: number; active: boolean } | undefined> {
  const row = await db('proposal_members')
    .where({ proposal_id: proposalId })
    .whereRaw('lower(email) = lower(?)', [email])
    .first('id', 'accepted_at');
  return row ? { id: row.id, active: row.accepted_at !== null } : undefined;
}

/** The PI as the first, active team member. */
export async function insertPiMember(db: Knex, proposalId: number, account: { id: number; email: string }): Promise<void> {
  await db('proposal_members').insert({
    proposal_id: proposalId,
    account_id: account.id,
    email: account.email,
    role: 'pi',
    invited_by: account.id,
    invited_at: db.fn.now(),
    accepted_at: db.fn.now(),
  });
}

/** A pending co-investigator invitation; returns the team row id. */
export async function insertInvitation(
  db: Knex,
  input: { proposalId: number; email: string; tokenHash: string; invitedBy: number },
): Promise<number> {
  const [row] = await db('proposal_members')
    .insert({
      proposal_id: input.proposalId,
      email: input.email,
      role: 'coi',
      invite_token_hash: input.tokenHash,
      invited_by: input.invitedBy,
    })
    .returning('id');
  return row.id;
}

/** A new token for a pending invitation (the old link stops working). */
export async function renewInvitation(db: Knex, memberId: number, tokenHash: string, invitedBy: number): Promise<void> {
  await db('proposal_members')
    .where({ id: memberId })
    .whereNull('accepted_at')
    .update({ invite_token_hash: tokenHash, invited_by: invitedBy, invited_at: db.fn.now() });
}

/** The pending invitation behind a token hash, locked for acceptance. */
export async function findInvitationByTokenHash(
  db: Knex,
  tokenHash: string,
): Promise<{ id: number; proposalId: number; email: string } | undefined> {
  const row = await db('proposal_members')
    .where({ invite_token_hash: tokenHash })
    .whereNull('accepted_at')
    .forUpdate()
    .first('id', 'proposal_id', 'email');
  return row ? { id: row.id, proposalId: row.proposal_id, email: row.email } : undefined;
}

/** Turns a pending invitation into an active membership of the account; the token is spent. */
export async function acceptInvitationRow(db: Knex, memberId: number, accountId: number): Promise<void> {
  await db('proposal_members').where({ id: memberId }).update({ account_id: accountId, accepted_at: db.fn.now(), invite_token_hash: null });
}

/** Other pending invitations of the same proposal to the account's address (they are now moot). */
export async function deletePendingInvitationsTo(db: Knex, proposalId: number, email: string): Promise<void> {
  await db('proposal_members')
    .where({ proposal_id: proposalId })
    .whereNull('accepted_at')
    .whereRaw('lower(email) = lower(?)', [email])
    .del();
}

/** Removes a team row (member or pending invitation). */
export async function deleteMemberRow(db: Knex, memberId: number): Promise<void> {
  await db('proposal_members').where({ id: memberId }).del();
}
