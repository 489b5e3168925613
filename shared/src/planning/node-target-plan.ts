/**
 * A target plan on a node, checked against the target's sky window from that node's site:
 * the science core's requirements (visits, cadence, baseline, node-hours) combined with the
 * nights on which the target can actually be observed in the campaign, after weather loss.
 * Pure; used by the server's plan worker and by the client's target planner.
 */
import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { computeTargetPlan, type TargetPlan, type TargetPlanOptions, type TargetPlanTarget } from '../science/target-plan';
import { assessCadence, type CadenceAssessment, type CadenceRequirement } from '../sky/cadence-assessment';
import type { TargetWindows } from '../sky/sky-types';

/**
 * The cadence requirement a plan puts on the sky window. The cadence asked of the sky is the
 * plan's sample interval rounded up to whole nights (Spincycle's choice): weather makes the
 * actual visiting nights random, so demanding every single night of a 1.3-d interval would
 * fail any site with weather loss; the visit count itself is checked separately against the
 * expected clear nights (see assessCadence).
 */
export function requirementFromPlan(plan: TargetPlan): CadenceRequirement {
  const q = plan.quantities;
  return {
    visitsPerNight: Math.max(1, Math.round(q.visitsPerNight.value)),
    visitHours: q.visitSeconds.value / 3600,
    cadenceDays: Math.max(1, Math.ceil(q.sampleIntervalDays.value - 1e-9)),
    baselineDays: q.baselineDays.value,
    totalVisits: Math.max(1, Math.round(q.visits.value)),
  };
}

/** What a person can change to make an infeasible plan work. */
export type SuggestionKind = 'other_node' | 'longer_exposure' | 'more_visits_per_night' | 'fewer_samples';

export interface PlanSuggestion {
  kind: SuggestionKind;
  message: string;
}

export interface NodeTargetPlan {
  plan: TargetPlan;
  sky: CadenceAssessment;
  /** The plan's own science is executable and the sky window carries its cadence. */
  feasible: boolean;
  /** Every reason the plan cannot be executed as it stands (science blocks and sky window). */
  reasons: string[];
  suggestions: PlanSuggestion[];
}

/**
 * Combines a computed plan with the target's windows from the node's site. `windows` must
 * come from `computeSkyWindows` with this node's limits (see `skyLimitsForNode`).
 */
export function combinePlanWithSky(plan: TargetPlan, windows: TargetWindows, node: Pick<NodeSpec, 'weatherLossFraction' | 'maxExposureSeconds'>): NodeTargetPlan {
  const req = requirementFromPlan(plan);
  const sky = assessCadence(windows, req, node.weatherLossFraction);
  const reasons = [...plan.flags.filter((f) => f.severity === 'blocking').map((f) => f.message), ...sky.reasons];
  const suggestions: PlanSuggestion[] = [];
  const q = plan.quantities;
  if (plan.flags.some((f) => f.code === 'saturatesAtMinExposure')) {
    suggestions.push({ kind: 'other_node', message: 'The star saturates here even at the shortest exposure: a smaller aperture or a redder band avoids it.' });
  }
  // A longer exposure is only possible below both the node's longest exposure and saturation.
  const longestUsefulExposure = Math.min(node.maxExposureSeconds, q.saturationLimitSeconds.value);
  if (plan.flags.some((f) => f.code === 'precisionGoalNotReached') && q.exposureSeconds.value < longestUsefulExposure * 0.95) {
    suggestions.push({
      kind: 'longer_exposure',
      message: `A longer exposure (up to ${Math.floor(longestUsefulExposure)} s before ${longestUsefulExposure < node.maxExposureSeconds ? 'the star saturates' : "the node's limit"}) reaches the per-visit precision goal with fewer visits.`,
    });
  }
  if (!sky.fits) {
    const nightlyCapacity = Math.floor((sky.maxNightlyUsableHours * 0.999) / req.visitHours);
    if (sky.maxNightlyUsableHours > 0 && nightlyCapacity < req.visitsPerNight) {
      suggestions.push({
        kind: 'fewer_samples',
        message: `The longest nightly window (${sky.maxNightlyUsableHours.toFixed(1)} h) holds ${nightlyCapacity} of the ${req.visitsPerNight} visits per night: fewer samples per cycle, or a node where the target culminates higher.`,
      });
    } else if (sky.qualifyingNights > 0 && sky.visitingNightsNeeded > sky.expectedClearNights) {
      const clearNights = Math.floor(sky.expectedClearNights);
      const perNight = clearNights > 0 ? Math.ceil(req.totalVisits / clearNights) : Infinity;
      suggestions.push({
        kind: 'more_visits_per_night',
        message:
          perNight <= nightlyCapacity
            ? `About ${perNight} visits per night on the ${clearNights} expected clear nights would carry the ${req.totalVisits} visits (the nightly window holds up to ${nightlyCapacity}).`
            : `Too few clear nights for ${req.totalVisits} visits even at ${nightlyCapacity} per night: a node with less weather loss, or a brighter comparison setup that needs fewer visits.`,
      });
    }
    suggestions.push({ kind: 'other_node', message: 'Another node of the network may see this target longer in the campaign.' });
  }
  return { plan, sky, feasible: plan.feasible && sky.fits, reasons, suggestions };
}

/** Convenience: plan and combine in one call. */
export function computeNodeTargetPlan(
  target: TargetPlanTarget,
  node: NodeSpec,
  site: SiteSpec,
  windows: TargetWindows,
  options: TargetPlanOptions = {},
): NodeTargetPlan {
  return combinePlanWithSky(computeTargetPlan(target, node, site, options), windows, node);
}
