/**
 * The night-plan job: one node of a build (docs/night-plans.md). Loads the node's awarded
 * targets, recomputes their plans against the node's sky windows over the campaign, schedules
 * the nights (a re-plan keeps every visit before its night and every visit done), stores the
 * node's visits and target figures in one transaction, then the science yield of each target.
 *
 * Which targets go on the node: a program (an awarded proposal of a released cycle, in state
 * scheduled or observing) with hours on the node; its awarded targets (the award's list, or
 * every target). Each target gets a share of the program's clear hours on the node (awarded ×
 * (1 − weather loss)) in proportion to the clear hours its plan needs there.
 *
 * Value per visit night (the scheduler's weight): every program of the cycle is ranked by its
 * place in its own panel's standing as a fraction of that standing's length (position / panel
 * size: the best of every panel first; ties by the earlier position, then proposal id), and
 * weighs (number of programs + 1 − rank). Programs without a standing position come last.
 * Our rule (no source): panels of different sizes are merged by relative place, not by grade.
 */
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { Observer } from 'astronomy-engine';
import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { computeNodeTargetPlan, type NodeTargetPlan } from '@spincycle/shared/planning/node-target-plan';
import { scheduleNights, type PlannedVisit, type SchedulerTarget } from '@spincycle/shared/scheduling/night-scheduler';
import { nightsWithWeatherAllowance, schedulerNights, schedulerTarget, visitDays } from '@spincycle/shared/scheduling/scheduler-inputs';
import { scienceYield } from '@spincycle/shared/scheduling/science-yield';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';
import { utDaysFromMs } from '@spincycle/shared/sky/astro-time';
import { engineHorizontal } from '@spincycle/shared/sky/engine-brute-force';
import { kastenYoungAirmass, SkyInputError, type SkyWindowsResult } from '@spincycle/shared/sky/index';
import { listNodes } from '../facility/facility-repository';
import { nodeSkyWindows, toPlanTarget } from '../proposals/plans/plan-computation';
import { listTargets, type StoredTarget } from '../proposals/targets/target-repository';
import {
  addBuildProgress,
  failBuild,
  findBuild,
  findNightPlanCycle,
  finishNodeJob,
  listLostNights,
  listNodeVisits,
  listPrograms,
  markBuildRunning,
  replaceNodePlan,
  SCHEDULED_PROGRAM_STATES,
  storeTargetYield,
  type ProgramRow,
  type TargetFiguresInsert,
  type VisitInsert,
} from './night-plan-repository';

/** Trials of the injection–recovery per target (docs/night-plans.md#science-yield). */
export const YIELD_TRIALS = 20;
/** Progress is written at least every this many targets and nights. */
export const PROGRESS_EVERY_TARGETS = 25;
export const PROGRESS_EVERY_NIGHTS = 30;
/** Below this recovery fraction a target is called at risk. */
export const AT_RISK_RECOVERY = 0.5;

/** The pg-boss payload of one node job of a build. */
export interface NightPlanJobData {
  buildId: number;
  nodeId: number;
}

/** Value per visit night of each program (see the file comment). */
export function programWeights(programs: Pick<ProgramRow, 'proposalId' | 'position' | 'panelSize'>[]): Map<number, number> {
  const ranked = [...programs].sort((a, b) => {
    const fa = a.position === null ? Number.POSITIVE_INFINITY : a.position / Math.max(1, a.panelSize);
    const fb = b.position === null ? Number.POSITIVE_INFINITY : b.position / Math.max(1, b.panelSize);
    return fa - fb || (a.position ?? Infinity) - (b.position ?? Infinity) || a.proposalId - b.proposalId;
  });
  return new Map(ranked.map((p, i) => [p.proposalId, ranked.length - i]));
}

/** Programs whose awarded targets are scheduled. */
export const isScheduledProgram = (p: ProgramRow) => SCHEDULED_PROGRAM_STATES.includes(p.state);

/** One awarded target on a node, with its plan and scheduler input. */
export interface NodeTarget {
  target: StoredTarget;
  proposalId: number;
  programTitle: string;
  combined: NodeTargetPlan;
  scheduler: SchedulerTarget;
  /** Visit nights its full plan needs on the node with the weather allowance. */
  nightsWithAllowance: number;
}

