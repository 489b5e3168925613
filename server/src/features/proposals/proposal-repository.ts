import type { Knex } from 'knex';
import type { MemberRole, ProposalSummary } from '@spincycle/shared/proposals/proposal-schemas';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';

export interface ProposalRow {
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

export function toProposal(r: ProposalRow): StoredProposal {
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
export async function insertProposal(
  db: Knex,
  input: { cycleId: number; piAccountId: number; title: string; completeness?: number },
): Promise<number> {
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
