import type { Knex } from 'knex';
import { insertAudit, type AuditEntity, type AuditInsert } from '../awards/award-repository';
import type { NightPlanBuildKind, NightPlanBuildState, NightPlanBuildStatus, VisitStatus } from '@spincycle/shared/night-plans/night-plans';
import type { ProgramState } from '@spincycle/shared/awards/awards';

/**
 * Program states whose awarded targets are scheduled. A complete program is not (see
 * program-completion.ts): builds leave it out, and its figures stay as they were.
 */
export const SCHEDULED_PROGRAM_STATES: ProgramState[] = ['scheduled', 'observing'];

/** A released cycle as the night plans need it. */
export interface NightPlanCycle {
  id: number;
  code: string;
  title: string;
  campaignStart: string;
  campaignEnd: string;
  releasedAt: Date | null;
}

const isoDate = (d: Date | string): string => (typeof d === 'string' ? d.slice(0, 10) : d.toISOString().slice(0, 10));

export async function findNightPlanCycle(db: Knex, cycleId: number, options: { lock?: boolean } = {}): Promise<NightPlanCycle | undefined> {
  const q = db('cycles').where('id', cycleId).first('id', 'code', 'title', 'campaign_start', 'campaign_end', 'awards_released_at');
  const row = await (options.lock ? q.forUpdate() : q);
  if (!row) return undefined;
  return {
    id: row.id,
    code: row.code,
    title: row.title,
    campaignStart: row.campaign_start,
    campaignEnd: row.campaign_end,
    releasedAt: row.awards_released_at,
  };
}

/** Released cycles with their program counts and last build, newest release first. */
export async function listReleasedCycles(db: Knex) {
  return db('cycles as c')
    .whereNotNull('c.awards_released_at')
    .select(
      'c.id',
      'c.code',
      'c.title',
      'c.awards_released_at',
      db.raw('(SELECT count(*)::int FROM programs p WHERE p.cycle_id = c.id) AS programs'),
      db.raw('(SELECT max(b.requested_at) FROM night_plan_builds b WHERE b.cycle_id = c.id) AS last_build_at'),
    )
    .orderBy([
      { column: 'c.awards_released_at', order: 'desc' },
      { column: 'c.id', order: 'desc' },
    ]);
}

/** The cycle's nodes (those it offers), by code. */
export async function listCycleNodeIds(db: Knex, cycleId: number): Promise<number[]> {
  return (await db('cycle_nodes as cn').join('nodes as n', 'n.id', 'cn.node_id').where('cn.cycle_id', cycleId).orderBy('n.code')).map(
    (r: { node_id: number }) => r.node_id,
  );
}

/** One program of the cycle with its standing and awarded hours on a node (or every node). */
export interface ProgramRow {
  proposalId: number;
  title: string;
  piAccountId: number;
  piName: string;
  state: ProgramState;
  completeness: number;
  panelId: number | null;
  position: number | null;
  /** Proposals in the program's panel standing. */
  panelSize: number;
  targetIds: number[] | null;
  nodes: { nodeId: number; nodeHours: number }[];
}

/** The cycle's programs (awarded proposals made programs at the release), every state. */
export async function listPrograms(db: Knex, cycleId: number): Promise<ProgramRow[]> {
  const rows = await db('programs as g')
    .join('proposals as p', 'p.id', 'g.proposal_id')
    .join('awards as a', 'a.proposal_id', 'g.proposal_id')
    .leftJoin('accounts as pi', 'pi.id', 'p.pi_account_id')
    .leftJoin('standing_positions as sp', 'sp.proposal_id', 'p.id')
    .where('g.cycle_id', cycleId)
    .where('a.outcome', 'awarded')
    .select(
      'g.proposal_id',
      'p.title',
      'p.pi_account_id',
      'pi.display_name as pi_name',
      'g.state',
      'p.completeness',
      'sp.panel_id',
      'sp.position',
      'a.target_ids',
      db.raw('(SELECT count(*)::int FROM standing_positions s2 WHERE s2.panel_id = sp.panel_id) AS panel_size'),
      db.raw(
        `COALESCE((SELECT json_agg(json_build_object('nodeId', an.node_id, 'nodeHours', an.node_hours::float8) ORDER BY an.node_id)
                   FROM award_nodes an WHERE an.proposal_id = g.proposal_id), '[]') AS nodes`,
      ),
    )
    .orderBy('g.proposal_id');
  return rows.map((r) => ({
    proposalId: r.proposal_id,
    title: r.title,
    piAccountId: r.pi_account_id,
    piName: r.pi_name ?? '',
    state: r.state,
    completeness: Number(r.completeness),
    panelId: r.panel_id,
    position: r.position,
    panelSize: r.panel_size,
    targetIds: r.target_ids,
    nodes: r.nodes,
  }));
}

