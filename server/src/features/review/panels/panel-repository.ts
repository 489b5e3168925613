import type { Knex } from 'knex';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';
import type { ReviewerAccount, ReviewMode, ReviewSettingsInput } from '@spincycle/shared/review/panels';

/** A cycle with its review settings. */
export interface CycleReview {
  id: number;
  code: string;
  title: string;
  callOpensAt: string;
  callClosesAt: string;
  anonymousReview: boolean;
  categories: string[];
  reviewMode: ReviewMode;
  reviewersPerProposal: number;
  reviewDeadline: string | null;
  setAsideLateTeams: boolean;
}

interface CycleReviewRow {
  id: number;
  code: string;
  title: string;
  call_opens_at: Date;
  call_closes_at: Date;
  anonymous_review: boolean;
  categories: string[];
  review_mode: ReviewMode;
  reviewers_per_proposal: number;
  review_deadline: Date | null;
  set_aside_late_teams: boolean;
}

function toCycleReview(r: CycleReviewRow): CycleReview {
  return {
    id: r.id,
    code: r.code,
    title: r.title,
    callOpensAt: r.call_opens_at.toISOString(),
    callClosesAt: r.call_closes_at.toISOString(),
    anonymousReview: r.anonymous_review,
    categories: r.categories,
    reviewMode: r.review_mode,
    reviewersPerProposal: r.reviewers_per_proposal,
    reviewDeadline: r.review_deadline?.toISOString() ?? null,
    setAsideLateTeams: r.set_aside_late_teams,
  };
}

/** The cycle's review settings; `forUpdate` locks the cycle row. */
export async function findCycleReview(db: Knex, id: number, options: { forUpdate?: boolean } = {}): Promise<CycleReview | undefined> {
  const q = db<CycleReviewRow>('cycles').where({ id }).first();
  if (options.forUpdate) q.forUpdate();
  const row = await q;
  return row ? toCycleReview(row) : undefined;
}

export async function updateReviewSettings(db: Knex, id: number, input: ReviewSettingsInput): Promise<void> {
  await db('cycles')
    .where({ id })
    .update({
      review_mode: input.reviewMode,
      reviewers_per_proposal: input.reviewersPerProposal,
      review_deadline: input.reviewDeadline ? new Date(input.reviewDeadline) : null,
      set_aside_late_teams: input.setAsideLateTeams,
    });
}

/** Review assignments of the cycle's proposals. */
export async function countAssignmentsOfCycle(db: Knex, cycleId: number): Promise<number> {
  const [{ n }] = await db('review_assignments as ra')
    .join('proposals as p', 'p.id', 'ra.proposal_id')
    .where('p.cycle_id', cycleId)
    .count<{ n: string }[]>({ n: '*' });
  return Number(n);
}

interface AccountRow {
  id: number;
  display_name: string;
  email: string;
  affiliation: string | null;
  expertise: string[];
}

const toReviewerAccount = (r: AccountRow): ReviewerAccount => ({
  id: r.id,
  displayName: r.display_name,
  email: r.email,
  affiliation: r.affiliation ?? '',
  expertise: r.expertise,
});

/** Enabled accounts holding the reviewer role, by name; `ids` narrows the list. */
export async function listReviewerAccounts(db: Knex, ids?: number[]): Promise<ReviewerAccount[]> {
  const q = db<AccountRow>('accounts as a')
    .whereNull('a.disabled_at')
    .whereExists(db('account_roles as r').whereRaw('r.account_id = a.id').where('r.role', 'reviewer'))
    .orderBy('a.display_name')
    .orderBy('a.id')
    .select('a.id', 'a.display_name', 'a.email', 'a.affiliation', 'a.expertise');
  if (ids) q.whereIn('a.id', ids);
  return (await q).map(toReviewerAccount);
}

