import type { Knex } from 'knex';
import type { Logger } from 'pino';
import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';
import { computeNodeTargetPlan, requirementFromPlan } from '@spincycle/shared/planning/node-target-plan';
import type { PlanExplanation, PlanListQuery, PlanMarker, PlanRunStatus, ProposalPlans } from '@spincycle/shared/proposals/plan-types';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';
import { SkyInputError, toSkyWindowsReport, type SkyWindowsReport } from '@spincycle/shared/sky/index';
import type { AppContext } from '../../../app-context';
import { inParallel } from '../../../db/in-parallel';
import { jsonWithRawMember } from '../../../http/raw-json';
import { AppError, invalidField } from '../../../http/app-error';
import { listCycleNodes } from '../../cycles/cycle-repository';
import { listNodes } from '../../facility/facility-repository';
import { computePlanRows, nodeSkyWindows, toPlanTarget } from './plan-computation';
import { loadPlanInputs, loadPlanInputsOf, PLAN_MODEL_VERSION, planInputsHash } from './plan-inputs';
import {
  failPlanRun,
  findPlanRun,
  findPlanExplanation,
  finishPlanRun,
  listPlanPageJson,
  markPlansRequested,
  listPlanMarkers,
  planCountsAndErrors,
  replaceTargetPlans,
  startPlanRun,
  storeCurrentInputsHash,
  updatePlanProgress,
  type StoredPlanRun,
} from './plan-repository';
import type { PlanPageBody, PlanPageCache } from './plan-page-cache';
import { queuePlanComputations } from './plan-requests';
import { accessProposal, requireEditable, type ProposalAccess } from '../proposal-access';
import { findProposalById } from '../proposal-repository';
import { findTarget } from '../targets/target-repository';

/** Progress is written after every this many targets (enough for a smooth bar, few writes). */
export const PROGRESS_EVERY_TARGETS = 25;

export interface PlanComputationResult {
  proposalId: number;
  targets: number;
  nodes: number;
  plans: number;
  errors: number;
  /** Wall time of the computation (sky windows and plans), ms. */
  computeMs: number;
  /** Wall time of the write transaction, ms. */
  writeMs: number;
  inputsHash: string;
}

/**
 * Computes and stores every target plan of a proposal: the body of the plan job, also called
 * directly by the demo seed, the tests and the benchmark (no queue needed). Progress goes to
 * `plan_runs` every {@link PROGRESS_EVERY_TARGETS} targets. The plans replace the stored ones
 * in one transaction, with the hash of the inputs they were computed from; when the inputs
 * changed while it ran (a target edited meanwhile), the run ends `queued`, since that change
 * queued another job. Returns null when the proposal no longer exists.
 */
export async function computeAndStoreProposalPlans(
  db: Knex,
  proposalId: number,
  options: { logger?: Logger } = {},
): Promise<PlanComputationResult | null> {
  const inputs = await loadPlanInputs(db, proposalId);
  if (!inputs) return null;
  const inputsHash = planInputsHash(inputs);
  const total = inputs.targets.length;
  await startPlanRun(db, proposalId, total);

  const t0 = performance.now();
  const rows = await computePlanRows(inputs, async (done) => {
    if (done % PROGRESS_EVERY_TARGETS === 0 && done < total) await updatePlanProgress(db, proposalId, done);
  });
  const computeMs = performance.now() - t0;

  const t1 = performance.now();
  const written = await db.transaction(async (trx) => {
    // Lock the proposal: edits wait for this write, so the hash check below sees a settled state.
    if (!(await findProposalById(trx, proposalId, { forUpdate: true }))) return false;
    // Read before the inputs: a change committed after this raises it, and the cache stays empty.
    const inputsVersion = (await findPlanRun(trx, proposalId))?.inputsVersion;
    const now = await loadPlanInputs(trx, proposalId);
    const existing = new Set(now!.targets.map((t) => t.id));
    const requested = new Set(now!.nodes.map((n) => n.id));
    // Targets deleted (or nodes dropped) while computing have no row to hang a plan on.
    const kept = rows.filter((r) => existing.has(r.targetId) && requested.has(r.nodeId));
    await replaceTargetPlans(trx, proposalId, inputsHash, kept);
    const currentHash = planInputsHash(now!);
    const changed = currentHash !== inputsHash;
    await finishPlanRun(trx, proposalId, { inputsHash, total, state: changed ? 'queued' : 'idle' });
    if (inputsVersion !== undefined)
      await storeCurrentInputsHash(trx, proposalId, { hash: currentHash, model: String(PLAN_MODEL_VERSION), inputsVersion });
    return true;
  });
  const writeMs = performance.now() - t1;
  if (!written) return null;
  const errors = rows.filter((r) => r.error !== undefined).length;
  options.logger?.info(
    { proposalId, targets: total, nodes: inputs.nodes.length, errors, computeMs: Math.round(computeMs), writeMs: Math.round(writeMs) },
    'target plans stored',
  );
  return { proposalId, targets: total, nodes: inputs.nodes.length, plans: rows.length - errors, errors, computeMs, writeMs, inputsHash };
}