interface BuildDbRow {
  id: number;
  cycle_id: number;
  kind: NightPlanBuildKind;
  state: NightPlanBuildState;
  total: number;
  done: number;
  node_jobs: number;
  node_jobs_finished: number;
  from_night: string | null;
  node_id: number | null;
  requested_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
  error: string | null;
}

export interface StoredBuild extends NightPlanBuildStatus {
  nodeId: number | null;
  nodeJobs: number;
}

function toBuild(r: BuildDbRow): StoredBuild {
  return {
    id: r.id,
    cycleId: r.cycle_id,
    kind: r.kind,
    state: r.state,
    total: r.total,
    done: r.done,
    fromNight: r.from_night,
    requestedAt: r.requested_at.toISOString(),
    startedAt: r.started_at?.toISOString() ?? null,
    finishedAt: r.finished_at?.toISOString() ?? null,
    error: r.error,
    nodeId: r.node_id,
    nodeJobs: r.node_jobs,
  };
}

export function toBuildStatus({ nodeId: _n, nodeJobs: _j, ...status }: StoredBuild): NightPlanBuildStatus {
  return status;
}

export async function findBuild(db: Knex, buildId: number): Promise<StoredBuild | undefined> {
  const row = await db('night_plan_builds').where('id', buildId).first();
  return row ? toBuild(row) : undefined;
}

export async function findLatestBuild(db: Knex, cycleId: number): Promise<StoredBuild | undefined> {
  const row = await db('night_plan_builds').where('cycle_id', cycleId).orderBy('id', 'desc').first();
  return row ? toBuild(row) : undefined;
}

export async function findUnfinishedBuild(db: Knex, cycleId: number): Promise<StoredBuild | undefined> {
  const row = await db('night_plan_builds').where('cycle_id', cycleId).whereIn('state', ['queued', 'running']).orderBy('id').first();
  return row ? toBuild(row) : undefined;
}

export async function insertBuild(
  db: Knex,
  b: {
    cycleId: number;
    kind: NightPlanBuildKind;
    fromNight: string | null;
    nodeId: number | null;
    nodeJobs: number;
    total: number;
    requestedBy: number;
    at: Date;
  },
): Promise<StoredBuild> {
  const [row] = await db('night_plan_builds')
    .insert({
      cycle_id: b.cycleId,
      kind: b.kind,
      from_night: b.fromNight,
      node_id: b.nodeId,
      node_jobs: b.nodeJobs,
      total: b.total,
      requested_by: b.requestedBy,
      requested_at: b.at,
    })
    .returning('*');
  return toBuild(row);
}

/** The build runs (the first node job to start sets it). Returns false when the build is gone or failed. */
export async function markBuildRunning(db: Knex, buildId: number): Promise<boolean> {
  const n = await db('night_plan_builds')
    .where('id', buildId)
    .whereIn('state', ['queued', 'running'])
    .update({ state: 'running', started_at: db.raw('COALESCE(started_at, now())') });
  return n > 0;
}

/** Adds work units done (capped at the total). */
export async function addBuildProgress(db: Knex, buildId: number, units: number): Promise<void> {
  if (units <= 0) return;
  await db('night_plan_builds')
    .where('id', buildId)
    .update({ done: db.raw('LEAST(total, done + ?)', [units]) });
}

