/**
 * Night plans (facility managers; a program's progress also for its team): the released
 * cycles, a cycle's overview, builds (queued as one worker job per node), a node's timeline and
 * single nights, lost nights (with a re-plan of that node from the night), the execution log
 * (one visit, or a CSV upload) and the plan as CSV and iCalendar.
 */
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { hasAnyRole } from '@spincycle/shared/accounts/roles';
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import {
  EXECUTION_MATCH_MINUTES,
  type ExecutionUploadResult,
  type LostNightInput,
  type NightPlan,
  type NightPlanBuildStatus,
  type NightPlanCycleSummary,
  type NightPlanNode,
  type NightPlanOverview,
  type NodeTimeline,
  type ProgramProgress,
  type TargetProgress,
  type TimelineNight,
  type TimelineVisit,
  type VisitStatus,
} from '@spincycle/shared/night-plans/night-plans';
import type { CsvRowError } from '@spincycle/shared/proposals/target-schemas';
import { computeSkyWindows, skyLimitsForNode, type NightDark } from '@spincycle/shared/sky/index';
import type { Knex } from 'knex';
import { LRUCache } from 'lru-cache';
import type { AppContext } from '../../app-context';
import { AppError, invalidField } from '../../http/app-error';
import { requireUploadedFile } from '../../http/upload-limits';
import { insertAudit } from '../awards/award-repository';
import { listNodes } from '../facility/facility-repository';
import { accessProposal } from '../proposals/proposal-access';
import { executionErrors, readExecutionCsv } from './execution-csv';
import { planCsv, planIcs, type ExportVisit } from './night-plan-exports';
import { completeIfCampaignEnded, completeProgramsWithVisitsDone, findCompletions } from './program-completion';
import {
  failBuild,
  findLatestBuild,
  findNightPlanCycle,
  findUnfinishedBuild,
  insertBuild,
  insertNightPlanAudit,
  listCycleNodeIds,
  listLostNights,
  listPrograms,
  listReleasedCycles,
  toBuildStatus,
  toVisit,
  type NightPlanCycle,
  type ProgramRow,
  type StoredBuild,
} from './night-plan-repository';

/** Most nights one timeline call returns. */
export const MAX_TIMELINE_NIGHTS = 62;
const MS_PER_DAY = 86_400_000;

const cycleNotFound = (id: number) => new AppError('cycle_not_found', `No cycle ${id}`, 404);
const nodeNotFound = (id: number) => new AppError('node_not_found', `No node ${id} in this cycle`, 404);
const programNotFound = (id: number) => new AppError('proposal_not_found', `No program for proposal ${id}`, 404);

const dayIndex = (date: string) => Date.parse(`${date}T00:00:00Z`) / MS_PER_DAY;
const addDays = (date: string, days: number) => new Date(Date.parse(`${date}T00:00:00Z`) + days * MS_PER_DAY).toISOString().slice(0, 10);
const nightsOf = (c: { campaignStart: string; campaignEnd: string }) => dayIndex(c.campaignEnd) - dayIndex(c.campaignStart) + 1;
const round2 = (x: number) => Math.round(x * 100) / 100;

async function requireCycle(db: Knex, cycleId: number, options: { lock?: boolean } = {}): Promise<NightPlanCycle> {
  const cycle = await findNightPlanCycle(db, cycleId, options);
  if (!cycle) throw cycleNotFound(cycleId);
  return cycle;
}

function requireReleased(cycle: NightPlanCycle): void {
  if (!cycle.releasedAt) {
    throw new AppError('not_released', 'Night plans are built once the cycle’s award decisions are released', 409);
  }
}

async function requireCycleNode(db: Knex, cycleId: number, nodeId: number): Promise<TelescopeNode> {
  const ids = await listCycleNodeIds(db, cycleId);
  if (!ids.includes(nodeId)) throw nodeNotFound(nodeId);
  const [node] = await listNodes(db, [nodeId]);
  if (!node) throw nodeNotFound(nodeId);
  return node;
}

/** A date of the campaign, else 400 naming `field`. */
function requireCampaignDate(cycle: NightPlanCycle, date: string, field: string): void {
  if (date < cycle.campaignStart || date > cycle.campaignEnd) {
    throw invalidField(field, `must be a night of the campaign, ${cycle.campaignStart} to ${cycle.campaignEnd}`);
  }
}