/** Clear hours a plan needs on the node (visit nights × visits per night × visit length). */
function planClearHours(c: NodeTargetPlan): number {
  const q = c.plan.quantities;
  return (Math.max(0, Math.round(q.visitNights.value)) * Math.max(1, Math.round(q.visitsPerNight.value)) * q.visitSeconds.value) / 3600;
}

/**
 * The node's awarded targets with their recomputed plans and scheduler inputs, and the sky
 * windows over the campaign (one computation for every target of the node). A target whose
 * input the science core refuses is left out and listed in `skipped`.
 */
export async function loadNodeTargets(
  db: Knex,
  cycle: { campaignStart: string; campaignEnd: string },
  cycleId: number,
  node: TelescopeNode,
): Promise<{ targets: NodeTarget[]; windows: SkyWindowsResult; skipped: { targetId: number; reason: string }[] }> {
  const programs = await listPrograms(db, cycleId);
  const weights = programWeights(programs);
  const onNode = programs.filter((p) => isScheduledProgram(p) && p.nodes.some((n) => n.nodeId === node.id));
  const picked: { program: ProgramRow; target: StoredTarget }[] = [];
  for (const program of onNode) {
    const awarded = program.targetIds ? new Set(program.targetIds) : null;
    for (const target of await listTargets(db, program.proposalId)) {
      if (!awarded || awarded.has(target.id)) picked.push({ program, target });
    }
  }
  const campaign = { firstNight: cycle.campaignStart, lastNight: cycle.campaignEnd };
  const windows = nodeSkyWindows(
    node,
    campaign,
    picked.map((p) => p.target),
  );
  const skipped: { targetId: number; reason: string }[] = [];
  const planned: { program: ProgramRow; target: StoredTarget; combined: NodeTargetPlan; index: number }[] = [];
  picked.forEach(({ program, target }, index) => {
    try {
      const combined = computeNodeTargetPlan(toPlanTarget(target), node, node.site, windows.targets[index], {
        completeness: program.completeness,
      });
      planned.push({ program, target, combined, index });
    } catch (err) {
      if (!isScienceInputError(err) && !(err instanceof SkyInputError)) throw err;
      skipped.push({ targetId: target.id, reason: err instanceof Error ? err.message : String(err) });
    }
  });
  // Each program's node-hours on the node, shared in proportion to what each target's plan needs.
  const needByProgram = new Map<number, number>();
  for (const p of planned)
    needByProgram.set(p.program.proposalId, (needByProgram.get(p.program.proposalId) ?? 0) + planClearHours(p.combined));
  const targets = planned.map(({ program, target, combined, index }) => {
    const awardedHours = program.nodes.find((n) => n.nodeId === node.id)!.nodeHours;
    const need = needByProgram.get(program.proposalId) ?? 0;
    const share = need > 0 ? planClearHours(combined) / need : 0;
    return {
      target,
      proposalId: program.proposalId,
      programTitle: program.title,
      combined,
      nightsWithAllowance: nightsWithWeatherAllowance(
        Math.max(0, Math.round(combined.plan.quantities.visitNights.value)),
        node.weatherLossFraction,
      ),
      scheduler: schedulerTarget({
        id: target.id,
        plan: combined.plan,
        windows: windows.targets[index],
        weight: weights.get(program.proposalId) ?? 1,
        awardedNodeHours: awardedHours * share,
        weatherLossFraction: node.weatherLossFraction,
      }),
    };
  });
  return { targets, windows, skipped };
}

/** Altitude (astronomy-engine, with the node's refraction mode) and Kasten & Young airmass at an instant. */
export function altitudeAndAirmass(
  node: TelescopeNode,
  target: { raDeg: number; decDeg: number },
  atMs: number,
  refraction: SkyWindowsResult['limits']['refraction'],
) {
  const observer = new Observer(node.site.latitudeDeg, node.site.longitudeDeg, node.site.elevationM);
  const { altitudeDeg } = engineHorizontal(observer, { raDeg: target.raDeg, decDeg: target.decDeg }, utDaysFromMs(atMs), refraction);
  return { altitudeDeg, airmass: Math.max(1, kastenYoungAirmass(altitudeDeg)) };
}

