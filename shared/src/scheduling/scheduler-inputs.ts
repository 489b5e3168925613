/**
 * From a node's sky windows and its awarded targets' plans to the scheduler's inputs
 * (night-scheduler.ts), and from planned visits back to the days the science yield simulates.
 */
import type { TargetPlan } from '../science/target-plan';
import { MAX_INTERVALS_PER_NIGHT, type SkyWindowsResult, type TargetWindows } from '../sky/sky-types';
import type { PlannedVisit, SchedulerNight, SchedulerTarget } from './night-scheduler';

const MS_PER_DAY = 86_400_000;

/**
 * Tolerance on the nights between visit nights: a third of the step, rounded down (none for
 * steps of one or two nights) — a target observed every 6 nights may come on the 4th to 8th.
 * Our choice for a rotation campaign, where a slightly uneven sampling costs little (common
 * practice, no source).
 */
export function cadenceToleranceNights(stepNights: number): number {
  return Math.max(0, Math.min(stepNights - 1, Math.floor(stepNights / 3)));
}

/** The node's nights for the scheduler; `lost` holds the indices of nights marked lost. */
export function schedulerNights(windows: SkyWindowsResult, lost: ReadonlySet<number> = new Set()): SchedulerNight[] {
  return windows.nights.map((night, n) => ({
    darkStartMs: night.darkStartUtcMs,
    darkEndMs: night.darkEndUtcMs,
    lost: lost.has(n),
  }));
}

/** The usable intervals of one target's night, without the nights the Moon rule excludes. */
function intervalsOf(w: TargetWindows): (n: number) => Float64Array {
  const empty = new Float64Array(0);
  return (n: number) => {
    const count = w.intervalCountByNight[n];
    if (count === 0 || w.moonExcludedByNight[n] === 1) return empty;
    const base = n * MAX_INTERVALS_PER_NIGHT * 2;
    return w.intervalsUtcMs.subarray(base, base + 2 * count);
  };
}

/** One awarded target on the node, with its plan, its windows, its value and its award. */
export interface AwardedTargetInput {
  id: number;
  plan: TargetPlan;
  windows: TargetWindows;
  /** Value of one visit night (from the standing: higher is more important). */
  weight: number;
  /**
   * Node-hours the award gives this target on the node, weather allowance included (what the
   * plan asks: its clear hours / (1 − weather loss)); undefined: what its plan asks.
   */
  awardedNodeHours?: number;
  /** Share of the node's nights expected lost to weather, 0 ≤ f < 1 (default 0). */
  weatherLossFraction?: number;
}

/**
 * Visit nights to schedule for `clearNights` clear ones on a node losing `weatherLossFraction`
 * of its nights: clear / (1 − loss), rounded up — the plan counts clear nights, so the night
 * plan books the nights weather is expected to take as well.
 */
export function nightsWithWeatherAllowance(clearNights: number, weatherLossFraction: number): number {
  if (clearNights <= 0) return 0;
  return Math.ceil(clearNights / (1 - weatherLossFraction) - 1e-9);
}

/**
 * The scheduler's target for one awarded target: its plan's visits per night, visit nights and
 * nights between them.
 * - The plan counts clear visit nights. A full award books them with the weather allowance
 *   (nightsWithWeatherAllowance), over the plan's baseline: the step shrinks to fit them in
 *   (a step of one night lengthens the baseline instead, as the plan says: weather adds calendar
 *   time), so that after the expected weather the plan's clear nights remain.
 * - An award of fewer node-hours books fewer visit nights over the same baseline (the longest
 *   period still needs the baseline; fewer samples lower the completeness, which the science
 *   yield then shows).
 */
export function schedulerTarget(input: AwardedTargetInput): SchedulerTarget {
  const q = input.plan.quantities;
  const loss = input.weatherLossFraction ?? 0;
  const planStep = Math.max(1, Math.round(q.nightStepDays.value));
  const visitMs = q.visitSeconds.value * 1000;
  const visitsPerNight = Math.max(1, Math.round(q.visitsPerNight.value));
  const planNights = Math.max(0, Math.round(q.visitNights.value));
  const wantedNights = nightsWithWeatherAllowance(planNights, loss);
  const nightMs = visitsPerNight * visitMs;
  const awardedMs = input.awardedNodeHours === undefined ? Number.POSITIVE_INFINITY : input.awardedNodeHours * 3_600_000;
  const visitNights = Math.min(wantedNights, Math.floor(awardedMs / nightMs + 1e-9));
  const baselineNights = Math.max(planStep * Math.max(0, planNights - 1), Math.round(q.baselineDays.value));
  let stepNights = planStep;
  if (visitNights > 1 && visitNights < planNights) stepNights = Math.max(planStep, Math.floor(baselineNights / (visitNights - 1)));
  else if (visitNights > planNights && visitNights > 1)
    stepNights = Math.max(1, Math.min(planStep, Math.round(baselineNights / (visitNights - 1))));
  return {
    id: input.id,
    weight: input.weight,
    visitMs,
    visitsPerNight,
    stepNights,
    toleranceNights: cadenceToleranceNights(stepNights),
    visitNights,
    budgetMs: visitNights * nightMs,
    intervals: intervalsOf(input.windows),
  };
}

/**
 * The planned visits of one target as days from the middle of the first night's dark time
 * (what scienceYield simulates): night n's visits lie within half a day of n.
 */
export function visitDays(visits: readonly PlannedVisit[], windows: SkyWindowsResult): number[] {
  const first = windows.nights[0];
  const origin =
    first.darkStartUtcMs !== null && first.darkEndUtcMs !== null ? (first.darkStartUtcMs + first.darkEndUtcMs) / 2 : first.midDarkUtcMs;
  // The middle of each night drifts by minutes through a season, so night n's visits stay
  // within half a day of n (a night's dark time is shorter than 24 h).
  return visits.map((v) => ((v.startMs + v.endMs) / 2 - origin) / MS_PER_DAY);
}