/**
 * Darkness and Moon of a node's nights from `from` to `to`. A pure function of the site, the
 * node's Sun limit and the dates, yet about 40 ms for a 180-night campaign: kept per process, so
 * that the overview and the timeline do not recompute it on every request.
 */
const nightsKept = new LRUCache<string, NightDark[]>({ max: 256 });
function nodeNights(node: TelescopeNode, from: string, to: string): NightDark[] {
  const limits = skyLimitsForNode(node);
  const { latitudeDeg, longitudeDeg, elevationM, timeZone } = node.site;
  const key = JSON.stringify([latitudeDeg, longitudeDeg, elevationM, timeZone, limits.sunAltitudeLimitDeg, from, to]);
  let nights = nightsKept.get(key);
  if (!nights) {
    nights = computeSkyWindows({ site: node.site, limits, campaign: { firstNight: from, lastNight: to }, targets: [] }).nights;
    nightsKept.set(key, nights);
  }
  return nights;
}

/** One `HH:mm` formatter per time zone (building an Intl formatter costs more than using it). */
const clocks = new Map<string, Intl.DateTimeFormat>();
function localTime(ms: number, timeZone: string): string {
  let clock = clocks.get(timeZone);
  if (!clock) {
    clock = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    clocks.set(timeZone, clock);
  }
  return clock.format(new Date(ms));
}

/** GET /cycles. */
export async function listNightPlanCycles(ctx: AppContext): Promise<NightPlanCycleSummary[]> {
  const rows = await listReleasedCycles(ctx.db);
  return rows.map((r) => ({
    id: r.id,
    code: r.code,
    title: r.title,
    programs: r.programs,
    releasedAt: (r.awards_released_at as Date).toISOString(),
    lastBuildAt: r.last_build_at ? (r.last_build_at as Date).toISOString() : null,
  }));
}

/** Visit counts and hours per node of a cycle. */
async function nodeVisitTotals(db: Knex, cycleId: number) {
  const rows = await db('night_plan_visits')
    .where('cycle_id', cycleId)
    .groupBy('node_id')
    .select(
      'node_id',
      db.raw("count(*) FILTER (WHERE status = 'planned')::int AS planned"),
      db.raw("count(*) FILTER (WHERE status = 'done')::int AS done"),
      db.raw("COALESCE(sum(extract(epoch FROM end_at - start_at)) FILTER (WHERE status <> 'missed'), 0)::float8 / 3600 AS hours"),
    );
  return new Map(
    rows.map((r) => [r.node_id as number, { planned: r.planned as number, done: r.done as number, hours: r.hours as number }]),
  );
}

async function nightPlanNode(
  db: Knex,
  cycle: NightPlanCycle,
  node: TelescopeNode,
  totals?: { planned: number; done: number; hours: number },
): Promise<NightPlanNode> {
  const t = totals ?? (await nodeVisitTotals(db, cycle.id)).get(node.id);
  const [{ n }] = await db('lost_nights').where({ cycle_id: cycle.id, node_id: node.id }).count<{ n: number }[]>({ n: '*' });
  const darkHours = nodeNights(node, cycle.campaignStart, cycle.campaignEnd).reduce((sum, night) => sum + night.darkHours, 0);
  return {
    nodeId: node.id,
    code: node.code,
    name: node.name,
    siteName: node.site.name,
    timeZone: node.site.timeZone,
    nights: nightsOf(cycle),
    lostNights: Number(n),
    visitsPlanned: t?.planned ?? 0,
    visitsDone: t?.done ?? 0,
    plannedHours: round2(t?.hours ?? 0),
    darkHours: round2(darkHours),
  };
}