/**
 * The plan job: computes and stores the plans; an unexpected failure marks the run `failed`
 * with a message and is rethrown so that pg-boss records (and retries) the job.
 */
export async function runPlanJob(db: Knex, proposalId: number, logger: Logger): Promise<void> {
  try {
    await computeAndStoreProposalPlans(db, proposalId, { logger });
  } catch (err) {
    logger.error({ err, proposalId }, 'plan computation failed');
    await failPlanRun(
      db,
      proposalId,
      'The plan computation failed unexpectedly; it has been logged. Ask for a recomputation, or contact the facility if it fails again.',
    ).catch(() => undefined);
    throw err;
  }
}

/** The run status as the API shows it; `current` compares the stored plans' inputs with today's. */
function toRunStatus(run: StoredPlanRun | undefined, currentHash: string): PlanRunStatus {
  if (!run) return { state: 'idle', total: 0, done: 0, startedAt: null, finishedAt: null, error: null, current: false };
  const { inputsHash, inputsVersion: _v, currentHash: _h, currentHashModel: _m, plansVersion: _p, ...rest } = run;
  return { ...rest, current: inputsHash === currentHash };
}

/**
 * The hash of today's inputs: the one cached in `plan_runs` while no change raised its
 * version (triggers raise it in the transaction of every change of targets, requested nodes,
 * completeness, campaign, node or site), else computed from the inputs and cached for the
 * next request. Only the first request after a change loads every target.
 */
async function currentInputsHash(
  db: Knex,
  access: Pick<ProposalAccess, 'proposal' | 'cycle'>,
  run: StoredPlanRun | undefined,
): Promise<string> {
  const model = String(PLAN_MODEL_VERSION);
  if (run?.currentHash && run.currentHashModel === model) return run.currentHash;
  // `run` was read before the inputs: storeCurrentInputsHash skips the write if they changed since.
  const hash = planInputsHash(await loadPlanInputsOf(db, access.proposal, access.cycle));
  if (run) await storeCurrentInputsHash(db, access.proposal.id, { hash, model, inputsVersion: run.inputsVersion });
  return hash;
}

/** The run status of a proposal reached through accessProposal (for readiness, the proposal page and the plans tab). */
export async function planRunStatusOf(db: Knex, access: Pick<ProposalAccess, 'proposal' | 'cycle'>): Promise<PlanRunStatus> {
  const run = await findPlanRun(db, access.proposal.id);
  return toRunStatus(run, await currentInputsHash(db, access, run));
}

/** GET /api/proposals/:id/plans/status (team members): the run alone, polled while it is in progress. */
export async function getPlanRunStatus(ctx: AppContext, viewer: SessionUser, id: number): Promise<PlanRunStatus> {
  return planRunStatusOf(ctx.db, await accessProposal(ctx.db, viewer, id));
}

/**
 * GET /api/proposals/:id/plans?page=&pageSize=&feasible=&nodeId=&q=&sort= (team members): one
 * page of the plans, a {@link ProposalPlans} as JSON bytes. The page's rows come as JSON text
 * (see listPlanPageJson). Answers are kept in `pages` under the proposal, its plan run row
 * (whose versions rise with every write of the plans and of their inputs, names included) and
 * the query: a poll of an unchanged list costs the access check and one read of the run.
 */
