import type { Knex } from 'knex';
import type { AwardOutcome, ProgramState } from '@spincycle/shared/awards/awards';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';
import type { GradeEntry } from '@spincycle/shared/review/review-statistics';

/** Proposal states shown on the award board (a locked standing makes its proposals ranked). */
export const BOARD_STATES: ProposalState[] = ['ranked', 'awarded', 'reserve', 'not_awarded'];

/** A cycle as the awards need it. */
export interface AwardCycle {
  id: number;
  code: string;
  title: string;
  campaignStart: string;
  campaignEnd: string;
  releasedAt: Date | null;
}

interface CycleRow {
  id: number;
  code: string;
  title: string;
  campaign_start: string;
  campaign_end: string;
  awards_released_at: Date | null;
}

const toCycle = (r: CycleRow): AwardCycle => ({
  id: r.id,
  code: r.code,
  title: r.title,
  campaignStart: r.campaign_start,
  campaignEnd: r.campaign_end,
  releasedAt: r.awards_released_at,
});

/**
 * The cycle; `lock` takes its row FOR NO KEY UPDATE (award writes and the release of one cycle
 * queue on it, while rows referring to the cycle can still be inserted).
 */
export async function findAwardCycle(db: Knex, cycleId: number, options: { lock?: boolean } = {}): Promise<AwardCycle | undefined> {
  const q = db('cycles').where('id', cycleId).first('id', 'code', 'title', 'campaign_start', 'campaign_end', 'awards_released_at');
  if (options.lock) q.forNoKeyUpdate();
  const row = (await q) as CycleRow | undefined;
  return row ? toCycle(row) : undefined;
}

/** Locks the cycle's capacity rows (cycle_nodes) FOR UPDATE, in node order; returns node id → offered node-hours. */
export async function lockCycleNodes(db: Knex, cycleId: number): Promise<Map<number, number>> {
  const rows = (await db('cycle_nodes')
    .where('cycle_id', cycleId)
    .orderBy('node_id')
    .forUpdate()
    .select('node_id', 'node_hours_available')) as { node_id: number; node_hours_available: number }[];
  return new Map(rows.map((r) => [r.node_id, Number(r.node_hours_available)]));
}

/** A node the cycle offers, with its site and weather loss. */
export interface CycleNode {
  nodeId: number;
  code: string;
  name: string;
  siteName: string;
  offeredHours: number;
  weatherLossFraction: number;
}

export async function listCycleNodes(db: Knex, cycleId: number): Promise<CycleNode[]> {
  const rows = (await db('cycle_nodes as cn')
    .join('nodes as n', 'n.id', 'cn.node_id')
    .join('sites as s', 's.id', 'n.site_id')
    .where('cn.cycle_id', cycleId)
    .orderBy('n.code')
    .select('n.id', 'n.code', 'n.name', 's.name as site_name', 'cn.node_hours_available', 'n.weather_loss_fraction')) as {
    id: number;
    code: string;
    name: string;
    site_name: string;
    node_hours_available: number;
    weather_loss_fraction: number;
  }[];
  return rows.map((r) => ({
    nodeId: r.id,
    code: r.code,
    name: r.name,
    siteName: r.site_name,
    offeredHours: Number(r.node_hours_available),
    weatherLossFraction: Number(r.weather_loss_fraction),
  }));
}

/** A panel of the cycle with how many proposals (not drafts) it holds. */
export interface CyclePanel {
  id: number;
  name: string;
  standingLockedAt: Date | null;
  proposals: number;
}

export async function listCyclePanels(db: Knex, cycleId: number): Promise<CyclePanel[]> {
  const rows = (await db('panels as pa')
    .leftJoin('proposals as p', (on) => {
      on.on('p.panel_id', 'pa.id').andOnVal('p.state', '<>', 'draft');
    })
    .where('pa.cycle_id', cycleId)
    .groupBy('pa.id')
    .orderBy('pa.name')
    .select('pa.id', 'pa.name', 'pa.standing_locked_at', db.raw('count(p.id)::int AS proposals'))) as {
    id: number;
    name: string;
    standing_locked_at: Date | null;
    proposals: number;
  }[];
  return rows.map((r) => ({ id: r.id, name: r.name, standingLockedAt: r.standing_locked_at, proposals: r.proposals }));
}

/** A proposal of a locked standing, in its place. */
export interface BoardProposal {
  id: number;
  title: string;
  state: ProposalState;
  panelId: number;
  panelName: string;
  position: number;
  piName: string;
}

