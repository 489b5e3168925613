import type { Knex } from 'knex';
import type { GradeEntry } from '@spincycle/shared/review/review-statistics';
import type { PressureRequest } from '@spincycle/shared/review/pressure';
import type { ProposalState } from '@spincycle/shared/proposals/proposal-states';

/** A panel with what its statistics and standing need of its cycle. */
export interface StoredPanel {
  id: number;
  name: string;
  cycleId: number;
  cycleCode: string;
  anonymousReview: boolean;
  reviewDeadline: Date | null;
  chairAccountId: number | null;
  spreadThreshold: number;
  triageFraction: number;
  standingLockedAt: Date | null;
  standingLockedBy: string | null;
  version: number;
}

interface PanelRow {
  id: number;
  name: string;
  cycle_id: number;
  cycle_code: string;
  anonymous_review: boolean;
  review_deadline: Date | null;
  chair_account_id: number | null;
  spread_threshold: number;
  triage_fraction: number;
  standing_locked_at: Date | null;
  locked_by_name: string | null;
  version: number;
}

function toPanel(r: PanelRow): StoredPanel {
  return {
    id: r.id,
    name: r.name,
    cycleId: r.cycle_id,
    cycleCode: r.cycle_code,
    anonymousReview: r.anonymous_review,
    reviewDeadline: r.review_deadline,
    chairAccountId: r.chair_account_id,
    spreadThreshold: Number(r.spread_threshold),
    triageFraction: Number(r.triage_fraction),
    standingLockedAt: r.standing_locked_at,
    standingLockedBy: r.locked_by_name,
    version: r.version,
  };
}

/** The panel with its cycle's review settings; `forUpdate` locks the panel row for the transaction. */
export async function findPanel(db: Knex, panelId: number, options: { forUpdate?: boolean } = {}): Promise<StoredPanel | undefined> {
  const q = db('panels as pa')
    .join('cycles as c', 'c.id', 'pa.cycle_id')
    .leftJoin('accounts as lb', 'lb.id', 'pa.standing_locked_by')
    .where('pa.id', panelId)
    .first(
      'pa.id',
      'pa.name',
      'pa.cycle_id',
      'c.code as cycle_code',
      'c.anonymous_review',
      'c.review_deadline',
      'pa.chair_account_id',
      'pa.spread_threshold',
      'pa.triage_fraction',
      'pa.standing_locked_at',
      'lb.display_name as locked_by_name',
      'pa.version',
    );
  if (options.forUpdate) q.forUpdate('pa');
  const row = (await q) as PanelRow | undefined;
  return row ? toPanel(row) : undefined;
}

/** A proposal of a panel with its PI (shown only to viewers allowed to see the team). */
export interface PanelProposal {
  id: number;
  title: string;
  state: ProposalState;
  notDiscussed: boolean;
  piName: string;
  piAffiliation: string;
}

/** The panel's proposals (every state but draft), by id. */
export async function listPanelProposals(db: Knex, panelId: number): Promise<PanelProposal[]> {
  const rows = await db('proposals as p')
    .join('accounts as a', 'a.id', 'p.pi_account_id')
    .where('p.panel_id', panelId)
    .whereNot('p.state', 'draft')
    .orderBy('p.id')
    .select('p.id', 'p.title', 'p.state', 'p.not_discussed', 'a.display_name', 'a.affiliation');
  return rows.map(
    (r: { id: number; title: string; state: ProposalState; not_discussed: boolean; display_name: string; affiliation: string }) => ({
      id: r.id,
      title: r.title,
      state: r.state,
      notDiscussed: r.not_discussed,
      piName: r.display_name,
      piAffiliation: r.affiliation ?? '',
    }),
  );
}

/**
 * Of the given proposals, those the account must not see as chair: a declared conflict, or a
 * place on the team (active, or invited under the account's id or e-mail).
 */