/** Each program's progress from the stored figures (empty targets before a build). */
export async function programProgress(db: Knex, programs: ProgramRow[]): Promise<ProgramProgress[]> {
  if (!programs.length) return [];
  const ids = programs.map((p) => p.proposalId);
  const completions = await findCompletions(
    db,
    programs.filter((p) => p.state === 'complete').map((p) => p.proposalId),
  );
  const figures = await db('night_plan_targets as f')
    .join('targets as t', 't.id', 'f.target_id')
    .join('nodes as n', 'n.id', 'f.node_id')
    .whereIn('f.proposal_id', ids)
    .select(
      'f.*',
      't.name as target_name',
      't.position as target_position',
      'n.code as node_code',
      db.raw(
        "(SELECT count(*)::int FROM night_plan_visits v WHERE v.target_id = f.target_id AND v.node_id = f.node_id AND v.status = 'done') AS visits_done",
      ),
    )
    .orderBy(['f.proposal_id', 't.position', 'n.code']);
  const byProposal = new Map<number, TargetProgress[]>();
  for (const f of figures) {
    const list = byProposal.get(f.proposal_id) ?? [];
    list.push({
      targetId: f.target_id,
      targetName: f.target_name,
      nodeId: f.node_id,
      nodeCode: f.node_code,
      visitsRequired: f.visits_required,
      visitsPlanned: f.visits_planned,
      visitsDone: f.visits_done,
      visitNightsRequired: f.visit_nights_required,
      visitNightsPlanned: f.visit_nights_planned,
      stepNights: f.step_nights,
      toleranceNights: f.tolerance_nights,
      medianGapNights: f.median_gap,
      largestGapNights: f.largest_gap,
      recoveryFraction: f.recovery_fraction,
      recoveryExplanation: f.recovery_explanation,
      atRisk: f.at_risk,
    });
    byProposal.set(f.proposal_id, list);
  }
  return programs.map((p) => {
    const targets = byProposal.get(p.proposalId) ?? [];
    const fractions = targets.map((t) => t.recoveryFraction).filter((f): f is number => f !== null);
    return {
      proposalId: p.proposalId,
      title: p.title,
      piName: p.piName,
      programState: p.state,
      position: p.position,
      visitsRequired: targets.reduce((s, t) => s + t.visitsRequired, 0),
      visitsPlanned: targets.reduce((s, t) => s + t.visitsPlanned, 0),
      visitsDone: targets.reduce((s, t) => s + t.visitsDone, 0),
      recoveryFraction: fractions.length ? fractions.reduce((s, f) => s + f, 0) / fractions.length : null,
      completion: p.state === 'complete' ? (completions.get(p.proposalId) ?? null) : null,
      targets,
    };
  });
}

/**
 * GET /cycles/:cycleId. Once the cycle's campaign is over its programs still scheduled or
 * observing are made complete first (program-completion.ts: idempotent, and nothing at all
 * while the campaign runs), so that the overview is right even without a running worker.
 */
export async function getNightPlanOverview(ctx: AppContext, cycleId: number): Promise<NightPlanOverview> {
  const cycle = await requireCycle(ctx.db, cycleId);
  await completeIfCampaignEnded(ctx.db, cycle, ctx.now());
  const [build, nodeIds, programs, totals] = await Promise.all([
    findLatestBuild(ctx.db, cycleId),
    listCycleNodeIds(ctx.db, cycleId),
    listPrograms(ctx.db, cycleId),
    nodeVisitTotals(ctx.db, cycleId),
  ]);
  const nodes = nodeIds.length ? await listNodes(ctx.db, nodeIds) : [];
  const byId = new Map(nodes.map((n) => [n.id, n]));
  return {
    cycle: {
      id: cycle.id,
      code: cycle.code,
      title: cycle.title,
      campaignStart: cycle.campaignStart,
      campaignEnd: cycle.campaignEnd,
      releasedAt: cycle.releasedAt?.toISOString() ?? null,
    },
    build: build ? toBuildStatus(build) : null,
    nodes: await Promise.all(
      nodeIds.map((id) => nightPlanNode(ctx.db, cycle, byId.get(id)!, totals.get(id) ?? { planned: 0, done: 0, hours: 0 })),
    ),
    programs: await programProgress(ctx.db, programs),
  };
}

/** Work units of a build: its nodes' nights from `fromNight`, then their awarded targets (the progress bar's total). */
export async function unitsOf(db: Knex, cycle: NightPlanCycle, nodeIds: number[], fromNight: string | null): Promise<number> {
  const programs = (await listPrograms(db, cycle.id)).filter((p) => p.state === 'scheduled' || p.state === 'observing');
  const nights = nightsOf(cycle) - (fromNight ? dayIndex(fromNight) - dayIndex(cycle.campaignStart) : 0);
  let targets = 0;
  for (const p of programs) {
    const onNodes = p.nodes.filter((n) => nodeIds.includes(n.nodeId)).length;
    if (!onNodes) continue;
    const count = p.targetIds
      ? p.targetIds.length
      : Number((await db('targets').where('proposal_id', p.proposalId).count<{ n: number }[]>({ n: '*' }))[0].n);
    targets += count * onNodes;
  }
  return nodeIds.length * nights + targets;
}