/** The proposals of the cycle's locked standings in the board states, by panel name then position. */
export async function listBoardProposals(db: Knex, cycleId: number): Promise<BoardProposal[]> {
  const rows = (await db('proposals as p')
    .join('panels as pa', 'pa.id', 'p.panel_id')
    .join('standing_positions as sp', (on) => {
      on.on('sp.proposal_id', 'p.id').andOn('sp.panel_id', 'pa.id');
    })
    .join('accounts as a', 'a.id', 'p.pi_account_id')
    .where('p.cycle_id', cycleId)
    .whereNotNull('pa.standing_locked_at')
    .whereIn('p.state', BOARD_STATES)
    .orderBy('pa.name')
    .orderBy('pa.id')
    .orderBy('sp.position')
    .select('p.id', 'p.title', 'p.state', 'pa.id as panel_id', 'pa.name as panel_name', 'sp.position', 'a.display_name')) as {
    id: number;
    title: string;
    state: ProposalState;
    panel_id: number;
    panel_name: string;
    position: number;
    display_name: string;
  }[];
  return rows.map((r) => ({
    id: r.id,
    title: r.title,
    state: r.state,
    panelId: r.panel_id,
    panelName: r.panel_name,
    position: r.position,
    piName: r.display_name,
  }));
}

/**
 * Every grade given in the panels (as the standing reads them: proposals not drafts), with
 * the panel of each, so that the mean z of each proposal is computed within its panel.
 */
export async function listGradesOfPanels(
  db: Knex,
  panelIds: number[],
): Promise<Map<number, { proposalIds: number[]; grades: GradeEntry[] }>> {
  const out = new Map<number, { proposalIds: number[]; grades: GradeEntry[] }>(panelIds.map((id) => [id, { proposalIds: [], grades: [] }]));
  if (!panelIds.length) return out;
  const proposals = (await db('proposals')
    .whereIn('panel_id', panelIds)
    .whereNot('state', 'draft')
    .orderBy('id')
    .select('id', 'panel_id')) as { id: number; panel_id: number }[];
  for (const p of proposals) out.get(p.panel_id)!.proposalIds.push(p.id);
  const grades = (await db('review_assignments as ra')
    .join('proposals as p', 'p.id', 'ra.proposal_id')
    .whereIn('p.panel_id', panelIds)
    .whereNot('p.state', 'draft')
    .whereNotNull('ra.grade')
    .select('p.panel_id', 'ra.proposal_id', 'ra.reviewer_account_id', 'ra.grade')) as {
    panel_id: number;
    proposal_id: number;
    reviewer_account_id: number;
    grade: number;
  }[];
  for (const g of grades) {
    out.get(g.panel_id)!.grades.push({ proposalId: g.proposal_id, reviewerId: g.reviewer_account_id, grade: Number(g.grade) });
  }
  return out;
}

/** A target of a proposal and whether it has a feasible plan on a node the proposal requests. */
export interface ProposalTarget {
  id: number;
  proposalId: number;
  name: string;
  feasible: boolean;
}

export async function listTargetsOf(db: Knex, proposalIds: number[]): Promise<ProposalTarget[]> {
  if (!proposalIds.length) return [];
  const rows = (await db('targets as t')
    .whereIn('t.proposal_id', proposalIds)
    .orderBy('t.proposal_id')
    .orderBy('t.position')
    .orderBy('t.id')
    .select(
      't.id',
      't.proposal_id',
      't.name',
      db.raw(`EXISTS (
        SELECT 1 FROM target_plans tp
        JOIN proposal_nodes pn ON pn.proposal_id = tp.proposal_id AND pn.node_id = tp.node_id
        WHERE tp.target_id = t.id AND tp.feasible AND tp.node_hours IS NOT NULL
      ) AS feasible`),
    )) as { id: number; proposal_id: number; name: string; feasible: boolean }[];
  return rows.map((r) => ({ id: r.id, proposalId: r.proposal_id, name: r.name, feasible: r.feasible }));
}

/** Node-hours of one feasible plan (a target on a node the proposal requests). */
export interface FeasiblePlan {
  proposalId: number;
  targetId: number;
  nodeId: number;
  nodeHours: number;
}