/** The enabled reviewer with this e-mail (case-insensitive). */
export async function findReviewerByEmail(db: Knex, email: string): Promise<ReviewerAccount | undefined> {
  const row = await db<AccountRow>('accounts as a')
    .whereNull('a.disabled_at')
    .whereRaw('lower(a.email) = ?', [email.toLowerCase()])
    .whereExists(db('account_roles as r').whereRaw('r.account_id = a.id').where('r.role', 'reviewer'))
    .first('a.id', 'a.display_name', 'a.email', 'a.affiliation', 'a.expertise');
  return row ? toReviewerAccount(row) : undefined;
}

export async function findExpertise(db: Knex, accountId: number): Promise<string[]> {
  const row = await db('accounts').where({ id: accountId }).first('expertise');
  return (row?.expertise as string[] | undefined) ?? [];
}

export async function updateExpertise(db: Knex, accountId: number, expertise: string[]): Promise<void> {
  await db('accounts').where({ id: accountId }).update({ expertise });
}

/** Category names of every cycle (suggestions for expertise). */
export async function allCategories(db: Knex): Promise<string[]> {
  const rows = await db.raw<{ rows: { c: string }[] }>('SELECT DISTINCT unnest(categories) AS c FROM cycles ORDER BY 1');
  return rows.rows.map((r) => r.c);
}

/* ---------- panels ---------- */

export interface StoredPanel {
  id: number;
  cycleId: number;
  name: string;
  chairId: number | null;
  standingLocked: boolean;
  version: number;
  updatedAt: string;
}

interface PanelRow {
  id: number;
  cycle_id: number;
  name: string;
  chair_account_id: number | null;
  standing_locked_at: Date | null;
  version: number;
  updated_at: Date;
}

const toPanel = (r: PanelRow): StoredPanel => ({
  id: r.id,
  cycleId: r.cycle_id,
  name: r.name,
  chairId: r.chair_account_id,
  standingLocked: r.standing_locked_at !== null,
  version: r.version,
  updatedAt: r.updated_at.toISOString(),
});

export async function findPanel(db: Knex, id: number, options: { forUpdate?: boolean } = {}): Promise<StoredPanel | undefined> {
  const q = db<PanelRow>('panels').where({ id }).first();
  if (options.forUpdate) q.forUpdate();
  const row = await q;
  return row ? toPanel(row) : undefined;
}

export async function listPanelsOfCycle(db: Knex, cycleId: number): Promise<StoredPanel[]> {
  return (await db<PanelRow>('panels').where({ cycle_id: cycleId }).orderBy('name').orderBy('id')).map(toPanel);
}

export async function insertPanel(db: Knex, cycleId: number, name: string, chairId: number): Promise<number> {
  const [row] = await db('panels').insert({ cycle_id: cycleId, name, chair_account_id: chairId }).returning('id');
  return row.id;
}