export async function proposalsHiddenFrom(db: Knex, proposalIds: number[], account: { id: number; email: string }): Promise<Set<number>> {
  if (proposalIds.length === 0) return new Set();
  const conflicts = await db('review_conflicts')
    .whereIn('proposal_id', proposalIds)
    .where('reviewer_account_id', account.id)
    .pluck('proposal_id');
  const team = await db('proposal_members')
    .whereIn('proposal_id', proposalIds)
    .where((w) => w.where('account_id', account.id).orWhereRaw('lower(email) = lower(?)', [account.email]))
    .pluck('proposal_id');
  return new Set<number>([...conflicts, ...team]);
}

/** Every grade given on the panel's proposals, with the reviewers assigned to them (graded or not). */
export async function listPanelGrades(
  db: Knex,
  panelId: number,
): Promise<{ grades: GradeEntry[]; reviewers: { id: number; displayName: string }[] }> {
  const rows = (await db('review_assignments as ra')
    .join('proposals as p', 'p.id', 'ra.proposal_id')
    .join('accounts as a', 'a.id', 'ra.reviewer_account_id')
    .where('p.panel_id', panelId)
    .whereNot('p.state', 'draft')
    .orderBy('a.display_name')
    .orderBy('a.id')
    .select('ra.proposal_id', 'ra.reviewer_account_id', 'ra.grade', 'a.display_name')) as {
    proposal_id: number;
    reviewer_account_id: number;
    grade: string | number | null;
    display_name: string;
  }[];
  const reviewers = new Map<number, string>();
  const grades: GradeEntry[] = [];
  for (const r of rows) {
    reviewers.set(r.reviewer_account_id, r.display_name);
    if (r.grade !== null) grades.push({ proposalId: r.proposal_id, reviewerId: r.reviewer_account_id, grade: Number(r.grade) });
  }
  return { grades, reviewers: [...reviewers].map(([id, displayName]) => ({ id, displayName })) };
}

/** Marks the panel's proposals in `ids` not discussed and the others discussed; stores the fraction. */
export async function storeTriage(db: Knex, panelId: number, fraction: number, ids: number[]): Promise<void> {
  await db('proposals')
    .where('panel_id', panelId)
    .update({ not_discussed: db.raw('id = ANY(?::int[])', [ids]) });
  await db('panels')
    .where('id', panelId)
    .update({ triage_fraction: fraction, version: db.raw('version + 1'), updated_at: db.fn.now() });
}