/**
 * One node job finished: counts it in SQL (safe with several workers at once); the job that
 * brings the count to the number of node jobs sets the build done. Returns the build's state.
 */
export async function finishNodeJob(db: Knex, buildId: number): Promise<NightPlanBuildState | undefined> {
  const rows = await db('night_plan_builds')
    .where('id', buildId)
    .update({
      node_jobs_finished: db.raw('LEAST(node_jobs, node_jobs_finished + 1)'),
      state: db.raw("CASE WHEN state = 'failed' THEN state WHEN node_jobs_finished + 1 >= node_jobs THEN 'done' ELSE 'running' END"),
      done: db.raw("CASE WHEN state <> 'failed' AND node_jobs_finished + 1 >= node_jobs THEN total ELSE done END"),
      finished_at: db.raw("CASE WHEN state <> 'failed' AND node_jobs_finished + 1 >= node_jobs THEN now() ELSE finished_at END"),
    })
    .returning('state');
  return rows[0]?.state;
}

export async function failBuild(db: Knex, buildId: number, message: string): Promise<void> {
  await db('night_plan_builds')
    .where('id', buildId)
    .whereNot('state', 'failed')
    .update({ state: 'failed', error: message.slice(0, 2000), finished_at: db.fn.now() });
}

/** A stored visit. */
export interface VisitRow {
  id: number;
  cycleId: number;
  nodeId: number;
  proposalId: number;
  targetId: number;
  nightDate: string;
  startMs: number;
  endMs: number;
  status: VisitStatus;
  altitudeDeg: number;
  airmass: number;
  version: number;
}

interface VisitDbRow {
  id: string | number;
  cycle_id: number;
  node_id: number;
  proposal_id: number;
  target_id: number;
  night_date: string;
  start_at: Date;
  end_at: Date;
  status: VisitStatus;
  altitude_deg: number;
  airmass: number;
  version: number;
}

export function toVisit(r: VisitDbRow): VisitRow {
  return {
    id: Number(r.id),
    cycleId: r.cycle_id,
    nodeId: r.node_id,
    proposalId: r.proposal_id,
    targetId: r.target_id,
    nightDate: isoDate(r.night_date),
    startMs: r.start_at.getTime(),
    endMs: r.end_at.getTime(),
    status: r.status,
    altitudeDeg: r.altitude_deg,
    airmass: r.airmass,
    version: r.version,
  };
}

export async function listNodeVisits(
  db: Knex,
  cycleId: number,
  nodeId: number,
  range: { from?: string; to?: string } = {},
): Promise<VisitRow[]> {
  const q = db('night_plan_visits').where({ cycle_id: cycleId, node_id: nodeId });
  if (range.from) q.where('night_date', '>=', range.from);
  if (range.to) q.where('night_date', '<=', range.to);
  return (await q.orderBy(['night_date', 'start_at', 'id'])).map(toVisit);
}

export interface VisitInsert {
  cycleId: number;
  nodeId: number;
  proposalId: number;
  targetId: number;
  nightDate: string;
  startMs: number;
  endMs: number;
  buildId: number;
  altitudeDeg: number;
  airmass: number;
}

/** The figures of one target on its node, as the build stores them. */
export interface TargetFiguresInsert {
  cycleId: number;
  proposalId: number;
  targetId: number;
  nodeId: number;
  visitsRequired: number;
  visitNightsRequired: number;
  stepNights: number;
  toleranceNights: number;
  visitsPlanned: number;
  visitNightsPlanned: number;
  medianGap: number | null;
  largestGap: number | null;
  atRisk: string[];
  buildId: number;
}

/**
 * In one transaction (the caller's): the node's planned visits from `fromNight` on (every
 * night for null) are replaced, done and missed visits and those before `fromNight` untouched;
 * the node's target figures are replaced, except those of complete programs (the build leaves
 * them out, and their figures are the record of what their plans needed and got). A program
 * that became complete while the build ran gets none of its new visits or figures.
 */