/** A build unfinished this long after it was asked for is taken as lost (a worker stopped mid-job). */
export const STALE_BUILD_MS = 60 * 60_000;

/** 409 `build_running` while a build of the cycle is unfinished (one older than an hour is failed instead). */
async function requireNoRunningBuild(db: Knex, cycleId: number, now: Date, message: string): Promise<void> {
  const running = await findUnfinishedBuild(db, cycleId);
  if (!running) return;
  if (now.getTime() - Date.parse(running.requestedAt) > STALE_BUILD_MS) {
    await failBuild(db, running.id, 'The build did not finish within an hour; a worker may have stopped. Ask for a new build.');
    return;
  }
  throw new AppError('build_running', message, 409);
}

/** Queues the node jobs of a stored build; a queue that cannot be reached fails the build (503). */
async function enqueueBuild(ctx: AppContext, build: StoredBuild, nodeIds: number[]): Promise<NightPlanBuildStatus> {
  try {
    if (!ctx.nightPlanQueue) throw new Error('no night-plan queue in this context');
    await ctx.nightPlanQueue.enqueue(nodeIds.map((nodeId) => ({ buildId: build.id, nodeId })));
  } catch (err) {
    ctx.logger.error({ err, buildId: build.id }, 'queueing the night-plan build failed');
    await failBuild(ctx.db, build.id, 'The build could not be queued; try again in a moment.');
    throw new AppError('queue_unavailable', 'The build could not be queued; try again in a moment', 503);
  }
  return toBuildStatus(build);
}

/** POST /cycles/:cycleId/builds: a full build, one job per node of the cycle. */
export async function requestBuild(ctx: AppContext, viewer: SessionUser, cycleId: number): Promise<NightPlanBuildStatus> {
  const { build, nodeIds } = await ctx.db.transaction(async (trx) => {
    const cycle = await requireCycle(trx, cycleId, { lock: true });
    requireReleased(cycle);
    await requireNoRunningBuild(trx, cycleId, ctx.now(), 'A build of this cycle’s night plans is already running; wait for it to finish');
    const ids = await listCycleNodeIds(trx, cycleId);
    const at = ctx.now();
    const stored = await insertBuild(trx, {
      cycleId,
      kind: 'build',
      fromNight: null,
      nodeId: null,
      nodeJobs: ids.length,
      total: await unitsOf(trx, cycle, ids, null),
      requestedBy: viewer.id,
      at,
    });
    await insertNightPlanAudit(trx, [
      { actorAccountId: viewer.id, cycleId, entity: 'night_plan', entityId: stored.id, action: 'build', after: { nodes: ids.length }, at },
    ]);
    return { build: stored, nodeIds: ids };
  });
  if (!nodeIds.length) {
    // No node: nothing to do, the build is done at once.
    await ctx.db('night_plan_builds').where('id', build.id).update({ state: 'done', started_at: ctx.now(), finished_at: ctx.now() });
    return toBuildStatus((await findLatestBuild(ctx.db, cycleId))!);
  }
  return enqueueBuild(ctx, build, nodeIds);
}

/** GET /cycles/:cycleId/builds/latest. */
export async function getLatestBuild(ctx: AppContext, cycleId: number): Promise<NightPlanBuildStatus> {
  await requireCycle(ctx.db, cycleId);
  const build = await findLatestBuild(ctx.db, cycleId);
  if (!build) throw new AppError('build_not_found', 'The night plans of this cycle have not been built yet', 404);
  return toBuildStatus(build);
}

/** Visits of a node with target names and program titles. */
async function visitsWithNames(db: Knex, cycleId: number, nodeId: number, range: { from: string; to: string } | null) {
  const q = db('night_plan_visits as v')
    .join('targets as t', 't.id', 'v.target_id')
    .join('proposals as p', 'p.id', 'v.proposal_id')
    .where({ 'v.cycle_id': cycleId, 'v.node_id': nodeId })
    .select('v.*', 't.name as target_name', 't.ra_deg', 't.dec_deg', 'p.title as program_title')
    .orderBy(['v.night_date', 'v.start_at', 'v.id']);
  if (range) q.whereBetween('v.night_date', [range.from, range.to]);
  return (await q).map((r) => ({ ...toVisit(r), targetName: r.target_name as string, programTitle: r.program_title as string }));
}

