import type { Knex } from 'knex';
import type { JustificationFile, MemberRole, ProposalMember, ProposalSummary } from '@spincycle/shared/proposals/proposal-schemas';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';

interface ProposalRow {
  id: number;
  cycle_id: number;
  pi_account_id: number;
  title: string;
  abstract: string;
  category: string | null;
  state: ProposalState;
  version: number;
  completeness: number;
  submitted_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

/** A proposal's own columns. */
export interface StoredProposal {
  id: number;
  cycleId: number;
  piAccountId: number;
  title: string;
  abstract: string;
  category: string | null;
  state: ProposalState;
  version: number;
  /** Probability (0.5–0.99) that each target plan recovers the period. */
  completeness: number;
  submittedAt: string | null;
  createdAt: string;
  updatedAt: string;
}

function toProposal(r: ProposalRow): StoredProposal {
  return {
    id: r.id,
    cycleId: r.cycle_id,
    piAccountId: r.pi_account_id,
    title: r.title,
    abstract: r.abstract,
    category: r.category,
    state: r.state,
    version: r.version,
    completeness: r.completeness,
    submittedAt: r.submitted_at?.toISOString() ?? null,
    createdAt: r.created_at.toISOString(),
    updatedAt: r.updated_at.toISOString(),
  };
}

/** Inserts a draft (version 1); returns its id. */
export async function insertProposal(db: Knex, input: { cycleId: number; piAccountId: number; title: string; completeness?: number }): Promise<number> {
  const [row] = await db('proposals')
    .insert({ cycle_id: input.cycleId, pi_account_id: input.piAccountId, title: input.title, completeness: input.completeness })
    .returning('id');
  return row.id;
}

/** The proposal; `forUpdate` locks its row until the transaction ends (serializes edits and submission). */
export async function findProposalById(db: Knex, id: number, options: { forUpdate?: boolean } = {}): Promise<StoredProposal | undefined> {
  const q = db<ProposalRow>('proposals').where({ id }).first();
  if (options.forUpdate) q.forUpdate();
  const row = await q;
  return row ? toProposal(row) : undefined;
}

/** Writes the given fields and increments the version. */
export async function updateProposalFields(
  db: Knex,
  id: number,
  fields: { title?: string; abstract?: string; category?: string | null; completeness?: number },
): Promise<void> {
  const columns: Record<string, unknown> = { version: db.raw('version + 1'), updated_at: db.fn.now() };
  if (fields.title !== undefined) columns.title = fields.title;
  if (fields.abstract !== undefined) columns.abstract = fields.abstract;
  if (fields.category !== undefined) columns.category = fields.category;
  if (fields.completeness !== undefined) columns.completeness = fields.completeness;
  await db('proposals').where({ id }).update(columns);
}

/** Marks the proposal changed (targets, team, file) without touching its version. */
export async function touchProposal(db: Knex, id: number): Promise<void> {
  await db('proposals').where({ id }).update({ updated_at: db.fn.now() });
}

/** Moves the proposal to a state (submitted_at set on submission, cleared on withdrawal). */
export async function setProposalState(db: Knex, id: number, state: ProposalState, submittedAt: Date | null): Promise<void> {
  await db('proposals').where({ id }).update({ state, submitted_at: submittedAt, updated_at: db.fn.now() });
}

/** Deletes the proposal; its team, nodes, files, targets and plans go with it (ON DELETE CASCADE). */
export async function deleteProposalRow(db: Knex, id: number): Promise<void> {
  await db('proposals').where({ id }).del();
}

/** Ids of the requested nodes, ascending. */
export async function listProposalNodeIds(db: Knex, proposalId: number): Promise<number[]> {
  return db('proposal_nodes').where({ proposal_id: proposalId }).orderBy('node_id').pluck('node_id');
}

/** Replaces the requested nodes. */
export async function replaceProposalNodes(db: Knex, proposalId: number, nodeIds: number[]): Promise<void> {
  await db('proposal_nodes').where({ proposal_id: proposalId }).del();
  if (nodeIds.length) await db('proposal_nodes').insert(nodeIds.map((node_id) => ({ proposal_id: proposalId, node_id })));
}

/** How many targets the proposal holds. */
export async function countTargets(db: Knex, proposalId: number): Promise<number> {
  const [{ n }] = await db('targets').where({ proposal_id: proposalId }).count<{ n: number }[]>({ n: '*' });
  return n;
}

// ---- team ----

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
    .select('m.id', 'm.proposal_id', 'm.account_id', 'm.email', 'm.role', 'm.invited_at', 'm.accepted_at', 'a.display_name', 'a.email as account_email');
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
  const row = await db('proposal_members').where({ proposal_id: proposalId, account_id: accountId }).whereNotNull('accepted_at').first('role');
  return row?.role;
}