/** Plain reasons why a target is at risk. */
function atRiskReasons(
  t: NodeTarget,
  outcome: { visitNights: number; largestGapNights: number | null },
  recovery: number | null,
): string[] {
  const reasons: string[] = [];
  const planNights = Math.max(0, Math.round(t.combined.plan.quantities.visitNights.value));
  const wanted = t.nightsWithAllowance;
  if (!t.combined.feasible) reasons.push('Its plan cannot be carried out as it stands on this node.');
  if (outcome.visitNights < planNights) {
    reasons.push(`Only ${outcome.visitNights} of the ${planNights} clear visit nights its plan needs are planned, before any weather.`);
  } else if (outcome.visitNights < wanted) {
    reasons.push(
      `${outcome.visitNights} visit nights are planned: its plan needs ${planNights} clear ones, and ${wanted} with the usual allowance for bad weather on this node.`,
    );
  }
  const s = t.scheduler;
  if (outcome.largestGapNights !== null && outcome.largestGapNights > s.stepNights + s.toleranceNights) {
    reasons.push(
      `The longest gap between visit nights is ${outcome.largestGapNights} nights, more than the ${s.stepNights + s.toleranceNights} the cadence allows.`,
    );
  }
  if (recovery !== null && recovery < AT_RISK_RECOVERY) {
    reasons.push(`The period is recovered in only ${Math.round(recovery * 100)} % of simulated campaigns.`);
  }
  return reasons;
}

/**
 * One node job of a build. Returns what it did (for logs and tests). A failure marks the build
 * failed with a plain message and is rethrown (pg-boss records it).
 */
