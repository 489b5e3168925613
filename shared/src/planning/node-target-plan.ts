/**
 * A target plan on a node, checked against the target's sky window from that node's site:
 * the science core's requirements (visits, cadence, baseline, node-hours) combined with the
 * nights on which the target can actually be observed in the campaign, after weather loss.
 * Pure; used by the server's plan worker and by the client's target planner.
 */
import type { NodeSpec, SiteSpec } from '../facility/facility-types';
import { DEFAULT_EXTINCTION_MAG_PER_AIRMASS } from '../science/photometric-bands';
import { countOf } from '../science/explained';
import {
  computeTargetPlan,
  type PlanSkyConditions,
  type TargetPlan,
  type TargetPlanOptions,
  type TargetPlanTarget,
} from '../science/target-plan';
import { assessCadence, type CadenceAssessment, type CadenceRequirement } from '../sky/cadence-assessment';
import { nightlySkyBrightness } from '../sky/moon-sky-brightness';
import type { TargetWindows } from '../sky/sky-types';
import { assessSeason, type SeasonAssessment } from './observing-season';
import { assessPhaseCoverage, type PhaseCoverageAssessment } from './phase-coverage';

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
export type SuggestionKind =
  'other_node' | 'longer_exposure' | 'more_visits_per_night' | 'fewer_samples' | 'multi_season' | 'other_longitude' | 'explicit_period';

export interface PlanSuggestion {
  kind: SuggestionKind;
  message: string;
}

export interface NodeTargetPlan {
  plan: TargetPlan;
  sky: CadenceAssessment;
  /** Does the baseline fit in one observing season of the target at this site? */
  season: SeasonAssessment;
  /** Phase coverage of the plausible periods by the nights this site gives (day-locked periods). */
  phase: PhaseCoverageAssessment;
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
export function combinePlanWithSky(
  plan: TargetPlan,
  windows: TargetWindows,
  node: Pick<NodeSpec, 'weatherLossFraction' | 'maxExposureSeconds'>,
): NodeTargetPlan {
  const req = requirementFromPlan(plan);
  const sky = assessCadence(windows, req, node.weatherLossFraction);
  const q = plan.quantities;
  const season = assessSeason(windows, q.baselineDays.value);
  const phase = assessPhaseCoverage(
    windows,
    {
      baselineDays: q.baselineDays.value,
      visitsPerNight: req.visitsPerNight,
      nightStepDays: Math.max(1, Math.round(q.nightStepDays.value)),
      visitHours: req.visitHours,
    },
    { low: q.shortestPeriodDays.value, high: q.longestPeriodDays.value },
  );
  const reasons = [...plan.flags.filter((f) => f.severity === 'blocking').map((f) => f.message), ...sky.reasons];
  const suggestions: PlanSuggestion[] = [];
  if (plan.flags.some((f) => f.code === 'noExpectedPeriod' && f.severity === 'blocking')) {
    suggestions.push({
      kind: 'explicit_period',
      message: "Enter the star's expected period (from the literature or a previous season) to plan it.",
    });
  }
  if (!season.fitsOneSeason && season.reason) {
    reasons.push(season.reason);
    if (season.multiSeason) {
      suggestions.push({
        kind: 'multi_season',
        message: `A multi-season plan: ${countOf(season.multiSeason.seasons, 'season')} of about ${Math.round(season.multiSeason.perSeasonBaselineDays)} d each (it spans several allocation cycles; propose each season in its own cycle).`,
      });
    }
  }
  // Day-locked periods the baseline cannot unlock from this site block the plan; other
  // sampling gaps are a caution in the suggestions (the scheduler's timing varies them).
  const phaseBlocks = phase.action === 'otherLongitude' || (phase.action === 'lengthenBaseline' && phase.commensurate !== null);
  if (phase.reason && phaseBlocks) reasons.push(phase.reason);
  if (phase.action === 'otherLongitude') {
    suggestions.push({
      kind: 'other_longitude',
      message: 'Add nodes at other longitudes: their nights sample the phases this site always misses.',
    });
  } else if (phase.reason && phase.action !== 'ok' && !phaseBlocks) {
    suggestions.push({ kind: 'fewer_samples', message: phase.reason });
  }
  if (plan.flags.some((f) => f.code === 'saturatesAtMinExposure')) {
    suggestions.push({
      kind: 'other_node',
      message: 'The star saturates here even at the shortest exposure: a smaller aperture or a redder band avoids it.',
    });
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
        message: `The longest nightly window (${sky.maxNightlyUsableHours.toFixed(1)} h) holds ${nightlyCapacity} of the ${req.visitsPerNight} visits a night: fewer samples per rotation, or a node where the target culminates higher.`,
      });
    } else if (sky.qualifyingNights > 0 && sky.visitingNightsNeeded > sky.expectedClearNights) {
      const clearNights = Math.floor(sky.expectedClearNights);
      const perNight = clearNights > 0 ? Math.ceil(req.totalVisits / clearNights) : Infinity;
      suggestions.push({
        kind: 'more_visits_per_night',
        message:
          perNight <= nightlyCapacity
            ? `About ${perNight} visits a night on the ${countOf(clearNights, 'expected clear night')} would carry the ${countOf(req.totalVisits, 'visit')} (the nightly window holds up to ${nightlyCapacity}).`
            : `Too few clear nights for ${countOf(req.totalVisits, 'visit')} even at ${nightlyCapacity} a night: a node with less weather loss, or a brighter comparison setup that needs fewer visits.`,
      });
    }
    suggestions.push({ kind: 'other_node', message: 'Another node of the network may see this target longer in the campaign.' });
  }
  // Each reason and each suggestion once (several checks can arrive at the same sentence).
  const unique = <T>(items: T[], key: (t: T) => string) => items.filter((t, i) => items.findIndex((o) => key(o) === key(t)) === i);
  return {
    plan,
    sky,
    season,
    phase,
    feasible: plan.feasible && sky.fits && season.fitsOneSeason && !phaseBlocks,
    reasons: unique(reasons, (r) => r),
    suggestions: unique(suggestions, (s) => `${s.kind}\n${s.message}`),
  };
}