export async function listFeasiblePlans(db: Knex, proposalIds: number[]): Promise<FeasiblePlan[]> {
  if (!proposalIds.length) return [];
  const rows = (await db('target_plans as tp')
    .join('proposal_nodes as pn', (on) => {
      on.on('pn.proposal_id', 'tp.proposal_id').andOn('pn.node_id', 'tp.node_id');
    })
    .whereIn('tp.proposal_id', proposalIds)
    .where('tp.feasible', true)
    .whereNotNull('tp.node_hours')
    .select('tp.proposal_id', 'tp.target_id', 'tp.node_id', 'tp.node_hours')) as {
    proposal_id: number;
    target_id: number;
    node_id: number;
    node_hours: number;
  }[];
  return rows.map((r) => ({ proposalId: r.proposal_id, targetId: r.target_id, nodeId: r.node_id, nodeHours: Number(r.node_hours) }));
}

/** The nodes each proposal requests (proposal id → node ids, in id order). */
export async function listRequestedNodes(db: Knex, proposalIds: number[]): Promise<Map<number, number[]>> {
  const out = new Map<number, number[]>();
  if (!proposalIds.length) return out;
  const rows = (await db('proposal_nodes').whereIn('proposal_id', proposalIds).orderBy('node_id').select('proposal_id', 'node_id')) as {
    proposal_id: number;
    node_id: number;
  }[];
  for (const r of rows) out.set(r.proposal_id, [...(out.get(r.proposal_id) ?? []), r.node_id]);
  return out;
}

/** A stored decision with its node-hours. */
export interface StoredAward {
  proposalId: number;
  cycleId: number;
  outcome: AwardOutcome;
  nodes: { nodeId: number; nodeHours: number }[];
  targetIds: number[] | null;
  overrideReason: string | null;
  decidedAt: Date;
  decidedBy: string | null;
  version: number;
  mailedAt: Date | null;
}

interface AwardRow {
  proposal_id: number;
  cycle_id: number;
  outcome: AwardOutcome;
  target_ids: number[] | null;
  override_reason: string | null;
  decided_at: Date;
  decided_by_name: string | null;
  version: number;
  mailed_at: Date | null;
}

async function readAwards(db: Knex, where: (q: Knex.QueryBuilder) => void, forUpdate = false): Promise<StoredAward[]> {
  const q = db('awards as aw').leftJoin('accounts as a', 'a.id', 'aw.decided_by');
  where(q);
  if (forUpdate) q.forUpdate('aw');
  const rows = (await q
    .orderBy('aw.proposal_id')
    .select(
      'aw.proposal_id',
      'aw.cycle_id',
      'aw.outcome',
      'aw.target_ids',
      'aw.override_reason',
      'aw.decided_at',
      'a.display_name as decided_by_name',
      'aw.version',
      'aw.mailed_at',
    )) as AwardRow[];
  if (!rows.length) return [];
  const nodeRows = (await db('award_nodes')
    .whereIn(
      'proposal_id',
      rows.map((r) => r.proposal_id),
    )
    .orderBy('node_id')
    .select('proposal_id', 'node_id', 'node_hours')) as { proposal_id: number; node_id: number; node_hours: number }[];
  const nodes = new Map<number, { nodeId: number; nodeHours: number }[]>();
  for (const n of nodeRows)
    nodes.set(n.proposal_id, [...(nodes.get(n.proposal_id) ?? []), { nodeId: n.node_id, nodeHours: Number(n.node_hours) }]);
  return rows.map((r) => ({
    proposalId: r.proposal_id,
    cycleId: r.cycle_id,
    outcome: r.outcome,
    nodes: nodes.get(r.proposal_id) ?? [],
    targetIds: r.target_ids,
    overrideReason: r.override_reason,
    decidedAt: r.decided_at,
    decidedBy: r.decided_by_name,
    version: r.version,
    mailedAt: r.mailed_at,
  }));
}

/** Every decision of the cycle. */
export function listAwardsOfCycle(db: Knex, cycleId: number): Promise<StoredAward[]> {
  return readAwards(db, (q) => q.where('aw.cycle_id', cycleId));
}

/** One proposal's decision; `forUpdate` locks the award row. */
export async function findAward(db: Knex, proposalId: number, options: { forUpdate?: boolean } = {}): Promise<StoredAward | undefined> {
  return (await readAwards(db, (q) => q.where('aw.proposal_id', proposalId), options.forUpdate))[0];
}