export async function runNightPlanNodeJob(
  db: Knex,
  data: NightPlanJobData,
  logger?: Logger,
): Promise<{ visits: number; targets: number; state: string | undefined } | null> {
  const { buildId, nodeId } = data;
  try {
    const build = await findBuild(db, buildId);
    if (!build || !(await markBuildRunning(db, buildId))) return null;
    const cycle = await findNightPlanCycle(db, build.cycleId);
    const [node] = await listNodes(db, [nodeId]);
    if (!cycle || !node) throw new Error(`the cycle or node ${nodeId} no longer exists`);

    const { targets, windows, skipped } = await loadNodeTargets(db, cycle, cycle.id, node);
    const nightIndex = new Map(windows.nights.map((n, i) => [n.nightDate, i]));
    const lost = new Set((await listLostNights(db, cycle.id, nodeId)).map((l) => nightIndex.get(l.date)).filter((i) => i !== undefined));
    const nights = schedulerNights(windows, lost);
    const fromNight = build.fromNight ? (nightIndex.get(build.fromNight) ?? 0) : 0;

    // Kept visits: done ones and (re-plan) planned ones before its night count for cadence and
    // award; missed ones keep their time but count for nothing, so the re-plan makes up for them.
    const existing = await listNodeVisits(db, cycle.id, nodeId);
    const known = new Set(targets.map((t) => t.target.id));
    const fixed: PlannedVisit[] = [];
    const doneVisits: PlannedVisit[] = [];
    for (const v of existing) {
      const night = nightIndex.get(v.nightDate);
      if (night === undefined) continue;
      const keptPlanned = v.status === 'planned' && build.fromNight !== null && v.nightDate < build.fromNight;
      if (v.status === 'done' || keptPlanned) {
        const visit = { targetId: known.has(v.targetId) ? v.targetId : -v.id, night, startMs: v.startMs, endMs: v.endMs };
        fixed.push(visit);
        if (v.status === 'done') doneVisits.push(visit);
      } else if (v.status === 'missed') {
        fixed.push({ targetId: -v.id, night, startMs: v.startMs, endMs: v.endMs });
      }
    }

    let reported = 0;
    const result = scheduleNights({
      nights,
      targets: targets.map((t) => t.scheduler),
      fixed,
      fromNight,
      onProgress: (done) => {
        if (done - reported >= PROGRESS_EVERY_NIGHTS) {
          const units = done - reported;
          reported = done;
          void addBuildProgress(db, buildId, units).catch(() => undefined);
        }
      },
    });
    await addBuildProgress(db, buildId, nights.length - fromNight - reported);

    const byId = new Map(targets.map((t) => [t.target.id, t]));
    const newVisits: VisitInsert[] = result.visits
      .filter((v) => !v.fixed)
      .map((v) => {
        const t = byId.get(v.targetId)!;
        const sky = altitudeAndAirmass(node, t.target, (v.startMs + v.endMs) / 2, windows.limits.refraction);
        return {
          cycleId: cycle.id,
          nodeId,
          proposalId: t.proposalId,
          targetId: v.targetId,
          nightDate: windows.nights[v.night].nightDate,
          // Whole milliseconds, rounded inwards: still inside the usable interval, never overlapping.
          startMs: Math.ceil(v.startMs),
          endMs: Math.floor(v.endMs),
          buildId,
          altitudeDeg: sky.altitudeDeg,
          airmass: sky.airmass,
        };
      });
    const outcomes = new Map(result.targets.map((o) => [o.targetId, o]));
    const figures: TargetFiguresInsert[] = targets.map((t) => {
      const q = t.combined.plan.quantities;
      const o = outcomes.get(t.target.id)!;
      return {
        cycleId: cycle.id,
        proposalId: t.proposalId,
        targetId: t.target.id,
        nodeId,
        visitsRequired: Math.max(0, Math.round(q.visitNights.value)) * Math.max(1, Math.round(q.visitsPerNight.value)),
        visitNightsRequired: Math.max(0, Math.round(q.visitNights.value)),
        stepNights: t.scheduler.stepNights,
        toleranceNights: t.scheduler.toleranceNights,
        visitsPlanned: o.visits,
        visitNightsPlanned: o.visitNights,
        medianGap: o.medianGapNights,
        largestGap: o.largestGapNights,
        atRisk: atRiskReasons(t, o, null),
        buildId,
      };
    });
    await db.transaction((trx) => replaceNodePlan(trx, cycle.id, nodeId, build.fromNight, newVisits, figures));

    // The science yield on the planned and done visits (missed ones will not give data).
    const byTarget = new Map<number, PlannedVisit[]>();
    for (const v of result.visits) if (v.targetId > 0) byTarget.set(v.targetId, [...(byTarget.get(v.targetId) ?? []), v]);
    const doneByTarget = new Map<number, PlannedVisit[]>();
    for (const v of doneVisits) if (v.targetId > 0) doneByTarget.set(v.targetId, [...(doneByTarget.get(v.targetId) ?? []), v]);
    let sinceProgress = 0;
    for (const t of targets) {
      const y = scienceYield(t.combined.plan, visitDays(byTarget.get(t.target.id) ?? [], windows), {
        trials: YIELD_TRIALS,
        seed: t.target.id,
        weatherLossFraction: node.weatherLossFraction,
        observedTimesDays: visitDays(doneByTarget.get(t.target.id) ?? [], windows),
      });
      const o = outcomes.get(t.target.id)!;
      await storeTargetYield(db, nodeId, t.target.id, {
        fraction: y.fraction,
        explanation: y.explanation,
        atRisk: atRiskReasons(t, o, y.fraction),
      });
      if (++sinceProgress >= PROGRESS_EVERY_TARGETS) {
        await addBuildProgress(db, buildId, sinceProgress);
        sinceProgress = 0;
      }
    }
    await addBuildProgress(db, buildId, sinceProgress);
    const state = await finishNodeJob(db, buildId);
    logger?.info(
      { buildId, nodeId, pid: process.pid, visits: newVisits.length, targets: targets.length, skipped: skipped.length, state },
      'night plan node job done',
    );
    return { visits: newVisits.length, targets: targets.length, state };
  } catch (err) {
    logger?.error({ err, buildId, nodeId }, 'night plan node job failed');
    await failBuild(
      db,
      buildId,
      'Building the night plans failed unexpectedly; it has been logged. Ask for a new build, or contact support if it fails again.',
    ).catch(() => undefined);
    throw err;
  }
}