/**
 * Whether the windows carry the Moon's altitude on every usable night. Windows rebuilt from a
 * sky-window report written before the report carried `moonAltitudeDeg` have NaN there
 * (see planning/sky-report-adapter.ts).
 */
function hasMoonAltitude(windows: TargetWindows): boolean {
  const hours = windows.usableHoursByNight;
  const moonAlt = windows.moonAltitudeDegByNight;
  for (let i = 0; i < hours.length; i++) {
    if (hours[i] > 0 && Number.isNaN(moonAlt[i])) return false;
  }
  return true;
}

/**
 * Sky brightness on the nights the target is observable from the node's site: the
 * Krisciunas & Schaefer (1991) moonlight model on each usable night (sky/moon-sky-brightness.ts),
 * summarised as the median (used for the precision) and the brightest. Undefined (the plan then
 * takes the site's dark sky) when no night is usable, or when the windows do not carry the
 * Moon's altitude (see {@link hasMoonAltitude}).
 */
export function skyConditionsFor(
  windows: TargetWindows,
  node: NodeSpec,
  site: SiteSpec,
  options: TargetPlanOptions = {},
): PlanSkyConditions | undefined {
  if (!hasMoonAltitude(windows)) return undefined;
  const k = options.photometry?.extinctionMagPerAirmass ?? DEFAULT_EXTINCTION_MAG_PER_AIRMASS[node.band];
  const sky = nightlySkyBrightness(windows, site.skyBrightnessMagPerArcsec2, k, { minTargetAltitudeDeg: node.altitudeLimitDeg });
  if (sky.usableNights === 0) return undefined;
  return {
    medianMagPerArcsec2: sky.medianMagPerArcsec2,
    worstMagPerArcsec2: sky.worstMagPerArcsec2,
    usableNights: sky.usableNights,
    source: 'Krisciunas & Schaefer (1991), PASP 103, 1033, on the Moon of each usable night',
  };
}

/**
 * The plan of a target on a node against its sky windows from the node's site: the precision
 * uses the moonlit sky of the nights the target is observable; when a day-locked period needs
 * a longer baseline to cover its phases and the season has room, the plan is recomputed with
 * that baseline; then the season, the phase coverage and the nights that carry the cadence are
 * checked (see combinePlanWithSky).
 */
export function computeNodeTargetPlan(
  target: TargetPlanTarget,
  node: NodeSpec,
  site: SiteSpec,
  windows: TargetWindows,
  options: TargetPlanOptions = {},
): NodeTargetPlan {
  const withSky: TargetPlanOptions = { ...options, sky: options.sky ?? skyConditionsFor(windows, node, site, options) };
  // Why: without the Moon's altitude the plan falls back to the site's dark sky, and its sky
  // rows must not say that no windows were given (they were, from an older report).
  const noMoon = options.sky === undefined && !hasMoonAltitude(windows);
  const planFor = (planOptions: TargetPlanOptions): TargetPlan => {
    const plan = computeTargetPlan(target, node, site, planOptions);
    return noMoon ? withMoonNotCounted(plan) : plan;
  };
  const first = combinePlanWithSky(planFor(withSky), windows, node);
  const need = first.phase.requiredBaselineDays;
  if (
    first.phase.action === 'lengthenBaseline' &&
    first.phase.commensurate !== null &&
    need !== null &&
    need > first.plan.quantities.baselineDays.value &&
    need <= first.season.longestSeasonDays
  ) {
    const longer = combinePlanWithSky(planFor({ ...withSky, minBaselineDays: Math.ceil(need) }), windows, node);
    longer.plan.flags.push({
      code: 'baselineForPhaseCoverage',
      severity: 'info',
      message: `the baseline is lengthened to ${Math.ceil(need)} d so that periods near ${first.phase.commensurate.n === 1 ? '1 d' : `1/${first.phase.commensurate.n} d`} drift through every phase from this site`,
    });
    return longer;
  }
  return first;
}

/**
 * The plan's sky rows when the windows lack the Moon's altitude: the value stays the site's
 * dark sky, and the why line says the Moon could not be counted.
 */
function withMoonNotCounted(plan: TargetPlan): TargetPlan {
  const q = plan.quantities;
  q.skyBrightnessMagPerArcsec2 = {
    ...q.skyBrightnessMagPerArcsec2,
    why: "the site's dark sky: the sky windows do not carry the Moon's altitude, so the Moon could not be counted",
  };
  q.worstSkyBrightnessMagPerArcsec2 = {
    ...q.worstSkyBrightnessMagPerArcsec2,
    why: "the site's dark sky: the Moon could not be counted (the sky windows do not carry its altitude)",
  };
  return plan;
}