/** Node-hours awarded on each node of the cycle (outcome awarded), leaving out one proposal's award. */
export async function awardedHoursByNode(db: Knex, cycleId: number, exceptProposalId: number): Promise<Map<number, number>> {
  const rows = (await db('award_nodes as an')
    .join('awards as aw', 'aw.proposal_id', 'an.proposal_id')
    .where('aw.cycle_id', cycleId)
    .where('aw.outcome', 'awarded')
    .whereNot('aw.proposal_id', exceptProposalId)
    .groupBy('an.node_id')
    .select('an.node_id', db.raw('sum(an.node_hours) AS hours'))) as { node_id: number; hours: number }[];
  return new Map(rows.map((r) => [r.node_id, Number(r.hours)]));
}

/** The proposal with what an award of it needs: its cycle, state and panel. */
export interface AwardProposal {
  id: number;
  cycleId: number;
  title: string;
  state: ProposalState;
  panelId: number | null;
  panelName: string | null;
  standingLockedAt: Date | null;
  hasPosition: boolean;
}

export async function findAwardProposal(db: Knex, proposalId: number): Promise<AwardProposal | undefined> {
  const row = (await db('proposals as p')
    .leftJoin('panels as pa', 'pa.id', 'p.panel_id')
    .leftJoin('standing_positions as sp', (on) => {
      on.on('sp.proposal_id', 'p.id').andOn('sp.panel_id', 'pa.id');
    })
    .where('p.id', proposalId)
    .first(
      'p.id',
      'p.cycle_id',
      'p.title',
      'p.state',
      'p.panel_id',
      'pa.name as panel_name',
      'pa.standing_locked_at',
      db.raw('sp.proposal_id IS NOT NULL AS has_position'),
    )) as
    | {
        id: number;
        cycle_id: number;
        title: string;
        state: ProposalState;
        panel_id: number | null;
        panel_name: string | null;
        standing_locked_at: Date | null;
        has_position: boolean;
      }
    | undefined;
  if (!row) return undefined;
  return {
    id: row.id,
    cycleId: row.cycle_id,
    title: row.title,
    state: row.state,
    panelId: row.panel_id,
    panelName: row.panel_name,
    standingLockedAt: row.standing_locked_at,
    hasPosition: row.has_position,
  };
}

/** The ids of the proposal's targets. */
export async function listTargetIds(db: Knex, proposalId: number): Promise<number[]> {
  return db('targets').where('proposal_id', proposalId).orderBy('id').pluck('id');
}

/** Inserts or replaces the decision (version 1, or one more than before) and its node-hours. */
export async function writeAward(
  db: Knex,
  award: {
    proposalId: number;
    cycleId: number;
    outcome: AwardOutcome;
    nodes: { nodeId: number; nodeHours: number }[];
    targetIds: number[] | null;
    overrideReason: string | null;
    decidedBy: number;
    decidedAt: Date;
  },
): Promise<void> {
  await db('awards')
    .insert({
      proposal_id: award.proposalId,
      cycle_id: award.cycleId,
      outcome: award.outcome,
      target_ids: award.targetIds,
      override_reason: award.overrideReason,
      decided_by: award.decidedBy,
      decided_at: award.decidedAt,
      version: 1,
    })
    .onConflict('proposal_id')
    .merge({
      outcome: award.outcome,
      target_ids: award.targetIds,
      override_reason: award.overrideReason,
      decided_by: award.decidedBy,
      decided_at: award.decidedAt,
      version: db.raw('awards.version + 1'),
      updated_at: db.fn.now(),
    });
  await db('award_nodes').where('proposal_id', award.proposalId).del();
  if (award.nodes.length) {
    await db('award_nodes').insert(award.nodes.map((n) => ({ proposal_id: award.proposalId, node_id: n.nodeId, node_hours: n.nodeHours })));
  }
}

/** What an audit entry is about: awards (this feature) and night plans (features/night-plans, with its calendar links). */
export type AuditEntity = 'award' | 'release' | 'program' | 'night_plan' | 'lost_night' | 'visit' | 'calendar_feed' | 'invoice';

/** One audit entry to write (the audit log of every feature of a cycle). */
export interface AuditInsert {
  actorAccountId: number | null;
  cycleId: number;
  entity: AuditEntity;
  entityId: number;
  action: string;
  before: unknown;
  after: unknown;
  reason: string | null;
  at: Date;
}

