/**
 * The curves and points of the cluster chart: expected rotation period against intrinsic
 * colour at the age the whole target list shares, one curve per gyrochronology relation over
 * the colours it is calibrated for, the ±1σ band of the default relation, and each target at
 * its intrinsic colour and planned period. Pure; computed with the shared science core.
 */
import type { PlanMarker } from '@spincycle/shared/proposals/plan-types';
import type { TargetRow } from '@spincycle/shared/proposals/target-schemas';
import { type TargetColourSystem, colourLabel, convertColour, deredden } from '@spincycle/shared/science/colour-sequence';
import { type GyroRelationId, predictPeriod } from '@spincycle/shared/science/gyrochronology';
import { defaultRelationFor } from '@spincycle/shared/science/target-plan';
import { type CurvePoint, periodColourSeries, scienceOrNull } from '../../../planner/gyro-curves';

/** How a target's plans stand across the nodes it was planned on. */
export type TargetFeasibility = 'feasible' | 'partly' | 'infeasible' | 'unplanned';

export interface ClusterCurve {
  relation: GyroRelationId;
  label: string;
  /** The relation a target plan uses by default for this colour system. */
  isDefault: boolean;
  points: CurvePoint[];
}

export interface ClusterTargetPoint extends CurvePoint {
  targetId: number;
  name: string;
  feasibility: TargetFeasibility;
  /** Plans of this target, one per node (empty when none was computed). */
  nodeIds: number[];
}

export interface ClusterSeries {
  /** Colour system of the x axis (the one most targets are given in). */
  system: TargetColourSystem;
  axisLabel: string;
  ageMyr: number;
  /** 1σ age uncertainty the band includes (0: the coefficients' scatter only). */
  ageUncertaintyMyr: number;
  defaultRelation: GyroRelationId;
  curves: ClusterCurve[];
  band: { low: CurvePoint[]; high: CurvePoint[] } | null;
  points: ClusterTargetPoint[];
  /** Targets that cannot be placed (colour outside the sequence), by name. */
  unplaced: string[];
}

/**
 * The age every target shares, or null: the chart needs at least two targets, all with the
 * same age (a cluster, or any coeval group).
 */
export function sharedAgeMyr(targets: readonly Pick<TargetRow, 'ageMyr'>[]): number | null {
  if (targets.length < 2) return null;
  const age = targets[0].ageMyr;
  return targets.every((t) => t.ageMyr === age) ? age : null;
}

/** Feasible on every planned node, on some, on none, or not planned. */
export function feasibilityOf(plans: readonly Pick<PlanMarker, 'feasible'>[]): TargetFeasibility {
  if (plans.length === 0) return 'unplanned';
  const feasible = plans.filter((p) => p.feasible).length;
  if (feasible === plans.length) return 'feasible';
  return feasible === 0 ? 'infeasible' : 'partly';
}

/** The series of the chart, or null when the targets do not share one age. */
/** What the chart reads of a target (a proposal's target row, or the reviewer's view of one). */
export type ClusterTarget = Pick<TargetRow, 'id' | 'name' | 'colour' | 'colourSystem' | 'reddeningEbv' | 'ageMyr' | 'ageUncertaintyMyr'>;

export function clusterSeries(targets: readonly ClusterTarget[], plans: readonly PlanMarker[]): ClusterSeries | null {
  const ageMyr = sharedAgeMyr(targets);
  if (ageMyr === null) return null;

  const bprp = targets.filter((t) => t.colourSystem === 'BPRP').length;
  const system: TargetColourSystem = bprp > targets.length / 2 ? 'BPRP' : 'BV';
  const uncertainties = new Set(targets.map((t) => t.ageUncertaintyMyr ?? 0));
  const ageUncertaintyMyr = uncertainties.size === 1 ? [...uncertainties][0] : 0;
  const defaultRelation = defaultRelationFor(system);

  // The curves are the planner's period–colour curves at the shared age (the default relation selected).
  const curves: ClusterCurve[] = periodColourSeries({ system, ageMyr, relation: defaultRelation, star: null }).curves.map((curve) => ({
    relation: curve.relation,
    label: curve.label,
    isDefault: curve.selected,
    points: curve.points,
  }));

  let band: ClusterSeries['band'] = null;
  const defaultCurve = curves.find((c) => c.isDefault);
  if (defaultCurve) {
    const low: CurvePoint[] = [];
    const high: CurvePoint[] = [];
    for (const { x } of defaultCurve.points) {
      const range = scienceOrNull(
        () =>
          predictPeriod({
            relation: defaultRelation,
            colour: { value: x, system },
            ageMyr,
            ageUncertaintyMyr: ageUncertaintyMyr || undefined,
          }).rangeDays,
      );
      if (range) {
        low.push({ x, y: range.low });
        high.push({ x, y: range.high });
      }
    }
    band = low.length >= 2 ? { low, high } : null;
  }

  const plansByTarget = new Map<number, PlanMarker[]>();
  for (const plan of plans) plansByTarget.set(plan.targetId, [...(plansByTarget.get(plan.targetId) ?? []), plan]);

  const points: ClusterTargetPoint[] = [];
  const unplaced: string[] = [];
  for (const target of targets) {
    const targetPlans = plansByTarget.get(target.id) ?? [];
    const x = scienceOrNull(() => {
      const intrinsic = deredden({ value: target.colour, system: target.colourSystem }, target.reddeningEbv ?? 0);
      return intrinsic.system === system ? intrinsic.value : convertColour(intrinsic.value, intrinsic.system, system);
    });
    const y =
      targetPlans[0]?.periodDays ??
      scienceOrNull(
        () =>
          predictPeriod({
            relation: defaultRelationFor(target.colourSystem),
            colour: { value: target.colour, system: target.colourSystem },
            reddeningEbvMag: target.reddeningEbv ?? undefined,
            ageMyr,
          }).periodDays,
      );
    if (x === null || y === null) {
      unplaced.push(target.name);
      continue;
    }
    points.push({
      x,
      y,
      targetId: target.id,
      name: target.name,
      feasibility: feasibilityOf(targetPlans),
      nodeIds: targetPlans.map((p) => p.nodeId),
    });
  }

  return {
    system,
    axisLabel: `Intrinsic colour (${colourLabel(system)})₀ (mag)`,
    ageMyr,
    ageUncertaintyMyr,
    defaultRelation,
    curves,
    band,
    points,
    unplaced,
  };
}