type NamedVisit = Awaited<ReturnType<typeof visitsWithNames>>[number];

const timelineVisit = (v: NamedVisit): TimelineVisit => ({
  id: v.id,
  targetId: v.targetId,
  targetName: v.targetName,
  proposalId: v.proposalId,
  programTitle: v.programTitle,
  start: new Date(v.startMs).toISOString(),
  end: new Date(v.endMs).toISOString(),
  status: v.status,
});

/** GET /cycles/:cycleId/nodes/:nodeId/timeline?from&to. */
export async function getNodeTimeline(
  ctx: AppContext,
  cycleId: number,
  nodeId: number,
  range: { from: string; to: string },
): Promise<NodeTimeline> {
  const cycle = await requireCycle(ctx.db, cycleId);
  const node = await requireCycleNode(ctx.db, cycleId, nodeId);
  requireCampaignDate(cycle, range.from, 'from');
  requireCampaignDate(cycle, range.to, 'to');
  if (range.to < range.from) throw invalidField('to', 'must be on or after from');
  if (dayIndex(range.to) - dayIndex(range.from) + 1 > MAX_TIMELINE_NIGHTS) {
    throw invalidField(
      'to',
      `must be at most ${MAX_TIMELINE_NIGHTS} nights after from (${addDays(range.from, MAX_TIMELINE_NIGHTS - 1)} at the latest)`,
    );
  }
  const [visits, lost] = await Promise.all([visitsWithNames(ctx.db, cycleId, nodeId, range), listLostNights(ctx.db, cycleId, nodeId)]);
  const lostBy = new Map(lost.map((l) => [l.date, l]));
  const nights: TimelineNight[] = nodeNights(node, range.from, range.to).map((n) => {
    const l = lostBy.get(n.nightDate);
    return {
      date: n.nightDate,
      darkStart: n.darkStartUtcMs === null ? null : new Date(n.darkStartUtcMs).toISOString(),
      darkEnd: n.darkEndUtcMs === null ? null : new Date(n.darkEndUtcMs).toISOString(),
      moonIllumination: n.moonIlluminationAtMidDark,
      lost: l ? { reason: l.reason, markedBy: l.markedBy, markedAt: l.markedAt } : null,
      visits: visits.filter((v) => v.nightDate === n.nightDate).map(timelineVisit),
    };
  });
  return { node: await nightPlanNode(ctx.db, cycle, node), nights };
}

/** GET /cycles/:cycleId/nodes/:nodeId/nights/:date. */
export async function getNightPlan(ctx: AppContext, cycleId: number, nodeId: number, date: string): Promise<NightPlan> {
  const cycle = await requireCycle(ctx.db, cycleId);
  const node = await requireCycleNode(ctx.db, cycleId, nodeId);
  requireCampaignDate(cycle, date, 'date');
  const [night] = nodeNights(node, date, date);
  const [visits, lost] = await Promise.all([
    visitsWithNames(ctx.db, cycleId, nodeId, { from: date, to: date }),
    listLostNights(ctx.db, cycleId, nodeId),
  ]);
  const l = lost.find((x) => x.date === date);
  const tz = node.site.timeZone;
  return {
    node: { nodeId: node.id, code: node.code, name: node.name, siteName: node.site.name, timeZone: tz },
    date,
    darkStart: night.darkStartUtcMs === null ? null : new Date(night.darkStartUtcMs).toISOString(),
    darkEnd: night.darkEndUtcMs === null ? null : new Date(night.darkEndUtcMs).toISOString(),
    darkStartLocal: night.darkStartUtcMs === null ? null : localTime(night.darkStartUtcMs, tz),
    darkEndLocal: night.darkEndUtcMs === null ? null : localTime(night.darkEndUtcMs, tz),
    moonIllumination: night.moonIlluminationAtMidDark,
    lost: l ? { reason: l.reason, markedBy: l.markedBy, markedAt: l.markedAt } : null,
    visits: visits.map((v, i) => ({
      ...timelineVisit(v),
      order: i + 1,
      startLocal: localTime(v.startMs, tz),
      endLocal: localTime(v.endMs, tz),
      altitudeDeg: Math.round(v.altitudeDeg * 10) / 10,
      airmass: Math.round(v.airmass * 1000) / 1000,
    })),
    plannedHours: round2(visits.filter((v) => v.status !== 'missed').reduce((s, v) => s + (v.endMs - v.startMs), 0) / 3_600_000),
    darkHours: round2(night.darkHours),
  };
}