export async function insertAudit(db: Knex, entries: AuditInsert[]): Promise<void> {
  if (!entries.length) return;
  await db('audit_log').insert(
    entries.map((e) => ({
      at: e.at,
      actor_account_id: e.actorAccountId,
      cycle_id: e.cycleId,
      entity: e.entity,
      entity_id: e.entityId,
      action: e.action,
      // jsonb columns: knex would send a JS array as a PostgreSQL array, so stringify.
      before: e.before === null || e.before === undefined ? null : JSON.stringify(e.before),
      after: e.after === null || e.after === undefined ? null : JSON.stringify(e.after),
      reason: e.reason,
    })),
  );
}

/** One audit entry as read. */
export interface StoredAuditEntry {
  id: number;
  at: Date;
  actorName: string | null;
  entity: AuditEntity;
  entityId: number;
  proposalTitle: string | null;
  action: string;
  before: unknown;
  after: unknown;
  reason: string | null;
}

/** The cycle's audit entries, newest first. */
export async function listAudit(db: Knex, cycleId: number): Promise<StoredAuditEntry[]> {
  const rows = (await db('audit_log as l')
    .leftJoin('accounts as a', 'a.id', 'l.actor_account_id')
    .leftJoin('proposals as p', (on) => {
      on.on('p.id', 'l.entity_id').andOnIn('l.entity', ['award', 'program']);
    })
    .where('l.cycle_id', cycleId)
    .orderBy('l.at', 'desc')
    .orderBy('l.id', 'desc')
    .select('l.id', 'l.at', 'a.display_name', 'l.entity', 'l.entity_id', 'p.title', 'l.action', 'l.before', 'l.after', 'l.reason')) as {
    id: number;
    at: Date;
    display_name: string | null;
    entity: StoredAuditEntry['entity'];
    entity_id: number;
    title: string | null;
    action: string;
    before: unknown;
    after: unknown;
    reason: string | null;
  }[];
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    actorName: r.display_name,
    entity: r.entity,
    entityId: r.entity_id,
    proposalTitle: r.title,
    action: r.action,
    before: r.before,
    after: r.after,
    reason: r.reason,
  }));
}

/** Program states of the cycle's proposals (proposal id → state). */
export async function listProgramStates(db: Knex, cycleId: number): Promise<Map<number, ProgramState>> {
  const rows = (await db('programs').where('cycle_id', cycleId).select('proposal_id', 'state')) as {
    proposal_id: number;
    state: ProgramState;
  }[];
  return new Map(rows.map((r) => [r.proposal_id, r.state]));
}

/** The proposal's program state; `forUpdate` locks the program row. */
export async function findProgramState(
  db: Knex,
  proposalId: number,
  options: { forUpdate?: boolean } = {},
): Promise<ProgramState | undefined> {
  const q = db('programs').where('proposal_id', proposalId).first('state');
  if (options.forUpdate) q.forUpdate();
  const row = (await q) as { state: ProgramState } | undefined;
  return row?.state;
}

/** Creates the proposal's program (scheduled), or sets the state of the existing one. */
export async function writeProgram(db: Knex, proposalId: number, cycleId: number, state: ProgramState): Promise<void> {
  await db('programs')
    .insert({ proposal_id: proposalId, cycle_id: cycleId, state })
    .onConflict('proposal_id')
    .merge({ state, version: db.raw('programs.version + 1'), updated_at: db.fn.now() });
}

/** Sets proposals' states (one statement per state). */
export async function setProposalStates(db: Knex, states: Map<number, ProposalState>): Promise<void> {
  const byState = new Map<ProposalState, number[]>();
  for (const [id, state] of states) byState.set(state, [...(byState.get(state) ?? []), id]);
  for (const [state, ids] of byState) {
    await db('proposals')
      .whereIn('id', ids)
      .update({ state, version: db.raw('version + 1'), updated_at: db.fn.now() });
  }
}

/** Creates scheduled programs for the proposals (those that have one keep it); returns how many were created. */
export async function createPrograms(db: Knex, cycleId: number, proposalIds: number[]): Promise<number> {
  if (!proposalIds.length) return 0;
  const created = await db('programs')
    .insert(proposalIds.map((id) => ({ proposal_id: id, cycle_id: cycleId, state: 'scheduled' })))
    .onConflict('proposal_id')
    .ignore()
    .returning('proposal_id');
  return created.length;
}

export async function markReleased(db: Knex, cycleId: number, accountId: number, at: Date): Promise<void> {
  await db('cycles').where('id', cycleId).update({ awards_released_at: at, awards_released_by: accountId, updated_at: db.fn.now() });
}