export async function getProposalPlans(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  query: PlanListQuery,
  pages: PlanPageCache,
): Promise<PlanPageBody> {
  const access = await accessProposal(ctx.db, viewer, id);
  const stored = await findPlanRun(ctx.db, id);
  const key = stored ? JSON.stringify([id, stored, query]) : undefined;
  return pages.get(key, async () => {
    const [run, page, totals] = await inParallel(ctx.db, [
      async () => toRunStatus(stored, await currentInputsHash(ctx.db, access, stored)),
      () => listPlanPageJson(ctx.db, id, query),
      () => planCountsAndErrors(ctx.db, id, query.nodeId),
    ] as const);
    const head: Omit<ProposalPlans, 'plans'> = {
      run,
      page: query.page,
      pageSize: query.pageSize,
      matched: page.matched,
      counts: totals.counts,
      errors: totals.errors,
    };
    return jsonWithRawMember(head, 'plans', page.rowsJson);
  });
}

/** GET /api/proposals/:id/plans/markers (team members): every plan as a chart marker, unpaged. */
export async function getPlanMarkers(ctx: AppContext, viewer: SessionUser, id: number): Promise<PlanMarker[]> {
  await accessProposal(ctx.db, viewer, id);
  return listPlanMarkers(ctx.db, id);
}

/** POST /api/proposals/:id/plans/recompute (team members, editable proposals): 202 with the run status. */
export async function recomputeProposalPlans(ctx: AppContext, viewer: SessionUser, id: number): Promise<PlanRunStatus> {
  const access = await ctx.db.transaction(async (trx) => {
    const locked = await accessProposal(trx, viewer, id, { forUpdate: true });
    requireEditable(locked, ctx.now());
    await markPlansRequested(trx, [id]);
    return locked;
  });
  await queuePlanComputations(ctx, [id]);
  return planRunStatusOf(ctx.db, access);
}

/** GET /api/proposals/:id/targets/:targetId/plan?nodeId=N: every number of the stored plan, explained. */
export async function getPlanExplanation(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  targetId: number,
  nodeId: number,
): Promise<PlanExplanation> {
  await accessProposal(ctx.db, viewer, id);
  const explanation = await findPlanExplanation(ctx.db, id, targetId, nodeId);
  if (!explanation) throw new AppError('plan_not_found', `No computed plan of target ${targetId} on node ${nodeId} in proposal ${id}`, 404);
  return explanation;
}

/**
 * GET /api/proposals/:id/targets/:targetId/sky?nodeId=N: the target's sky windows night by
 * night from that node's site over the campaign, computed now. The node may be any node of
 * the cycle (to compare before requesting it). When the target can be planned on it, the
 * report carries the assessment of the plan's cadence against the windows.
 */
export async function getTargetSky(
  ctx: AppContext,
  viewer: SessionUser,
  id: number,
  targetId: number,
  nodeId: number,
): Promise<SkyWindowsReport> {
  const { cycle, proposal } = await accessProposal(ctx.db, viewer, id);
  return targetSkyReport(ctx, { cycle, proposalId: id, completeness: proposal.completeness }, targetId, nodeId);
}

/**
 * One target's sky windows from one node of the proposal's cycle over its campaign, with the
 * cadence its plan asks for (shared by the team's route and the reviewer's; the caller has
 * checked access to the proposal).
 */
export async function targetSkyReport(
  ctx: AppContext,
  of: { cycle: { id: number; code: string; campaignStart: string; campaignEnd: string }; proposalId: number; completeness: number },
  targetId: number,
  nodeId: number,
): Promise<SkyWindowsReport> {
  const { cycle, proposalId: id } = of;
  const target = await findTarget(ctx.db, id, targetId);
  if (!target) throw new AppError('target_not_found', `No target ${targetId} in proposal ${id}`, 404);
  if (!(await listCycleNodes(ctx.db, cycle.id)).some((n) => n.nodeId === nodeId)) {
    throw invalidField('nodeId', `node ${nodeId} does not take part in cycle ${cycle.code}`);
  }
  const [node] = await listNodes(ctx.db, [nodeId]);
  const result = nodeSkyWindows(node, { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd }, [target]);
  let requirement: ReturnType<typeof requirementFromPlan> | undefined;
  try {
    const plan = computeNodeTargetPlan(toPlanTarget(target), node, node.site, result.targets[0], { completeness: of.completeness });
    requirement = requirementFromPlan(plan.plan);
  } catch (err) {
    // Without a plan the windows are still worth showing; the plan's error is on the plans page.
    if (!isScienceInputError(err) && !(err instanceof SkyInputError)) throw err;
  }
  return toSkyWindowsReport(result, { includeNights: true, requirement, weatherLossFraction: node.weatherLossFraction });
}