/**
 * POST /cycles/:cycleId/nodes/:nodeId/lost-nights: in one transaction the lost night, its
 * planned visits marked missed and an audit row; then a re-plan of this node from that night.
 */
export async function markLostNight(
  ctx: AppContext,
  viewer: SessionUser,
  cycleId: number,
  nodeId: number,
  input: LostNightInput,
): Promise<NightPlanBuildStatus> {
  const build = await ctx.db.transaction(async (trx) => {
    const cycle = await requireCycle(trx, cycleId, { lock: true });
    await requireCycleNode(trx, cycleId, nodeId);
    requireCampaignDate(cycle, input.date, 'date');
    requireReleased(cycle);
    await requireNoRunningBuild(
      trx,
      cycleId,
      ctx.now(),
      'A build of this cycle’s night plans is running; mark the night lost when it has finished',
    );
    const at = ctx.now();
    const inserted = await trx('lost_nights')
      .insert({ cycle_id: cycleId, node_id: nodeId, night_date: input.date, reason: input.reason, marked_by: viewer.id, marked_at: at })
      .onConflict(['cycle_id', 'node_id', 'night_date'])
      .ignore()
      .returning('night_date');
    if (!inserted.length) {
      throw new AppError('night_already_lost', `The night of ${input.date} is already marked lost on this node`, 409, {
        date: ['already marked lost'],
      });
    }
    const missed = await trx('night_plan_visits')
      .where({ cycle_id: cycleId, node_id: nodeId, night_date: input.date, status: 'planned' })
      .update({ status: 'missed', status_changed_by: viewer.id, status_changed_at: at, version: trx.raw('version + 1') })
      .returning('id');
    const stored = await insertBuild(trx, {
      cycleId,
      kind: 'replan',
      fromNight: input.date,
      nodeId,
      nodeJobs: 1,
      total: await unitsOf(trx, cycle, [nodeId], input.date),
      requestedBy: viewer.id,
      at,
    });
    await insertNightPlanAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId,
        entity: 'lost_night',
        entityId: nodeId,
        action: 'mark_lost',
        after: { date: input.date, visitsMissed: missed.length, buildId: stored.id },
        reason: input.reason,
        at,
      },
    ]);
    return stored;
  });
  return enqueueBuild(ctx, build, [nodeId]);
}

/** DELETE …/lost-nights/:date: the night is no longer lost (its missed visits stay missed; build again to use it). */
export async function unmarkLostNight(ctx: AppContext, viewer: SessionUser, cycleId: number, nodeId: number, date: string): Promise<void> {
  await ctx.db.transaction(async (trx) => {
    await requireCycle(trx, cycleId, { lock: true });
    await requireCycleNode(trx, cycleId, nodeId);
    const row = await trx('lost_nights').where({ cycle_id: cycleId, node_id: nodeId, night_date: date }).first();
    if (!row) throw new AppError('lost_night_not_found', `The night of ${date} is not marked lost on this node`, 404);
    await trx('lost_nights').where({ cycle_id: cycleId, node_id: nodeId, night_date: date }).del();
    await insertNightPlanAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId,
        entity: 'lost_night',
        entityId: nodeId,
        action: 'unmark_lost',
        before: { date, reason: row.reason },
        at: ctx.now(),
      },
    ]);
  });
}

/**
 * A program whose first visit is done starts observing (scheduled → observing), in the
 * transaction that marks the visit, with its audit row. Returns the programs moved.
 */