/** The team's addresses: the PI and accepted members, at their account e-mail (enabled accounts). */
export async function listTeamEmails(db: Knex, proposalId: number): Promise<string[]> {
  const rows = (await db('proposal_members as m')
    .join('accounts as a', 'a.id', 'm.account_id')
    .where('m.proposal_id', proposalId)
    .whereNotNull('m.accepted_at')
    .whereNull('a.disabled_at')
    .orderByRaw("m.role = 'pi' DESC")
    .orderBy('m.id')
    .select('a.email')) as { email: string }[];
  return [...new Set(rows.map((r) => r.email))];
}

/**
 * The reviewers' comments on a proposal in a fixed order (assignment order), without any
 * reviewer's identity and without the notes meant for the committee: graded reviews with
 * some text only.
 */
export async function listReviewComments(db: Knex, proposalId: number): Promise<{ strengths: string; weaknesses: string }[]> {
  const rows = (await db('review_assignments')
    .where('proposal_id', proposalId)
    .whereNotNull('grade')
    .where((w) => w.whereNot('strengths', '').orWhereNot('weaknesses', ''))
    .orderBy('id')
    .select('strengths', 'weaknesses')) as { strengths: string; weaknesses: string }[];
  return rows.map((r) => ({ strengths: r.strengths, weaknesses: r.weaknesses }));
}

/** Code and name of nodes. */
export async function listNodeNames(db: Knex, nodeIds: number[]): Promise<Map<number, { code: string; name: string }>> {
  if (!nodeIds.length) return new Map();
  const rows = (await db('nodes').whereIn('id', nodeIds).select('id', 'code', 'name')) as { id: number; code: string; name: string }[];
  return new Map(rows.map((r) => [r.id, { code: r.code, name: r.name }]));
}

/** Names of targets, in the proposal's order. */
export async function listTargetNames(db: Knex, targetIds: number[]): Promise<string[]> {
  if (!targetIds.length) return [];
  return db('targets').whereIn('id', targetIds).orderBy('position').orderBy('id').pluck('name');
}

/** The proposal with its cycle's release, for the team's decision page. */
export async function findReleasedDecisionProposal(db: Knex, proposalId: number) {
  return (await db('proposals as p')
    .join('cycles as c', 'c.id', 'p.cycle_id')
    .where('p.id', proposalId)
    .first('p.id', 'p.title', 'p.cycle_id', 'c.code', 'c.title as cycle_title', 'c.awards_released_at')) as
    { id: number; title: string; cycle_id: number; code: string; cycle_title: string; awards_released_at: Date | null } | undefined;
}

/** Per cycle with at least one panel: panels, locked panels, proposals on the board, decided, release. */
export async function listAwardCycleSummaries(db: Knex) {
  const rows = (await db('cycles as c')
    .whereExists(db('panels').whereRaw('panels.cycle_id = c.id').select(db.raw('1')))
    .orderBy('c.campaign_start', 'desc')
    .orderBy('c.id', 'desc')
    .select(
      'c.id',
      'c.code',
      'c.title',
      'c.awards_released_at',
      db.raw('(SELECT count(*)::int FROM panels pa WHERE pa.cycle_id = c.id) AS panels'),
      db.raw('(SELECT count(*)::int FROM panels pa WHERE pa.cycle_id = c.id AND pa.standing_locked_at IS NOT NULL) AS locked_panels'),
      db.raw(
        `(SELECT count(*)::int FROM proposals p
           JOIN panels pa ON pa.id = p.panel_id AND pa.standing_locked_at IS NOT NULL
           JOIN standing_positions sp ON sp.proposal_id = p.id AND sp.panel_id = pa.id
          WHERE p.cycle_id = c.id AND p.state = ANY(?::text[])) AS ranked`,
        [BOARD_STATES],
      ),
      db.raw(
        `(SELECT count(*)::int FROM proposals p
           JOIN panels pa ON pa.id = p.panel_id AND pa.standing_locked_at IS NOT NULL
           JOIN standing_positions sp ON sp.proposal_id = p.id AND sp.panel_id = pa.id
           JOIN awards aw ON aw.proposal_id = p.id
          WHERE p.cycle_id = c.id AND p.state = ANY(?::text[])) AS decided`,
        [BOARD_STATES],
      ),
    )) as {
    id: number;
    code: string;
    title: string;
    awards_released_at: Date | null;
    panels: number;
    locked_panels: number;
    ranked: number;
    decided: number;
  }[];
  return rows;
}