export async function storeSpreadThreshold(db: Knex, panelId: number, spreadThreshold: number): Promise<void> {
  await db('panels')
    .where('id', panelId)
    .update({ spread_threshold: spreadThreshold, version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** The panel's standing as proposal ids, position 1 first. */
export async function listStandingPositions(db: Knex, panelId: number): Promise<{ proposalId: number; position: number }[]> {
  const rows = await db('standing_positions').where('panel_id', panelId).orderBy('position').select('proposal_id', 'position');
  return rows.map((r: { proposal_id: number; position: number }) => ({ proposalId: r.proposal_id, position: r.position }));
}

/**
 * Writes the panel's standing as `order` (position 1 first): rows of proposals not in the order
 * are deleted, rows of other panels for these proposals are taken over. The unique
 * (panel_id, position) constraint is checked at commit, so positions may swap freely here.
 */
export async function writeStanding(db: Knex, panelId: number, order: number[]): Promise<void> {
  await db('standing_positions').where('panel_id', panelId).whereNotIn('proposal_id', order).del();
  if (order.length === 0) return;
  await db('standing_positions')
    .insert(order.map((proposalId, i) => ({ proposal_id: proposalId, panel_id: panelId, position: i + 1 })))
    .onConflict('proposal_id')
    .merge(['panel_id', 'position']);
}

export async function insertStandingMove(
  db: Knex,
  move: { panelId: number; proposalId: number; fromPosition: number; toPosition: number; reason: string; movedBy: number; movedAt: Date },
): Promise<void> {
  await db('standing_moves').insert({
    panel_id: move.panelId,
    proposal_id: move.proposalId,
    from_position: move.fromPosition,
    to_position: move.toPosition,
    reason: move.reason,
    moved_by: move.movedBy,
    moved_at: move.movedAt,
  });
  await db('panels')
    .where('id', move.panelId)
    .update({ version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** The panel's moves, newest first. */
export async function listStandingMoves(db: Knex, panelId: number) {
  const rows = await db('standing_moves as m')
    .join('proposals as p', 'p.id', 'm.proposal_id')
    .leftJoin('accounts as a', 'a.id', 'm.moved_by')
    .where('m.panel_id', panelId)
    .orderBy('m.moved_at', 'desc')
    .orderBy('m.id', 'desc')
    .select('m.id', 'm.proposal_id', 'p.title', 'm.from_position', 'm.to_position', 'm.reason', 'a.display_name', 'm.moved_at');
  return rows.map(
    (r: {
      id: number;
      proposal_id: number;
      title: string;
      from_position: number;
      to_position: number;
      reason: string;
      display_name: string | null;
      moved_at: Date;
    }) => ({
      id: r.id,
      proposalId: r.proposal_id,
      proposalTitle: r.title,
      fromPosition: r.from_position,
      toPosition: r.to_position,
      reason: r.reason,
      movedBy: r.display_name,
      movedAt: r.moved_at.toISOString(),
    }),
  );
}

/** Locks the standing and ranks the panel's proposals in review; returns how many were ranked. */
export async function lockStandingRows(db: Knex, panelId: number, accountId: number, at: Date): Promise<number> {
  await db('panels')
    .where('id', panelId)
    .update({ standing_locked_at: at, standing_locked_by: accountId, version: db.raw('version + 1'), updated_at: db.fn.now() });
  return db('proposals')
    .where({ panel_id: panelId, state: 'in_review' })
    .update({ state: 'ranked', version: db.raw('version + 1'), updated_at: db.fn.now() });
}

/** The cycle as the pressure report needs it. */
export async function findCycleForPressure(db: Knex, cycleId: number) {
  const row = await db('cycles').where('id', cycleId).first('id', 'code', 'campaign_start', 'campaign_end', 'review_deadline');
  return row as { id: number; code: string; campaign_start: string; campaign_end: string; review_deadline: Date | null } | undefined;
}

/** Whether the account chairs a panel of the cycle. */
export async function chairsPanelOfCycle(db: Knex, cycleId: number, accountId: number): Promise<boolean> {
  return !!(await db('panels').where({ cycle_id: cycleId, chair_account_id: accountId }).first('id'));
}

/**
 * Stored feasible plans of the cycle's proposals in review or ranked, on the nodes each proposal
 * requests, with their target's RA; and how many proposals that is.
 */
export async function listPressureRequests(db: Knex, cycleId: number): Promise<{ requests: PressureRequest[]; proposalCount: number }> {
  const states = ['in_review', 'ranked'];
  const rows = (await db('target_plans as tp')
    .join('targets as t', 't.id', 'tp.target_id')
    .join('proposals as p', 'p.id', 'tp.proposal_id')
    .join('proposal_nodes as pn', function () {
      this.on('pn.proposal_id', 'tp.proposal_id').andOn('pn.node_id', 'tp.node_id');
    })
    .where('p.cycle_id', cycleId)
    .whereIn('p.state', states)
    .where('tp.feasible', true)
    .whereNotNull('tp.node_hours')
    .select('tp.node_id', 't.ra_deg', 'tp.node_hours')) as { node_id: number; ra_deg: number; node_hours: string | number }[];
  const [{ n }] = await db('proposals').where('cycle_id', cycleId).whereIn('state', states).count<{ n: string | number }[]>({ n: '*' });
  return {
    requests: rows.map((r) => ({ nodeId: r.node_id, raDeg: Number(r.ra_deg), nodeHours: Number(r.node_hours) })),
    proposalCount: Number(n),
  };
}