export async function replaceNodePlan(
  trx: Knex.Transaction,
  cycleId: number,
  nodeId: number,
  fromNight: string | null,
  visits: VisitInsert[],
  figures: TargetFiguresInsert[],
): Promise<void> {
  const complete = new Set<number>(await trx('programs').where({ cycle_id: cycleId, state: 'complete' }).pluck('proposal_id'));
  const newVisits = visits.filter((v) => !complete.has(v.proposalId));
  const newFigures = figures.filter((f) => !complete.has(f.proposalId));
  const del = trx('night_plan_visits').where({ cycle_id: cycleId, node_id: nodeId, status: 'planned' });
  if (fromNight) del.where('night_date', '>=', fromNight);
  await del.del();
  for (let i = 0; i < newVisits.length; i += 1000) {
    await trx('night_plan_visits').insert(
      newVisits.slice(i, i + 1000).map((v) => ({
        cycle_id: v.cycleId,
        node_id: v.nodeId,
        proposal_id: v.proposalId,
        target_id: v.targetId,
        night_date: v.nightDate,
        start_at: new Date(v.startMs),
        end_at: new Date(v.endMs),
        build_id: v.buildId,
        altitude_deg: v.altitudeDeg,
        airmass: v.airmass,
      })),
    );
  }
  await trx('night_plan_targets')
    .where({ cycle_id: cycleId, node_id: nodeId })
    .whereNotIn('proposal_id', [...complete])
    .del();
  for (let i = 0; i < newFigures.length; i += 1000) {
    await trx('night_plan_targets').insert(
      newFigures.slice(i, i + 1000).map((f) => ({
        cycle_id: f.cycleId,
        proposal_id: f.proposalId,
        target_id: f.targetId,
        node_id: f.nodeId,
        visits_required: f.visitsRequired,
        visit_nights_required: f.visitNightsRequired,
        step_nights: f.stepNights,
        tolerance_nights: f.toleranceNights,
        visits_planned: f.visitsPlanned,
        visit_nights_planned: f.visitNightsPlanned,
        median_gap: f.medianGap,
        largest_gap: f.largestGap,
        at_risk: JSON.stringify(f.atRisk),
        build_id: f.buildId,
      })),
    );
  }
}

export async function storeTargetYield(
  db: Knex,
  nodeId: number,
  targetId: number,
  y: { fraction: number | null; explanation: string; atRisk: string[] },
): Promise<void> {
  await db('night_plan_targets')
    .where({ node_id: nodeId, target_id: targetId })
    .update({ recovery_fraction: y.fraction, recovery_explanation: y.explanation, at_risk: JSON.stringify(y.atRisk) });
}

export async function listLostNights(db: Knex, cycleId: number, nodeId: number) {
  const rows = await db('lost_nights as l')
    .leftJoin('accounts as a', 'a.id', 'l.marked_by')
    .where({ 'l.cycle_id': cycleId, 'l.node_id': nodeId })
    .select('l.night_date', 'l.reason', 'l.marked_at', 'a.display_name')
    .orderBy('l.night_date');
  return rows.map((r) => ({
    date: isoDate(r.night_date),
    reason: r.reason as string,
    markedBy: (r.display_name as string | null) ?? null,
    markedAt: (r.marked_at as Date).toISOString(),
  }));
}

/** One audit entry of the night plans. */
export interface NightPlanAudit extends Omit<AuditInsert, 'entity' | 'before' | 'after' | 'reason'> {
  entity: Extract<AuditEntity, 'night_plan' | 'lost_night' | 'visit'>;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
}

/** Writes night-plan entries into the cycle's audit log (awards' insertAudit). */
export async function insertNightPlanAudit(db: Knex, entries: NightPlanAudit[]): Promise<void> {
  await insertAudit(
    db,
    entries.map((e) => ({ ...e, before: e.before ?? null, after: e.after ?? null, reason: e.reason ?? null })),
  );
}