async function startObserving(trx: Knex, cycleId: number, doneVisitIds: number[], actorId: number, at: Date): Promise<number[]> {
  if (!doneVisitIds.length) return [];
  const moved = (await trx('programs')
    .where('cycle_id', cycleId)
    .where('state', 'scheduled')
    .whereIn('proposal_id', trx('night_plan_visits').whereIn('id', doneVisitIds).select('proposal_id'))
    .update({ state: 'observing', version: trx.raw('version + 1'), updated_at: at })
    .returning('proposal_id')) as { proposal_id: number }[];
  const ids = moved.map((m) => m.proposal_id);
  await insertAudit(
    trx,
    ids.map((id) => ({
      actorAccountId: actorId,
      cycleId,
      entity: 'program' as const,
      entityId: id,
      action: 'observing',
      before: { state: 'scheduled' },
      after: { state: 'observing' },
      reason: 'Its first visit was done.',
      at,
    })),
  );
  return ids;
}

/** PUT /visits/:visitId. */
export async function setVisitStatus(ctx: AppContext, viewer: SessionUser, visitId: number, status: VisitStatus): Promise<TimelineVisit> {
  await ctx.db.transaction(async (trx) => {
    const row = await trx('night_plan_visits').where('id', visitId).forUpdate().first();
    if (!row) throw new AppError('visit_not_found', `No visit ${visitId}`, 404);
    if (row.status === status) return;
    const at = ctx.now();
    await trx('night_plan_visits')
      .where('id', visitId)
      .update({ status, status_changed_by: viewer.id, status_changed_at: at, version: trx.raw('version + 1') });
    await insertNightPlanAudit(trx, [
      {
        actorAccountId: viewer.id,
        cycleId: row.cycle_id,
        entity: 'visit',
        entityId: visitId,
        action: 'set_status',
        before: { status: row.status },
        after: { status },
        at,
      },
    ]);
    if (status === 'done') {
      await startObserving(trx, row.cycle_id, [visitId], viewer.id, at);
      // The program may now have every visit night it needs (program-completion.ts).
      await completeProgramsWithVisitsDone(trx, row.cycle_id, [visitId], viewer.id, at);
    }
  });
  const v = await ctx
    .db('night_plan_visits as v')
    .join('targets as t', 't.id', 'v.target_id')
    .join('proposals as p', 'p.id', 'v.proposal_id')
    .where('v.id', visitId)
    .first('v.*', 't.name as target_name', 'p.title as program_title');
  return timelineVisit({ ...toVisit(v), targetName: v.target_name, programTitle: v.program_title });
}

/**
 * POST /cycles/:cycleId/execution: every row matched to a visit of that target on that node
 * whose span holds the time (or which starts within EXECUTION_MATCH_MINUTES of it); every bad
 * row and field reported at once, nothing written on any error; one audit row per visit changed.
 */
