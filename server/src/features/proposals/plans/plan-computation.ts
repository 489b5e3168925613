import type { TelescopeNode } from '@spincycle/shared/facility/facility-types';
import { computeNodeTargetPlan, type NodeTargetPlan } from '@spincycle/shared/planning/node-target-plan';
import { PLAN_TABLE_QUANTITIES } from '@spincycle/shared/proposals/plan-types';
import type { Explained } from '@spincycle/shared/science/explained';
import { isScienceInputError } from '@spincycle/shared/science/science-input-error';
import type { TargetPlanTarget } from '@spincycle/shared/science/target-plan';
import { computeSkyWindows, SkyInputError, skyLimitsForNode, type SkyWindowsResult, type TargetWindows } from '@spincycle/shared/sky/index';
import type { PlanRowInsert, StoredPlanResult } from './plan-repository';
import type { PlanInputs } from './plan-inputs';
import type { StoredTarget } from '../targets/target-repository';

/** A stored target as the science core takes it. */
export function toPlanTarget(t: StoredTarget): TargetPlanTarget {
  return {
    name: t.name,
    colour: { value: t.colour, system: t.colourSystem },
    reddeningEbvMag: t.reddeningEbv ?? undefined,
    ageMyr: t.ageMyr,
    ageUncertaintyMyr: t.ageUncertaintyMyr ?? undefined,
    magnitude: { value: t.magnitude, band: t.magnitudeBand },
    periodPrecisionDays: t.periodPrecisionDays ?? undefined,
    // The proposer's expected period, for stars no relation gives one; replaces the relation's.
    periodDays: t.periodDays ?? undefined,
    periodUncertaintyDays: t.periodUncertaintyDays ?? undefined,
  };
}

/** Sky windows of the targets from the node's site over the campaign, with the node's own limits. */
export function nodeSkyWindows(node: TelescopeNode, campaign: PlanInputs['campaign'], targets: StoredTarget[]): SkyWindowsResult {
  return computeSkyWindows({
    site: node.site,
    limits: skyLimitsForNode(node),
    campaign,
    targets: targets.map((t) => ({ name: t.name, raDeg: t.raDeg, decDeg: t.decDeg })),
  });
}

/** The numbers of a combined plan as they are stored and listed. */
function toPlanResult(combined: NodeTargetPlan, windows: TargetWindows): StoredPlanResult {
  const { plan, sky } = combined;
  const q = plan.quantities;
  return {
    feasible: combined.feasible,
    reasons: combined.reasons,
    suggestions: combined.suggestions,
    skyVerdict: sky.verdict,
    periodDays: q.periodDays.value,
    shortestPeriodDays: q.shortestPeriodDays.value,
    longestPeriodDays: q.longestPeriodDays.value,
    // Rper, the 5–95 % range of the light curve: what rotation surveys quote as the amplitude.
    amplitudePpm: q.amplitudeRperPpm.value,
    perVisitPrecisionPpm: q.perVisitPrecisionPpm.value,
    exposureSeconds: q.exposureSeconds.value,
    visits: q.visits.value,
    completeness: q.completeness.value,
    visitsPerNight: q.visitsPerNight.value,
    // Nights between visit nights as the plan schedules them (1 = every night).
    cadenceDays: q.nightStepDays.value,
    baselineDays: q.baselineDays.value,
    usableNights: windows.summary.usableNights,
    nodeHours: q.nodeHours.value,
    feeMinor: q.feeMinor.value,
    currency: plan.currency,
    why: Object.fromEntries(PLAN_TABLE_QUANTITIES.map((key) => [key, q[key].why])),
    quantities: q as unknown as Record<string, Explained<number | null>>,
    flags: plan.flags,
    relationLabel: plan.relationLabel,
  };
}

/** A message for a plan that could not be computed from its input. */
function planErrorMessage(err: { field: string; reason: string }): string {
  return `${err.field}: ${err.reason}`;
}

const isInputError = (err: unknown): err is { field: string; reason: string } => isScienceInputError(err) || err instanceof SkyInputError;

/**
 * Every plan of the inputs: per node one sky-window computation for all targets, then per
 * target and node the plan against its windows, at the proposal's completeness. A target whose input the science
 * core refuses becomes an error row (the job itself succeeds). `onTargetDone` is called after
 * each target with the count so far (for progress).
 */
export async function computePlanRows(inputs: PlanInputs, onTargetDone?: (done: number) => Promise<void> | void): Promise<PlanRowInsert[]> {
  const { nodes, targets, campaign, completeness } = inputs;
  const windowsByNode = nodes.map((node) => {
    if (!targets.length) return { node, windows: null, error: null };
    try {
      return { node, windows: nodeSkyWindows(node, campaign, targets), error: null };
    } catch (err) {
      if (!isInputError(err)) throw err;
      return { node, windows: null, error: `sky windows of ${node.code}: ${planErrorMessage(err)}` };
    }
  });
  const rows: PlanRowInsert[] = [];
  for (let i = 0; i < targets.length; i++) {
    const target = targets[i];
    const planTarget = toPlanTarget(target);
    const targetRows: PlanRowInsert[] = [];
    for (const { node, windows, error } of windowsByNode) {
      if (!windows) {
        targetRows.push({ targetId: target.id, nodeId: node.id, error: error ?? 'no sky windows' });
        continue;
      }
      try {
        const combined = computeNodeTargetPlan(planTarget, node, node.site, windows.targets[i], { completeness });
        targetRows.push({ targetId: target.id, nodeId: node.id, result: toPlanResult(combined, windows.targets[i]) });
      } catch (err) {
        if (!isInputError(err)) throw err;
        targetRows.push({ targetId: target.id, nodeId: node.id, error: planErrorMessage(err) });
      }
    }
    nameOtherNodes(targetRows, nodes);
    rows.push(...targetRows);
    if (onTargetDone) await onTargetDone(i + 1);
  }
  return rows;
}

/**
 * The science core can only say "another node may do better"; with every requested node of
 * the proposal computed, an infeasible plan can name the node where the same target works.
 */
function nameOtherNodes(targetRows: PlanRowInsert[], nodes: TelescopeNode[]): void {
  const code = (id: number) => nodes.find((n) => n.id === id)?.code ?? `node ${id}`;
  const feasible = targetRows.filter((r) => r.result?.feasible);
  for (const row of targetRows) {
    const result = row.result;
    if (!result || result.feasible) continue;
    const elsewhere = feasible.filter((r) => r.nodeId !== row.nodeId);
    const named = result.suggestions.map((s) => {
      if (s.kind !== 'other_node') return s;
      if (!elsewhere.length) {
        // Said once, whatever made the science core think of another node (saturation, sky):
        // whether the cycle has nodes this proposal did not request is for the screen to add.
        return { ...s, message: 'None of the requested nodes can carry this target as planned.' };
      }
      const list = elsewhere
        .map((r) => `${code(r.nodeId)} (${r.result!.nodeHours.toFixed(1)} node-hours; ${r.result!.skyVerdict.split(';')[0]})`)
        .join(', ');
      return { ...s, message: `Feasible on ${list}.` };
    });
    result.suggestions = named.filter((s, i) => named.findIndex((o) => o.message === s.message) === i);
  }
}