/** The team row with this invitation address (case-insensitive), pending or active. */
export async function findMemberByEmail(db: Knex, proposalId: number, email: string): Promise<{ id: number; active: boolean } | undefined> {
  const row = await db('proposal_members').where({ proposal_id: proposalId }).whereRaw('lower(email) = lower(?)', [email]).first('id', 'accepted_at');
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
export async function insertInvitation(db: Knex, input: { proposalId: number; email: string; tokenHash: string; invitedBy: number }): Promise<number> {
  const [row] = await db('proposal_members')
    .insert({ proposal_id: input.proposalId, email: input.email, role: 'coi', invite_token_hash: input.tokenHash, invited_by: input.invitedBy })
    .returning('id');
  return row.id;
}

/** A new token for a pending invitation (the old link stops working). */
export async function renewInvitation(db: Knex, memberId: number, tokenHash: string, invitedBy: number): Promise<void> {
  await db('proposal_members').where({ id: memberId }).whereNull('accepted_at').update({ invite_token_hash: tokenHash, invited_by: invitedBy, invited_at: db.fn.now() });
}

/** The pending invitation behind a token hash, locked for acceptance. */
export async function findInvitationByTokenHash(db: Knex, tokenHash: string): Promise<{ id: number; proposalId: number; email: string } | undefined> {
  const row = await db('proposal_members').where({ invite_token_hash: tokenHash }).whereNull('accepted_at').forUpdate().first('id', 'proposal_id', 'email');
  return row ? { id: row.id, proposalId: row.proposal_id, email: row.email } : undefined;
}

/** Turns a pending invitation into an active membership of the account; the token is spent. */
export async function acceptInvitationRow(db: Knex, memberId: number, accountId: number): Promise<void> {
  await db('proposal_members').where({ id: memberId }).update({ account_id: accountId, accepted_at: db.fn.now(), invite_token_hash: null });
}

/** Other pending invitations of the same proposal to the account's address (they are now moot). */
export async function deletePendingInvitationsTo(db: Knex, proposalId: number, email: string): Promise<void> {
  await db('proposal_members').where({ proposal_id: proposalId }).whereNull('accepted_at').whereRaw('lower(email) = lower(?)', [email]).del();
}

/** Removes a team row (member or pending invitation). */
export async function deleteMemberRow(db: Knex, memberId: number): Promise<void> {
  await db('proposal_members').where({ id: memberId }).del();
}

// ---- justification ----

/** The justification file without its content, or null. */
export async function findJustificationMeta(db: Knex, proposalId: number): Promise<JustificationFile | null> {
  const row = await db('proposal_files as f')
    .leftJoin('accounts as a', 'a.id', 'f.uploaded_by')
    .where({ 'f.proposal_id': proposalId, 'f.kind': 'justification' })
    .first('f.filename', 'f.size_bytes', 'f.sha256', 'f.uploaded_at', 'a.display_name');
  return row
    ? { filename: row.filename, sizeBytes: row.size_bytes, sha256: row.sha256, uploadedAt: row.uploaded_at.toISOString(), uploadedBy: row.display_name ?? 'a former member' }
    : null;
}

/** The justification file with its bytes. */
export async function findJustificationContent(db: Knex, proposalId: number): Promise<{ filename: string; contentType: string; content: Buffer } | undefined> {
  const row = await db('proposal_files').where({ proposal_id: proposalId, kind: 'justification' }).first('filename', 'content_type', 'content');
  return row ? { filename: row.filename, contentType: row.content_type, content: row.content } : undefined;
}

/** Stores the justification, replacing the current one. */
export async function upsertJustification(
  db: Knex,
  input: { proposalId: number; filename: string; contentType: string; content: Buffer; sha256: string; uploadedBy: number },
): Promise<void> {
  await db('proposal_files')
    .insert({
      proposal_id: input.proposalId,
      kind: 'justification',
      content: input.content,
      filename: input.filename,
      content_type: input.contentType,
      size_bytes: input.content.length,
      sha256: input.sha256,
      uploaded_by: input.uploadedBy,
      uploaded_at: db.fn.now(),
    })
    .onConflict(['proposal_id', 'kind'])
    .merge();
}

// ---- lists ----

interface SummaryRow {
  id: number;
  cycle_id: number;
  cycle_code: string;
  call_closes_at: Date;
  title: string;
  state: ProposalState;
  pi_name: string;
  my_role: MemberRole;
  target_count: number;
  requested_node_hours: number | null;
  submitted_at: Date | null;
  updated_at: Date;
}

/** The proposals on which the account is an active member, newest change first. */
export async function listProposalSummariesOf(db: Knex, accountId: number): Promise<ProposalSummary[]> {
  const rows: SummaryRow[] = await db('proposals as p')
    .join('proposal_members as m', function () {
      this.on('m.proposal_id', 'p.id').andOn('m.account_id', db.raw('?', [accountId]));
    })
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .join('accounts as pi', 'pi.id', 'p.pi_account_id')
    .whereNotNull('m.accepted_at')
    .select(
      'p.id',
      'p.cycle_id',
      'c.code as cycle_code',
      'c.call_closes_at',
      'p.title',
      'p.state',
      'pi.display_name as pi_name',
      'm.role as my_role',
      'p.submitted_at',
      'p.updated_at',
      db.raw('(SELECT count(*)::int FROM targets t WHERE t.proposal_id = p.id) AS target_count'),
      // Only plans on nodes still requested count towards the request.
      db.raw(
        '(SELECT sum(tp.node_hours) FROM target_plans tp JOIN proposal_nodes pn ON pn.proposal_id = tp.proposal_id AND pn.node_id = tp.node_id WHERE tp.proposal_id = p.id AND tp.feasible) AS requested_node_hours',
      ),
    )
    .orderBy('p.updated_at', 'desc')
    .orderBy('p.id', 'desc');
  return rows.map((r) => ({
    id: r.id,
    cycleId: r.cycle_id,
    cycleCode: r.cycle_code,
    callClosesAt: r.call_closes_at.toISOString(),
    title: r.title,
    state: r.state,
    piName: r.pi_name,
    myRole: r.my_role,
    targetCount: r.target_count,
    requestedNodeHours: Math.round((r.requested_node_hours ?? 0) * 100) / 100,
    submittedAt: r.submitted_at?.toISOString() ?? null,
    updatedAt: r.updated_at.toISOString(),
  }));
}