export async function uploadExecution(
  ctx: AppContext,
  viewer: SessionUser,
  cycleId: number,
  upload: Express.Multer.File | undefined,
): Promise<ExecutionUploadResult> {
  const cycle = await requireCycle(ctx.db, cycleId);
  const file = requireUploadedFile(upload, 'file');
  const { rows, errors } = readExecutionCsv(file.buffer, file.originalname || 'the file');
  const nodeIds = await listCycleNodeIds(ctx.db, cycleId);
  const nodes = nodeIds.length ? await listNodes(ctx.db, nodeIds) : [];
  const nodeByCode = new Map(nodes.map((n) => [n.code.toLowerCase(), n]));
  const all = await ctx
    .db('night_plan_visits as v')
    .join('targets as t', 't.id', 'v.target_id')
    .where('v.cycle_id', cycleId)
    .select('v.id', 'v.node_id', 'v.start_at', 'v.end_at', 'v.status', 't.name');
  const slack = EXECUTION_MATCH_MINUTES * 60_000;
  const changes = new Map<number, { status: 'done' | 'missed'; before: string; row: number }>();
  const problems: CsvRowError[] = [...errors];
  for (const r of rows) {
    const node = nodeByCode.get(r.node.toLowerCase());
    if (!node) {
      problems.push({ row: r.row, field: 'node', message: `no node “${r.node}” in cycle ${cycle.code}` });
      continue;
    }
    const ofTarget = all.filter((v) => v.node_id === node.id && (v.name as string).toLowerCase() === r.target.toLowerCase());
    if (!ofTarget.length) {
      problems.push({ row: r.row, field: 'target', message: `no visit of “${r.target}” is planned on ${node.code}` });
      continue;
    }
    const matches = ofTarget
      .filter(
        (v) => (v.start_at.getTime() <= r.utcMs && r.utcMs <= v.end_at.getTime()) || Math.abs(v.start_at.getTime() - r.utcMs) <= slack,
      )
      .sort((a, b) => Math.abs(a.start_at.getTime() - r.utcMs) - Math.abs(b.start_at.getTime() - r.utcMs));
    if (!matches.length) {
      problems.push({
        row: r.row,
        field: 'utc_time',
        message: `no visit of “${r.target}” on ${node.code} holds or starts within ${EXECUTION_MATCH_MINUTES} minutes of this time`,
      });
      continue;
    }
    const v = matches[0];
    const earlier = changes.get(Number(v.id));
    if (earlier && earlier.status !== r.status) {
      problems.push({ row: r.row, field: 'status', message: `row ${earlier.row} gives the same visit another status` });
      continue;
    }
    if (v.status !== r.status) changes.set(Number(v.id), { status: r.status, before: v.status, row: r.row });
  }
  if (problems.length) throw executionErrors(problems);
  const at = ctx.now();
  await ctx.db.transaction(async (trx) => {
    for (const status of ['done', 'missed'] as const) {
      const ids = [...changes].filter(([, c]) => c.status === status).map(([id]) => id);
      for (let i = 0; i < ids.length; i += 1000) {
        await trx('night_plan_visits')
          .whereIn('id', ids.slice(i, i + 1000))
          .update({ status, status_changed_by: viewer.id, status_changed_at: at, version: trx.raw('version + 1') });
      }
    }
    const audit = [...changes].map(([id, c]) => ({
      actorAccountId: viewer.id,
      cycleId,
      entity: 'visit' as const,
      entityId: id,
      action: 'execution_upload',
      before: { status: c.before },
      after: { status: c.status },
      at,
    }));
    for (let i = 0; i < audit.length; i += 1000) await insertNightPlanAudit(trx, audit.slice(i, i + 1000));
    const done = [...changes].filter(([, c]) => c.status === 'done').map(([id]) => id);
    for (let i = 0; i < done.length; i += 1000) await startObserving(trx, cycleId, done.slice(i, i + 1000), viewer.id, at);
    // Programs with every visit night they need are complete (program-completion.ts); one call, so that their rows are locked in one order.
    await completeProgramsWithVisitsDone(trx, cycleId, done, viewer.id, at);
  });
  return { updated: changes.size, rows: rows.length };
}

/** GET …/plan.csv and …/plan.ics: the node's visits over the campaign. */
export async function exportNodePlan(ctx: AppContext, cycleId: number, nodeId: number, format: 'csv' | 'ics') {
  const cycle = await requireCycle(ctx.db, cycleId);
  const node = await requireCycleNode(ctx.db, cycleId, nodeId);
  const visits: ExportVisit[] = await visitsWithNames(ctx.db, cycleId, nodeId, null);
  const filename = `night-plan-${cycle.id}-${node.id}.${format}`;
  const body = format === 'csv' ? planCsv(visits) : planIcs(`Night plan ${cycle.code} ${node.code}`, visits);
  return { filename, body, contentType: format === 'csv' ? 'text/csv; charset=utf-8' : 'text/calendar; charset=utf-8' };
}

/** GET /programs/:proposalId: the program's team (PI, accepted members) and facility managers; 404 for others. */
export async function getProgramProgress(ctx: AppContext, viewer: SessionUser, proposalId: number): Promise<ProgramProgress> {
  if (!hasAnyRole(viewer, 'facility_manager')) await accessProposal(ctx.db, viewer, proposalId);
  const program = await ctx
    .db('programs as g')
    .join('cycles as c', 'c.id', 'g.cycle_id')
    .where('g.proposal_id', proposalId)
    .whereNotNull('c.awards_released_at')
    .first('g.cycle_id');
  if (!program) throw programNotFound(proposalId);
  // A campaign that ended completes its programs here too, so the team never waits for the daily job.
  const ended = await ctx.db('cycles').where('id', program.cycle_id).first('campaign_end');
  if (ended) await completeIfCampaignEnded(ctx.db, { id: program.cycle_id, campaignEnd: ended.campaign_end }, ctx.now());
  const row = (await listPrograms(ctx.db, program.cycle_id)).find((p) => p.proposalId === proposalId);
  if (!row) throw programNotFound(proposalId);
  const [progress] = await programProgress(ctx.db, [row]);
  return progress;
}