export async function updatePanelRow(db: Knex, id: number, name: string, chairId: number): Promise<void> {
  await db('panels')
    .where({ id })
    .update({ name, chair_account_id: chairId, version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** Raises the panel's version (its proposals or assignments changed). */
export async function touchPanel(db: Knex, id: number): Promise<void> {
  await db('panels')
    .where({ id })
    .update({ version: db.raw('version + 1'), updated_at: db.fn.now() });
}

export async function deletePanelRow(db: Knex, id: number): Promise<void> {
  await db('panels').where({ id }).del();
}

/** Member ids of the panels, by panel. */
export async function membersOfPanels(db: Knex, panelIds: number[]): Promise<Map<number, number[]>> {
  const rows = await db('panel_members').whereIn('panel_id', panelIds).select('panel_id', 'account_id');
  const map = new Map<number, number[]>();
  for (const r of rows) map.set(r.panel_id, [...(map.get(r.panel_id) ?? []), r.account_id]);
  return map;
}

export async function replacePanelMembers(db: Knex, panelId: number, memberIds: number[]): Promise<void> {
  await db('panel_members').where({ panel_id: panelId }).whereNotIn('account_id', memberIds).del();
  if (memberIds.length) {
    await db('panel_members')
      .insert(memberIds.map((account_id) => ({ panel_id: panelId, account_id })))
      .onConflict(['panel_id', 'account_id'])
      .ignore();
  }
}

/** Proposals per panel. */
export async function proposalCounts(db: Knex, panelIds: number[]): Promise<Map<number, number>> {
  const rows = (await db('proposals')
    .whereIn('panel_id', panelIds)
    .groupBy('panel_id')
    .select('panel_id')
    .count({ n: '*' })) as unknown as {
    panel_id: number;
    n: string;
  }[];
  return new Map(rows.map((r) => [r.panel_id, Number(r.n)]));
}

/* ---------- proposals of a cycle under review ---------- */

export interface ReviewProposalRow {
  id: number;
  cycleId: number;
  title: string;
  category: string | null;
  state: ProposalState;
  piAccountId: number;
  piName: string;
  panelId: number | null;
  notDiscussed: boolean;
  setAside: boolean;
  graded: boolean;
}

interface ProposalJoinRow {
  id: number;
  cycle_id: number;
  title: string;
  category: string | null;
  state: ProposalState;
  pi_account_id: number;
  pi_name: string;
  panel_id: number | null;
  not_discussed: boolean;
  set_aside: boolean;
  graded: boolean;
}

function proposalQuery(db: Knex) {
  return db('proposals as p')
    .join('accounts as a', 'a.id', 'p.pi_account_id')
    .orderBy('p.title')
    .orderBy('p.id')
    .select(
      'p.id',
      'p.cycle_id',
      'p.title',
      'p.category',
      'p.state',
      'p.pi_account_id',
      'a.display_name as pi_name',
      'p.panel_id',
      'p.not_discussed',
      'p.set_aside',
      db.raw('EXISTS (SELECT 1 FROM review_assignments ra WHERE ra.proposal_id = p.id AND ra.grade IS NOT NULL) AS graded'),
    );
}

const toReviewProposal = (r: ProposalJoinRow): ReviewProposalRow => ({
  id: r.id,
  cycleId: r.cycle_id,
  title: r.title,
  category: r.category,
  state: r.state,
  piAccountId: r.pi_account_id,
  piName: r.pi_name,
  panelId: r.panel_id,
  notDiscussed: r.not_discussed,
  setAside: r.set_aside,
  graded: r.graded,
});

/** The cycle's proposals past draft (submitted and later), by title. */
export async function listSubmittedOfCycle(db: Knex, cycleId: number): Promise<ReviewProposalRow[]> {
  return ((await proposalQuery(db).where('p.cycle_id', cycleId).whereNot('p.state', 'draft')) as ProposalJoinRow[]).map(toReviewProposal);
}

export async function listProposalsOfPanel(db: Knex, panelId: number): Promise<ReviewProposalRow[]> {
  return ((await proposalQuery(db).where('p.panel_id', panelId)) as ProposalJoinRow[]).map(toReviewProposal);
}

/** The proposals with these ids, locked for the transaction. */
export async function findProposalsForUpdate(db: Knex, ids: number[]): Promise<ReviewProposalRow[]> {
  if (!ids.length) return [];
  await db('proposals').whereIn('id', ids).forUpdate().select('id');
  return ((await proposalQuery(db).whereIn('p.id', ids)) as ProposalJoinRow[]).map(toReviewProposal);
}

export async function setPanelOfProposals(db: Knex, ids: number[], panelId: number | null, state: ProposalState): Promise<void> {
  if (!ids.length) return;
  await db('proposals')
    .whereIn('id', ids)
    .update({ panel_id: panelId, state, version: db.raw('version + 1'), updated_at: db.fn.now() });
}

export async function setStateOfProposals(db: Knex, ids: number[], from: ProposalState, to: ProposalState): Promise<void> {
  if (!ids.length) return;
  await db('proposals')
    .whereIn('id', ids)
    .where('state', from)
    .update({ state: to, version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/* ---------- eligibility inputs ---------- */

export interface TeamMemberRow {
  proposalId: number;
  accountId: number | null;
  email: string;
  active: boolean;
  affiliation: string | null;
}

/** Every member row (active or invited) of the proposals, with the account's affiliation. */
export async function teamsOfProposals(db: Knex, proposalIds: number[]): Promise<TeamMemberRow[]> {
  if (!proposalIds.length) return [];
  const rows = await db('proposal_members as m')
    .leftJoin('accounts as a', 'a.id', 'm.account_id')
    .whereIn('m.proposal_id', proposalIds)
    .select('m.proposal_id', 'm.account_id', 'm.email', 'm.accepted_at', 'a.affiliation');
  return rows.map((r) => ({
    proposalId: r.proposal_id,
    accountId: r.account_id,
    email: r.email,
    active: r.accepted_at !== null,
    affiliation: r.affiliation,
  }));
}

export interface ConflictRow {
  proposalId: number;
  reviewerId: number;
  reason: string;
}

export async function conflictsOfProposals(db: Knex, proposalIds: number[]): Promise<ConflictRow[]> {
  if (!proposalIds.length) return [];
  const rows = await db('review_conflicts').whereIn('proposal_id', proposalIds).select('proposal_id', 'reviewer_account_id', 'reason');
  return rows.map((r) => ({ proposalId: r.proposal_id, reviewerId: r.reviewer_account_id, reason: r.reason }));
}

/* ---------- assignments ---------- */

export type AssignmentSource = 'manual' | 'automatic' | 'team';

export interface AssignmentRow {
  id: number;
  proposalId: number;
  reviewerId: number;
  source: AssignmentSource;
  graded: boolean;
  submitted: boolean;
  notifiedAt: string | null;
}

interface AssignmentDbRow {
  id: number;
  proposal_id: number;
  reviewer_account_id: number;
  source: AssignmentSource;
  grade: string | null;
  submitted_at: Date | null;
  notified_at: Date | null;
}

const toAssignment = (r: AssignmentDbRow): AssignmentRow => ({
  id: r.id,
  proposalId: r.proposal_id,
  reviewerId: r.reviewer_account_id,
  source: r.source,
  graded: r.grade !== null,
  submitted: r.submitted_at !== null,
  notifiedAt: r.notified_at?.toISOString() ?? null,
});

export async function assignmentsOfProposals(db: Knex, proposalIds: number[]): Promise<AssignmentRow[]> {
  if (!proposalIds.length) return [];
  return (await db<AssignmentDbRow>('review_assignments').whereIn('proposal_id', proposalIds).orderBy('id')).map(toAssignment);
}

/** Assignments of the panel's proposals. */
export async function assignmentsOfPanel(db: Knex, panelId: number): Promise<AssignmentRow[]> {
  return (
    await db<AssignmentDbRow>('review_assignments as ra')
      .join('proposals as p', 'p.id', 'ra.proposal_id')
      .where('p.panel_id', panelId)
      .orderBy('ra.id')
      .select('ra.*')
  ).map(toAssignment);
}

/** Inserts the pairs; returns the new rows' ids. */
export async function insertAssignments(
  db: Knex,
  pairs: { proposalId: number; reviewerId: number }[],
  source: AssignmentSource,
  assignedBy: number,
): Promise<number[]> {
  if (!pairs.length) return [];
  const rows = await db('review_assignments')
    .insert(pairs.map((p) => ({ proposal_id: p.proposalId, reviewer_account_id: p.reviewerId, source, assigned_by: assignedBy })))
    .returning('id');
  return rows.map((r: { id: number }) => r.id);
}

export async function deleteAssignments(db: Knex, ids: number[]): Promise<void> {
  if (!ids.length) return;
  await db('review_assignments').whereIn('id', ids).del();
}

export async function setAssignmentSource(db: Knex, id: number, source: AssignmentSource, assignedBy: number): Promise<void> {
  await db('review_assignments')
    .where({ id })
    .update({ source, assigned_by: assignedBy, version: db.raw('version + 1') });
}

/* ---------- distributed review ---------- */

export interface TeamReviewerEntry {
  proposalId: number;
  reviewerId: number;
  namedAt: string;
}

export async function teamReviewersOfProposals(db: Knex, proposalIds: number[]): Promise<TeamReviewerEntry[]> {
  if (!proposalIds.length) return [];
  const rows = await db('team_reviewers').whereIn('proposal_id', proposalIds).select('proposal_id', 'reviewer_account_id', 'named_at');
  return rows.map((r) => ({ proposalId: r.proposal_id, reviewerId: r.reviewer_account_id, namedAt: (r.named_at as Date).toISOString() }));
}

export async function upsertTeamReviewer(db: Knex, proposalId: number, reviewerId: number, namedBy: number): Promise<void> {
  await db('team_reviewers')
    .insert({ proposal_id: proposalId, reviewer_account_id: reviewerId, named_by: namedBy, named_at: db.fn.now() })
    .onConflict('proposal_id')
    .merge(['reviewer_account_id', 'named_by', 'named_at']);
}

/** Team-source assignments whose proposal is in the cycle. */
export async function teamAssignmentsOfCycle(db: Knex, cycleId: number): Promise<AssignmentRow[]> {
  return (
    await db<AssignmentDbRow>('review_assignments as ra')
      .join('proposals as p', 'p.id', 'ra.proposal_id')
      .where('p.cycle_id', cycleId)
      .where('ra.source', 'team')
      .orderBy('ra.id')
      .select('ra.*')
  ).map(toAssignment);
}

export async function setAside(db: Knex, ids: number[]): Promise<number> {
  if (!ids.length) return 0;
  return db('proposals').whereIn('id', ids).where('set_aside', false).update({ set_aside: true, updated_at: db.fn.now() });
}

/** The panels an account sits on (member or chair), newest cycle first, with their proposal counts. */
export async function panelsOfAccount(
  db: Knex,
  accountId: number,
): Promise<
  {
    panel_id: number;
    panel_name: string;
    cycle_id: number;
    cycle_code: string;
    cycle_title: string;
    chair_account_id: number | null;
    review_deadline: Date | null;
    standing_locked_at: Date | null;
    proposals: number;
  }[]
> {
  return db('panels as p')
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .where((w) =>
      w
        .where('p.chair_account_id', accountId)
        .orWhereExists(db('panel_members as m').whereRaw('m.panel_id = p.id').where('m.account_id', accountId)),
    )
    .orderBy([{ column: 'c.call_closes_at', order: 'desc' }, { column: 'p.name' }])
    .select(
      'p.id as panel_id',
      'p.name as panel_name',
      'c.id as cycle_id',
      'c.code as cycle_code',
      'c.title as cycle_title',
      'p.chair_account_id',
      'c.review_deadline',
      'p.standing_locked_at',
      db.raw("(SELECT count(*)::int FROM proposals pr WHERE pr.panel_id = p.id AND pr.state <> 'draft') AS proposals"),
    );
}

/* ---------- the assignment matrix ---------- */

/**
 * Everything the assignment matrix shows, read in one query as three JSON texts: the panel
 * with its cycle's settings (null when there is no such panel); its members who are enabled
 * reviewers, by name (as listReviewerAccounts orders them); its proposals by title, each with
 * every assignment (members or not), declared conflict and team member row (active or invited,
 * with the account's affiliation), in compact arrays. The answer is a function of these texts
 * alone, so an unchanged text is an unchanged answer.
 */
export interface MatrixSource {
  panel: string | null;
  reviewers: string;
  proposals: string;
}

export async function readMatrixSource(db: Knex, panelId: number): Promise<MatrixSource> {
  const { rows } = await db.raw<{ rows: MatrixSource[] }>(
    `SELECT
       (SELECT row_to_json(x)::text FROM (
          SELECT p.id, p.cycle_id, p.name, p.chair_account_id, p.standing_locked_at IS NOT NULL AS standing_locked, p.version,
                 c.code AS cycle_code, c.reviewers_per_proposal, c.review_deadline
            FROM panels p JOIN cycles c ON c.id = p.cycle_id
           WHERE p.id = :panelId) x) AS panel,
       (SELECT coalesce(json_agg(json_build_array(a.id, a.display_name, a.email, a.affiliation, a.expertise)
                                 ORDER BY a.display_name, a.id), '[]')::text
          FROM panel_members m JOIN accounts a ON a.id = m.account_id
         WHERE m.panel_id = :panelId AND a.disabled_at IS NULL
           AND EXISTS (SELECT 1 FROM account_roles r WHERE r.account_id = a.id AND r.role = 'reviewer')) AS reviewers,
       (SELECT coalesce(json_agg(json_build_array(
                 p.id, p.title, p.category, p.state, pi.display_name, p.not_discussed,
                 (SELECT coalesce(json_agg(json_build_array(ra.reviewer_account_id, ra.source, ra.grade IS NOT NULL) ORDER BY ra.id), '[]')
                    FROM review_assignments ra WHERE ra.proposal_id = p.id),
                 (SELECT coalesce(json_agg(json_build_array(rc.reviewer_account_id, rc.reason) ORDER BY rc.reviewer_account_id), '[]')
                    FROM review_conflicts rc WHERE rc.proposal_id = p.id),
                 (SELECT coalesce(json_agg(json_build_array(tm.account_id, tm.email, tm.accepted_at IS NOT NULL, ta.affiliation) ORDER BY tm.id), '[]')
                    FROM proposal_members tm LEFT JOIN accounts ta ON ta.id = tm.account_id WHERE tm.proposal_id = p.id))
               ORDER BY p.title, p.id), '[]')::text
          FROM proposals p JOIN accounts pi ON pi.id = p.pi_account_id
         WHERE p.panel_id = :panelId) AS proposals`,
    { panelId },
  );
  return rows[0];
}

/** One proposal of the matrix with its assignments, declared conflicts and team. */
export interface MatrixProposalRow {
  id: number;
  title: string;
  category: string | null;
  state: ProposalState;
  piName: string;
  notDiscussed: boolean;
  assignments: { reviewerId: number; source: AssignmentSource; graded: boolean }[];
  conflicts: { reviewerId: number; reason: string }[];
  team: Omit<TeamMemberRow, 'proposalId'>[];
}

/** The matrix's inputs as objects (parsed from {@link readMatrixSource}'s texts); undefined without the panel. */
export function parseMatrixSource(source: MatrixSource):
  | {
      panel: Omit<StoredPanel, 'updatedAt'>;
      cycleCode: string;
      reviewersPerProposal: number;
      reviewDeadline: string | null;
      reviewers: ReviewerAccount[];
      proposals: MatrixProposalRow[];
    }
  | undefined {
  if (source.panel === null) return undefined;
  const p = JSON.parse(source.panel) as {
    id: number;
    cycle_id: number;
    name: string;
    chair_account_id: number | null;
    standing_locked: boolean;
    version: number;
    cycle_code: string;
    reviewers_per_proposal: number;
    review_deadline: string | null;
  };
  const reviewers = JSON.parse(source.reviewers) as [number, string, string, string | null, string[]][];
  const proposals = JSON.parse(source.proposals) as [
    number,
    string,
    string | null,
    ProposalState,
    string,
    boolean,
    [number, AssignmentSource, boolean][],
    [number, string][],
    [number | null, string, boolean, string | null][],
  ][];
  return {
    panel: {
      id: p.id,
      cycleId: p.cycle_id,
      name: p.name,
      chairId: p.chair_account_id,
      standingLocked: p.standing_locked,
      version: p.version,
    },
    cycleCode: p.cycle_code,
    reviewersPerProposal: p.reviewers_per_proposal,
    reviewDeadline: p.review_deadline === null ? null : new Date(p.review_deadline).toISOString(),
    reviewers: reviewers.map(([id, displayName, email, affiliation, expertise]) =>
      toReviewerAccount({ id, display_name: displayName, email, affiliation, expertise }),
    ),
    proposals: proposals.map(([id, title, category, state, piName, notDiscussed, assignments, conflicts, team]) => ({
      id,
      title,
      category,
      state,
      piName,
      notDiscussed,
      assignments: assignments.map(([reviewerId, source, graded]) => ({ reviewerId, source, graded })),
      conflicts: conflicts.map(([reviewerId, reason]) => ({ reviewerId, reason })),
      team: team.map(([accountId, email, active, affiliation]) => ({ accountId, email, active, affiliation })),
    })),
  };
}
