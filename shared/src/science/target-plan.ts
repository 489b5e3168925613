/**
 * The target plan: every requirement of one target on one node — period and its range,
 * amplitude, per-visit precision and exposure, cadence, baseline, visits, node-hours and fee
 * — each number with its unit, a "why" line and the source of its formula.
 *
 * The plan is sized so that the period is recovered with a stated probability (the
 * completeness, default 90 %): the campaign it prescribes, analysed with the product's own
 * periodogram over the search band it states (nightly means, Baluev false-alarm probability
 * at the plan's level), finds the period in that fraction of trials. A simulation checks it
 * (target-plan-recovery.spec.ts).
 *
 * Steps (target-plan-steps.ts; each uses only the steps above it):
 *  1–2. colour de-reddened, τ scale, period and its plausible range (gyrochronology, or the
 *       proposer's period where no relation gives one);
 *  3.   τc, Rossby number and the spot amplitude at the longest plausible period (the smallest
 *       amplitude in the range: sizing for it is conservative), on the amplitude model's scale;
 *  4.   magnitude in the node's band, airmass, sky brightness (the Moon on the nights the sky
 *       windows give, else the site's dark sky), the exposure and exposures per visit;
 *  5.   cadence from the shortest plausible period;
 *  6.   baseline: rotations rule, requested period precision, caller's minimum;
 *  7.   visits for the completeness over nightly means (the systematic floor is correlated
 *       within a night), the price of 50 %, 90 % and 99 %;
 *  8.   node-hours = visits × visit length / (1 − weather loss); fee at the node's rate.
 * The sky check (season, phase coverage, nights that carry the cadence) is in
 * planning/node-target-plan.ts.
 */
import type { NodeBand, NodeSpec, SiteSpec } from '../facility/facility-types';
import { type TargetColourSystem, TARGET_COLOUR_SYSTEMS, colourLabel, DWARF_SEQUENCE_SOURCE, REDDENING_RATIOS } from './colour-sequence';
import {
  COMPLETENESS_LEVELS,
  DETECTION_SOURCE,
  MARCUM_SOURCE,
  NIGHTLY_NOISE_SOURCE,
  PERIOD_PRECISION_SOURCE,
  THRESHOLD_SOURCE,
  type DetectionThreshold,
  detectionThreshold,
  nightlySigmaPpm,
  noncentralityForCompleteness,
  periodPrecision,
} from './detection';
import { type Explained, type ScienceFlag, countOf, explained, flag, fmt } from './explained';
import { type GyroRelationId, GYRO_RELATIONS, GYRO_RELATION_INFO, PROPAGATION_METHOD } from './gyrochronology';
import { BALUEV_SOURCE } from './lomb-scargle/false-alarm';
import { BAND_ZERO_POINTS, EXTINCTION_SOURCE, convertMagnitude } from './photometric-bands';
import { between, displayNumber } from '../http/range-text';
import { ScienceInputError, requireInRange, requireInteger, requireOneOf, requirePositive } from './science-input-error';
import { type AmplitudeModelCoefficients, AMPLITUDE_MODEL_SOURCE, RPER_PER_SEMI_AMPLITUDE, amplitudeExponent } from './spot-amplitude';
import { amplitudeStep, baselineStep, cadenceStep, periodStep, sizeVisits, visitNightCount, type VisitSizing } from './target-plan-steps';
import { type TurnoverScale, TURNOVER_SCALES, TURNOVER_SCALE_INFO } from './turnover-time';
import {
  type ExposureChoice,
  type ExposureLimit,
  type PhotometryOptions,
  type PhotometrySetup,
  type VisitPrecision,
  MAGNITUDE_RANGE,
  MAG_PER_RELATIVE_FLUX,
  airmassKastenYoung,
  chooseExposureFromSetup,
  photometrySetup,
  validateNodeSpec,
  validateSiteSpec,
  visitPrecisionAt,
} from './visit-precision';

/** One target as the plan needs it. */
export interface TargetPlanTarget {
  /** Display name (e.g. "Star A-17"); echoed, never used in the computation. */
  name?: string;
  /** Observed colour index (before de-reddening). */
  colour: { value: number; system: TargetColourSystem };
  /** Interstellar reddening E(B−V), mag (default 0). */
  reddeningEbvMag?: number;
  ageMyr: number;
  /** 1σ age uncertainty, Myr (default 0). */
  ageUncertaintyMyr?: number;
  /** Catalogue magnitude and its band; moved to the node's band with colour terms. */
  magnitude: { value: number; band: NodeBand };
  /** Requested 1σ precision of the measured period, days (optional). */
  periodPrecisionDays?: number;
  /**
   * Expected rotation period supplied by the proposer, days: used instead of the relation's
   * (needed where no relation gives one — fast rotators, colours or ages outside calibration).
   */
  periodDays?: number;
  /** 1σ of the proposer's period, days (default 10 % of it). */
  periodUncertaintyDays?: number;
}

/** Sky brightness over the nights a target is observable from the node's site (from its sky windows). */
export interface PlanSkyConditions {
  /** Median sky brightness in the node's band on the usable nights, Moon included, mag/arcsec². */
  medianMagPerArcsec2: number;
  /** Brightest sky on a usable night, mag/arcsec². */
  worstMagPerArcsec2: number;
  usableNights: number;
  /** Model behind the numbers (e.g. Krisciunas & Schaefer 1991). */
  source: string;
}

/** Choices of the plan; every field has a documented default. */
export interface TargetPlanOptions {
  /** Gyrochronology relation. Default: Angus et al. (2019) for BP−RP colours, Barnes (2007) for B−V. */
  relation?: GyroRelationId;
  /**
   * τ scale of the Rossby number. Default: Noyes (1984) for F–K dwarfs, Wright et al. (2018)
   * for M dwarfs (better calibrated there). The amplitude model reads Ro/Ro☉ on the scale in
   * use, so the amplitude does not depend on the choice.
   */
  turnoverScale?: TurnoverScale;
  /** False-alarm probability at which a peak counts as detected (default 0.01). */
  falseAlarmProbability?: number;
  /** Probability that the plan recovers the period, 0.5–0.99 (default 0.9). */
  completeness?: number;
  /** Samples per cycle of the shortest plausible period (default 10; SCIENCE.md §6: 8–10). */
  samplesPerCycle?: number;
  /** Cycles of the longest plausible period the baseline covers (default 3; SCIENCE.md §6). */
  baselineCycles?: number;
  /** Shortest baseline, days (e.g. to reach a beat period; default none). */
  minBaselineDays?: number;
  /** Longest baseline the visit sizing may stretch to when the floor limits a night, days (default 180). */
  maxBaselineDays?: number;
  /** Width of the plausible period range in σ (default 1). */
  periodRangeSigma?: number;
  amplitudeModel?: Partial<AmplitudeModelCoefficients>;
  /** Per-visit precision goal, ppm; default: the σ at which the cadence's visits just reach the completeness. */
  perVisitPrecisionPpm?: number;
  /**
   * Fixed exposure time, seconds, within the node's [minExposureSeconds, maxExposureSeconds].
   * Default: chosen by the plan (the shortest exposure reaching the precision goal without
   * saturating). A fixed exposure that saturates gives a blocking flag; the numbers stay finite.
   */
  exposureSeconds?: number;
  /**
   * Exposures stacked in one visit (whole, ≥ 1). Default: 1 unless the single exposure is
   * capped by saturation or the node's longest exposure and misses the precision goal; then
   * as many as reach it, within `maxVisitSeconds`.
   */
  exposuresPerVisit?: number;
  /** Dead time between stacked exposures (readout), s (default 5; common practice, no source). */
  readoutSeconds?: number;
  /** Longest visit when exposures are stacked, s, overhead included (default 600; Spincycle's choice). */
  maxVisitSeconds?: number;
  /** Altitude at which the precision is computed, degrees; default max(45°, node altitude limit). */
  planningAltitudeDeg?: number;
  /** Hours per night a target is typically observable (default 6), for the fit check of the nightly visits. */
  observableHoursPerNight?: number;
  /** Periods below this need several visits per night (default 2 d; SCIENCE.md §6). */
  aliasPeriodDays?: number;
  /** Visits per night under `aliasPeriodDays` (default 3). */
  minVisitsPerNightShortPeriod?: number;
  /** The search covers periods down to this fraction of the shortest plausible period (default 0.5: the P/2 harmonic of two spot groups). */
  searchPeriodFraction?: number;
  /** The search covers periods up to this multiple of the longest plausible period, at most the baseline (default 2). */
  searchLongPeriodFactor?: number;
  /** Baselines longer than this many cycles of the nominal period get a spot-coherence caution (default 10). */
  coherenceCycles?: number;
  weakenedBrakingRossby?: number;
  /** Sky brightness on the nights the target is observable (from the sky windows); default: the site's dark sky. */
  sky?: PlanSkyConditions;
  photometry?: PhotometryOptions;
}

/** Every number of the plan, explained. */
export interface TargetPlanQuantities {
  intrinsicColourMag: Explained;
  relationColourMag: Explained;
  periodDays: Explained;
  shortestPeriodDays: Explained;
  longestPeriodDays: Explained;
  turnoverTimeDays: Explained;
  rossbyNumber: Explained;
  rossbyNumberAtLongestPeriod: Explained;
  amplitudeRperPpm: Explained;
  semiAmplitudePpm: Explained;
  magnitudeInNodeBand: Explained;
  airmass: Explained;
  skyBrightnessMagPerArcsec2: Explained;
  worstSkyBrightnessMagPerArcsec2: Explained;
  starPhotonRatePerSecond: Explained;
  saturationLimitSeconds: Explained;
  perVisitPrecisionGoalPpm: Explained;
  exposureSeconds: Explained;
  exposuresPerVisit: Explained;
  perVisitPrecisionPpm: Explained;
  perVisitPrecisionMmag: Explained;
  nightlyPrecisionPpm: Explained;
  sampleIntervalDays: Explained;
  nightStepDays: Explained;
  visitsPerNight: Explained;
  baselineForCyclesDays: Explained;
  baselineForPrecisionDays: Explained<number | null>;
  baselineDays: Explained;
  visitNights: Explained;
  searchMinFrequencyPerDay: Explained;
  searchMaxFrequencyPerDay: Explained;
  independentFrequencies: Explained;
  detectionThresholdPower: Explained;
  requestedCompleteness: Explained;
  completeness: Explained;
  visitsForCadence: Explained;
  /** Null when no campaign the node allows reaches that completeness. */
  visitsForCompleteness50: Explained<number | null>;
  visitsForCompleteness90: Explained<number | null>;
  visitsForCompleteness99: Explained<number | null>;
  visits: Explained;
  expectedPeriodPrecisionDays: Explained;
  visitSeconds: Explained;
  nodeHoursClear: Explained;
  nodeHours: Explained;
  feeMinor: Explained;
}

/** How the plan's campaign is to be analysed: the same band and false-alarm level it was sized with. */
export interface PlanAnalysis {
  /** Periodogram of nightly means (several visits of a night averaged) or of single visits. */
  series: 'nightlyMeans' | 'visits';
  minFrequencyPerDay: number;
  maxFrequencyPerDay: number;
  falseAlarmProbability: number;
}

export interface TargetPlan {
  targetName: string | null;
  relation: GyroRelationId;
  relationLabel: string;
  turnoverScale: TurnoverScale;
  turnoverScaleLabel: string;
  nodeBand: NodeBand;
  currency: string;
  /** False when a blocking flag is present (e.g. the star saturates at the shortest exposure). */
  feasible: boolean;
  quantities: TargetPlanQuantities;
  /** Noise terms of one exposure at the chosen exposure time (a visit may stack several: see exposuresPerVisit). */
  precision: VisitPrecision;
  analysis: PlanAnalysis;
  flags: ScienceFlag[];
}

/**
 * Version of the plan model: raise it whenever a change makes the same inputs give different
 * numbers, so that stored plans (the server keeps them per proposal) are marked out of date.
 * 2: exposures stacked per visit; 3: suggestions name what is possible (exposure, other node);
 * 4: sized for completeness over nightly means, Baluev threshold, intrinsic scatter, amplitude
 * on any τ scale, moonlit sky, season and phase coverage, Osborn scintillation by default.
 */
export const TARGET_PLAN_MODEL_VERSION = 5;

export const PLAN_DEFAULTS = {
  falseAlarmProbability: 0.01,
  completeness: 0.9,
  samplesPerCycle: 10,
  baselineCycles: 3,
  maxBaselineDays: 180,
  periodRangeSigma: 1,
  observableHoursPerNight: 6,
  aliasPeriodDays: 2,
  minVisitsPerNightShortPeriod: 3,
  searchPeriodFraction: 0.5,
  searchLongPeriodFactor: 2,
  coherenceCycles: 10,
  planningAltitudeDeg: 45,
  readoutSeconds: 5,
  maxVisitSeconds: 600,
} as const;

// Provenance said the way a scientist reads it. The tags keep the maintainers' trust levels:
// these were `practice` ("common practice, no single source") and `choice` ("Spincycle's
// choice, no source") notes, now pointing to the Methods section that states the rule.
/** The search band of the plan: an assumption of this product (docs/science.md #search-band). */
const SEARCH_BAND_ASSUMPTION = 'an assumption of this product (see Methods: The searched band)';
/** Samples per cycle and the night step (docs/science.md #cadence). */
const CADENCE_PRACTICE = 'standard observing practice (see Methods: Cadence)';
/** Cycles of the longest period and whole-day baselines (docs/science.md #baseline). */
const BASELINE_PRACTICE = 'standard observing practice (see Methods: Baseline)';
/** The caution on one star filling the node's nights (docs/science.md #visits). */
const NIGHTS_FILLED_ASSUMPTION = 'an assumption of this product (see Methods: Visits for 50, 90 and 99 % completeness)';
/** Spots evolve over about ten rotations (docs/science.md #assumptions, #red-noise). */
const COHERENCE_ASSUMPTION = 'an assumption of this product (see Methods: Assumptions of this product)';
/** What limited the exposure, in words (the codes are `ExposureChoice.limitedBy`). */
const LIMIT_WORDS: Readonly<Record<ExposureLimit, string>> = {
  targetPrecision: 'the precision goal',
  minExposure: "the node's shortest exposure",
  maxExposure: "the node's longest exposure",
  saturation: 'saturation of the star',
};
/** Source of the saturation flags. */
const SATURATION_SOURCE = "peak pixel of a Gaussian star image against the node's saturation level";

/** "every night", "every 2nd night", "every 3rd night", "every 11th night". */
function nightStepText(step: number): string {
  if (step === 1) return 'every night';
  const tens = step % 100;
  const suffix = tens >= 11 && tens <= 13 ? 'th' : (({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[step % 10] ?? 'th');
  return `every ${step}${suffix} night`;
}

/** Billing granularity of node-hours (Spincycle's choice). */
const HOURS_STEP = 0.01;
/** Share of a night's observable hours above which one target's visits earn a caution (this product's choice). */
const NIGHT_SHARE_CAUTION = 0.5;

/** Default relation for a colour system (documented in {@link TargetPlanOptions.relation}). */
export function defaultRelationFor(system: TargetColourSystem): GyroRelationId {
  return system === 'BPRP' ? 'angus2019' : 'barnes2007';
}

/**
 * Computes the plan of one target on one node. Throws {@link ScienceInputError} naming the
 * field (`target.ageMyr`, `node.apertureM`, `options.samplesPerCycle`...) for bad input;
 * never returns NaN.
 */
export function computeTargetPlan(target: TargetPlanTarget, node: NodeSpec, site: SiteSpec, options: TargetPlanOptions = {}): TargetPlan {
  if (typeof target !== 'object' || target === null) throw new ScienceInputError('target', 'is missing');
  validateNodeSpec(node);
  validateSiteSpec(site);
  const system = prefixed('target', () => requireOneOf(target.colour?.system, 'colour.system', TARGET_COLOUR_SYSTEMS));
  const o = resolveOptions(options, system, node);
  const flags: ScienceFlag[] = [];
  if (target.periodDays !== undefined) prefixed('target', () => requireInRange(target.periodDays, 'periodDays', 0.05, 1000));
  if (target.periodUncertaintyDays !== undefined)
    prefixed('target', () => requireInRange(target.periodUncertaintyDays, 'periodUncertaintyDays', 0, 1000));
  if (target.periodPrecisionDays !== undefined)
    prefixed('target', () => requirePositive(target.periodPrecisionDays, 'periodPrecisionDays'));

  // 1–2. Colour, τ scale, period and its plausible range.
  const period = prefixed('target', () =>
    periodStep({
      relation: o.relation,
      colour: target.colour,
      reddeningEbvMag: target.reddeningEbvMag,
      ageMyr: target.ageMyr,
      ageUncertaintyMyr: target.ageUncertaintyMyr,
      rangeSigma: o.periodRangeSigma,
      turnoverScale: o.turnoverScale,
      weakenedBrakingRossby: o.weakenedBrakingRossby,
      explicitPeriodDays: target.periodDays,
      explicitPeriodUncertaintyDays: target.periodUncertaintyDays,
    }),
  );
  for (const f of period.flags) {
    if (f.code === 'noExpectedPeriod' && f.severity === 'blocking') {
      flags.push(
        flag('noExpectedPeriod', 'blocking', `${f.message.replace(/\.$/, '')}: give the star's expected period to plan it`, f.source),
      );
    } else flags.push(f);
  }
  const prediction = period.prediction;
  const relInfo = GYRO_RELATION_INFO[o.relation];
  const P = period.periodDays;
  const pMin = period.shortestPeriodDays;
  const pMax = period.longestPeriodDays;
  const colour = period.colour;

  // 3. τc, Ro, amplitude.
  const amp = prefixed('target', () => amplitudeStep(period, o.amplitudeModel));
  const tau = amp.tau;
  const tauInfo = TURNOVER_SCALE_INFO[period.turnoverScale];
  const model = amp.model;
  const semiAmplitudePpm = amp.semiAmplitudePpm;

  // 4. Magnitude in the node's band, airmass, sky, exposure.
  const mag = prefixed('target', () => convertMagnitude(target.magnitude, node.band, colour));
  if (mag.magnitude < MAGNITUDE_RANGE.min || mag.magnitude > MAGNITUDE_RANGE.max) {
    // Checked in the node's band, but said with the magnitude as typed (never the converted one alone).
    const range = between(MAGNITUDE_RANGE.min, MAGNITUDE_RANGE.max, 'mag');
    throw new ScienceInputError(
      'target.magnitude',
      mag.fromBand === mag.band
        ? `${mag.band} ${displayNumber(mag.fromMagnitude)} is outside what the noise model covers (${range})`
        : `${mag.fromBand} ${displayNumber(mag.fromMagnitude)} is ${displayNumber(Math.round(mag.magnitude * 100) / 100)} in the node's ${mag.band} band, outside what the noise model covers (${range} in ${mag.band})`,
    );
  }
  const airmass = airmassKastenYoung(o.planningAltitudeDeg);
  const skyMag = o.sky ? o.sky.medianMagPerArcsec2 : site.skyBrightnessMagPerArcsec2;
  const setup = prefixed('target', () =>
    photometrySetup(node, { ...site, skyBrightnessMagPerArcsec2: skyMag }, mag.magnitude, airmass, o.photometry),
  );

  // 5. Cadence from the shortest plausible period.
  const cad = cadenceStep(pMin, o.samplesPerCycle, o.aliasPeriodDays, o.minVisitsPerNightShortPeriod);
  const fmax = 1 / (o.searchPeriodFraction * pMin);

  // 4b. Precision goal: the per-visit σ at which the cadence's own nights reach the completeness.
  const floorPpm = visitPrecisionAt(setup, node.minExposureSeconds).components.floorPpm;
  const cyclesBaseline = Math.max(Math.ceil(o.baselineCycles * pMax - 1e-9), o.minBaselineDays ?? 0);
  const series: 'nightlyMeans' | 'visits' = pMin < o.aliasPeriodDays ? 'visits' : 'nightlyMeans';
  const nCad0 = visitNightCount(cyclesBaseline, cad.nightStepDays);
  const goalPoints = series === 'nightlyMeans' ? nCad0 : nCad0 * cad.visitsPerNight;
  // Thresholds of this plan's search, shared by the goal and every sizing (key points·4096 + T).
  const thresholdCache = new Map<number, DetectionThreshold>();
  const goalThreshold = detectionThreshold(goalPoints, cyclesBaseline, fmax, o.falseAlarmProbability);
  thresholdCache.set(goalPoints * 4096 + cyclesBaseline, goalThreshold);
  const goalLambda = noncentralityForCompleteness(o.completeness, goalThreshold);
  const seriesNeeded2 = Number.isFinite(goalLambda) ? (goalPoints * semiAmplitudePpm ** 2) / (2 * goalLambda) : 0;
  // Nightly means: σ_night² = σ_white²/k + floor²; single visits: σ² = σ_white² + floor².
  const whiteNeeded2 = series === 'nightlyMeans' ? cad.visitsPerNight * (seriesNeeded2 - floorPpm ** 2) : seriesNeeded2 - floorPpm ** 2;
  const goalPpm = o.perVisitPrecisionPpm ?? (whiteNeeded2 > 0 ? Math.sqrt(whiteNeeded2 + floorPpm ** 2) : floorPpm * 1.001);
  const goalWhy =
    o.perVisitPrecisionPpm !== undefined
      ? 'requested per-visit precision'
      : whiteNeeded2 > 0
        ? `the σ at which the cadence's ${cad.visitsPerNight} visit(s) on ${nCad0} nights reach ${fmt(o.completeness * 100)} % completeness`
        : `the cadence's ${nCad0} nights cannot reach the completeness above the floor of ${fmt(floorPpm)} ppm: as precise as the node allows`;
  const automatic = chooseExposureFromSetup(setup, node, goalPpm);
  const exposure = o.exposureSeconds === undefined ? automatic : fixedExposure(setup, automatic, o.exposureSeconds, goalPpm);
  const stack = exposuresPerVisitStep(exposure, node, o, goalPpm);
  const sigmaPpm = stack.sigmaPpm;
  const whitePpm = Math.sqrt(Math.max(0, sigmaPpm ** 2 - floorPpm ** 2));
  const reachesGoal = sigmaPpm <= goalPpm * (1 + 1e-9);
  flags.push(...exposureFlags(exposure, automatic, node, o, goalPpm, sigmaPpm, reachesGoal));

  // 6. Baseline: rotations rule, period precision, caller's minimum.
  const bl = prefixed('target', () =>
    baselineStep({
      longestPeriodDays: pMax,
      baselineCycles: o.baselineCycles,
      periodPrecisionDays: target.periodPrecisionDays,
      semiAmplitudePpm,
      nightlySigmaPpm: nightlySigmaPpm(whitePpm, floorPpm, cad.visitsPerNight),
      nightStepDays: cad.nightStepDays,
      minBaselineDays: o.minBaselineDays,
    }),
  );

  // 7. Visits for the completeness over nightly means; the price of other completeness levels.
  const visitSeconds =
    stack.exposuresPerVisit * exposure.exposureSeconds + (stack.exposuresPerVisit - 1) * o.readoutSeconds + node.overheadSeconds;
  const maxVisitsPerNight = Math.max(1, Math.floor((o.observableHoursPerNight * 3600) / visitSeconds));
  const detectionCache = new Map<number, number>();
  const sizingFor = (completeness: number, detail = false): VisitSizing =>
    sizeVisits({
      detail,
      thresholdCache,
      detectionCache,
      semiAmplitudePpm,
      whitePpm,
      floorPpm,
      completeness,
      falseAlarmProbability: o.falseAlarmProbability,
      maxFrequencyPerDay: fmax,
      series,
      baselineDays: bl.baselineDays,
      visitsPerNight: cad.visitsPerNight,
      nightStepDays: cad.nightStepDays,
      maxVisitsPerNight,
      maxBaselineDays: Math.max(o.maxBaselineDays, bl.baselineDays),
    });
  const sz = sizingFor(o.completeness, true);
  // A level the cadence already delivers costs the cadence's visits; a level above one that
  // nothing reaches is out of reach too (same longest campaign).
  const atLevel = (c: number) =>
    Math.abs(c - o.completeness) < 1e-12 ||
    (sz.drivenBy === 'cadence' && sz.completeness >= c) ||
    (sz.drivenBy === 'unreachable' && c > o.completeness)
      ? sz
      : sizingFor(c);
  const levels = COMPLETENESS_LEVELS.map(atLevel);

  const baseline = sz.baselineDays;
  const visitsPerNight = sz.visitsPerNight;
  const nightStep = sz.nightStepDays;
  const visits = sz.visits;
  const nCad = cad.visitsPerNight * visitNightCount(baseline, cad.nightStepDays);
  if (cad.visitsPerNight * visitSeconds > o.observableHoursPerNight * 3600) {
    flags.push(
      flag(
        'nightlyVisitsDoNotFit',
        'blocking',
        `${cad.visitsPerNight} visits of ${fmt(visitSeconds)} s do not fit in ${o.observableHoursPerNight} observable hours per night`,
      ),
    );
  }
  if (sz.drivenBy === 'unreachable') {
    flags.push(
      flag(
        'amplitudeBelowFloor',
        'blocking',
        `the expected semi-amplitude of ${fmt(semiAmplitudePpm)} ppm is below the ${fmt(sz.amplitudeLimitPpm)} ppm that even ${sz.mostVisitsPerNight} visits a night on all ${countOf(visitNightCount(sz.longestBaselineDays, 1), 'night')} of ${sz.longestBaselineDays} d detect with ${fmt(o.completeness * 100)} % completeness; the node's systematic floor of ${fmt(floorPpm)} ppm does not average down within a night, so no number of visits a night goes below ${fmt(sz.floorAmplitudeLimitPpm)} ppm. The cadence's own ${countOf(visits, 'visit')} give ${fmt(sz.completeness * 100, 2)} % completeness`,
        NIGHTLY_NOISE_SOURCE,
      ),
    );
  } else if (sz.drivenBy !== 'cadence') {
    flags.push(
      flag(
        'detectionDrivesVisits',
        'info',
        sz.drivenBy === 'baseline'
          ? `${fmt(o.completeness * 100)} % completeness needs more nights than the cadence's baseline: the baseline grows to ${baseline} d, since the floor correlated within a night limits what more visits a night give`
          : `${fmt(o.completeness * 100)} % completeness needs more visits than the cadence: ${visitsPerNight} a night on ${countOf(sz.nights, 'night')}`,
        DETECTION_SOURCE,
      ),
    );
  }
  if (baseline > o.coherenceCycles * P) {
    flags.push(
      flag(
        'baselineBeyondSpotCoherence',
        'caution',
        `the baseline spans ${fmt(baseline / P)} rotations: spots evolve, so the signal may lose coherence over it`,
        COHERENCE_ASSUMPTION,
      ),
    );
  }
  const longestSearched = Math.min(baseline, o.searchLongPeriodFactor * pMax);
  const fmin = 1 / longestSearched;
  const expectedSigmaP = periodPrecision({
    visits: series === 'nightlyMeans' ? sz.nights : sz.visits,
    sigmaPpm: sz.seriesSigmaPpm,
    semiAmplitudePpm,
    baselineDays: baseline,
    periodDays: pMax,
  });

  const pct = (c: number) => `${fmt(c * 100)} %`;
  // 8. Hours and fee.
  const hoursClear = (visits * visitSeconds) / 3600;
  const hoursOf = (v: number) => Math.ceil((v * visitSeconds) / 3600 / (1 - node.weatherLossFraction) / HOURS_STEP - 1e-9) * HOURS_STEP;
  const hours = hoursOf(visits);
  const fee = Math.round(hours * node.rateMinorPerHour);

  // 9. Campaigns that reach the goal only at a price the proposer must see: more visits a
  // night than the floor lets count, or most of every visit night spent on this one star.
  if (sz.drivenBy !== 'unreachable') {
    const nightHours = (visitsPerNight * visitSeconds) / 3600;
    const cheaper =
      (bl.setBy === 'precision'
        ? `; a looser period precision (the requested ${fmt(target.periodPrecisionDays ?? Number.NaN)} d sets the baseline to ${bl.baselineDays} d)`
        : '') +
      (levels[0].drivenBy !== 'unreachable' && levels[0].visits < visits
        ? `; 50 % completeness needs ${countOf(levels[0].visits, 'visit')} (${fmt(hoursOf(levels[0].visits))} node-hours)`
        : '');
    if (visitsPerNight > sz.usefulVisitsPerNight) {
      flags.push(
        flag(
          'visitsBeyondFloor',
          'caution',
          `${pct(o.completeness)} completeness takes ${visitsPerNight} visits a night on ${countOf(sz.nights, 'night')} (${fmt(hours)} node-hours), although beyond ${sz.usefulVisitsPerNight} a night the node's systematic floor of ${fmt(floorPpm)} ppm sets each night's noise and more visits add little. Cheaper ways out: a node with a lower floor or a larger aperture${cheaper}`,
          NIGHTLY_NOISE_SOURCE,
        ),
      );
    }
    if (nightHours > NIGHT_SHARE_CAUTION * o.observableHoursPerNight) {
      flags.push(
        flag(
          'nightsFilled',
          'caution',
          `the visits fill ${fmt(nightHours, 2)} h of the ${o.observableHoursPerNight} observable hours on each of ${countOf(sz.nights, 'night')}: this one star would hold the node for most of its nights. Cheaper ways out: fewer samples per rotation or a node with a lower floor${cheaper}`,
          NIGHTS_FILLED_ASSUMPTION,
        ),
      );
    }
  }

  const cl = colourLabel(colour.intrinsic.system);
  const rl = colourLabel(prediction.relationColour.system);
  const bandZp = BAND_ZERO_POINTS[node.band];
  const levelWhy = (c: number, s: VisitSizing) =>
    s.drivenBy === 'unreachable'
      ? `${pct(c)} completeness is out of reach: the floor limits it even at ${s.mostVisitsPerNight} visits a night on every night of ${s.longestBaselineDays} d`
      : `${pct(c)} completeness: ${countOf(s.visitsPerNight, 'visit')} a night on ${countOf(s.nights, 'night')} over ${s.baselineDays} d`;
  const periodWhy = period.explicit
    ? `your input (${relInfo.label} gives ${period.noExpectedPeriod === null && !prediction.noResult ? `${fmt(prediction.periodDays)} d` : 'none'})`
    : `${relInfo.label} at ${rl} ${fmt(prediction.relationColour.value)} and ${fmt(prediction.ageMyr)} Myr`;
  const q: TargetPlanQuantities = {
    intrinsicColourMag: explained(
      colour.intrinsic.value,
      'mag',
      colour.reddeningEbvMag > 0
        ? `${cl} ${fmt(colour.observed.value)} de-reddened by E(B−V) = ${colour.reddeningEbvMag}`
        : `${cl} as given (no reddening)`,
      colour.reddeningEbvMag > 0 ? REDDENING_RATIOS[colour.intrinsic.system].source : 'your input',
      colour.reddeningEbvMag > 0 ? 'memory' : 'paper',
    ),
    relationColourMag: explained(
      prediction.relationColour.value,
      'mag',
      `${rl} taken by ${relInfo.label}: ${prediction.relationColour.origin}`,
      prediction.relationColour.system === colour.intrinsic.system ? 'your input' : DWARF_SEQUENCE_SOURCE,
      'paper',
    ),
    periodDays: explained(P, 'd', periodWhy, period.explicit ? 'your input' : relInfo.citation, period.explicit ? 'choice' : 'paper'),
    shortestPeriodDays: explained(
      pMin,
      'd',
      period.explicit
        ? `−${o.periodRangeSigma}σ of your period`
        : `−${o.periodRangeSigma}σ of the period from the age uncertainty (${fmt(prediction.ageUncertaintyMyr)} Myr), the relation's coefficients and its intrinsic scatter`,
      PROPAGATION_METHOD,
      'choice',
    ),
    longestPeriodDays: explained(pMax, 'd', `+${o.periodRangeSigma}σ of the period (same propagation)`, PROPAGATION_METHOD, 'choice'),
    turnoverTimeDays: explained(
      tau.tauDays,
      'd',
      `${tauInfo.label} τc at ${inputName(tau.inputQuantity)} ${fmt(tau.inputValue)} (${tau.inputOrigin}); scale: ${period.turnoverScaleWhy}`,
      tauInfo.citation,
      'paper',
    ),
    rossbyNumber: explained(amp.rossby, '1', `P/τc on the ${tauInfo.label} scale`, `Ro = P/τc; τc: ${tauInfo.citation}`, 'derived'),
    rossbyNumberAtLongestPeriod: explained(
      amp.rossbyAtLongestPeriod,
      '1',
      `longest plausible period over τc (${tauInfo.label} scale): sets the smallest amplitude`,
      `Ro = P/τc; τc: ${tauInfo.citation}`,
      'derived',
    ),
    amplitudeRperPpm: explained(
      amp.used.rperPpm,
      'ppm',
      (amp.used.regime === 'saturated'
        ? `saturated (Ro ${fmt(amp.anchorRossby)} ≤ ${model.saturationRossby} on the anchors' scale)`
        : `${fmt(model.anchorRperPpm)} ppm·(Ro/${model.anchorRossby})^−${fmt(amplitudeExponent(model), 4)} at the longest plausible period (Ro ${fmt(amp.anchorRossby)} on the anchors' Noyes scale); ${fmt(amp.nominal.rperPpm)} ppm at the nominal period`) +
        (period.turnoverScale === 'noyes1984' ? '' : ` — Ro moved from the ${tauInfo.label} scale as Ro/Ro☉ on that scale`),
      AMPLITUDE_MODEL_SOURCE,
      'derived',
    ),
    semiAmplitudePpm: explained(
      semiAmplitudePpm,
      'ppm',
      `Rₚₑᵣ/${fmt(RPER_PER_SEMI_AMPLITUDE, 4)} (the 5–95 % range of a sinusoid of semi-amplitude A is 2·sin(0.45π)·A)`,
      // Tag `derived`: computed here from the definition of Rₚₑᵣ.
      'follows from the definitions (see Methods: Spot amplitude)',
      'derived',
    ),
    magnitudeInNodeBand: explained(
      mag.magnitude,
      'mag',
      mag.fromBand === mag.band
        ? `catalogue ${mag.band} magnitude`
        : `${mag.fromBand} ${fmt(target.magnitude.value)} moved to ${mag.band} by ${fmt(mag.offsetMag)} mag (observed B−V ${fmt(mag.observedBvMag ?? 0)}, BP−RP ${fmt(mag.observedBpRpMag ?? 0)})`,
      mag.source,
      mag.fromBand === mag.band ? 'paper' : 'memory',
    ),
    airmass: explained(
      airmass,
      '1',
      `planning altitude ${fmt(o.planningAltitudeDeg)}° (sky windows give the real range)`,
      'Kasten & Young (1989), Appl. Opt. 28, 4735, eq. 3',
      'paper',
    ),
    skyBrightnessMagPerArcsec2: o.sky
      ? explained(
          o.sky.medianMagPerArcsec2,
          'mag/arcsec²',
          `median sky with the Moon over the ${o.sky.usableNights} nights the target is observable (site's dark sky ${fmt(site.skyBrightnessMagPerArcsec2)})`,
          o.sky.source,
          'memory',
        )
      : explained(
          site.skyBrightnessMagPerArcsec2,
          'mag/arcsec²',
          "the site's dark sky: no sky windows given, so the Moon is not counted",
          "the site's own value",
          'facility',
        ),
    worstSkyBrightnessMagPerArcsec2: o.sky
      ? explained(
          o.sky.worstMagPerArcsec2,
          'mag/arcsec²',
          'brightest sky on a night the target is observable (a visit then is noisier than planned)',
          o.sky.source,
          'memory',
        )
      : explained(
          site.skyBrightnessMagPerArcsec2,
          'mag/arcsec²',
          "the site's dark sky: no sky windows given",
          "the site's own value",
          'facility',
        ),
    starPhotonRatePerSecond: explained(
      setup.starRateE,
      'e⁻/s',
      `${fmt(bandZp.photonsPerSecondPerM2)} photons s⁻¹ m⁻² at ${node.band} = 0, × 10^(−0.4·(${fmt(mag.magnitude)} + ${fmt(setup.extinctionMag)} extinction)) × ${fmt(setup.effectiveAreaM2)} m² × throughput ${node.throughput}`,
      `${bandZp.source}; ${EXTINCTION_SOURCE}`,
      'memory',
    ),
    saturationLimitSeconds: explained(
      exposure.saturationLimitSeconds,
      's',
      `peak pixel (${fmt(setup.peakPixelFraction * 100)} % of a ${node.seeingFwhmArcsec}″ Gaussian PSF on ${node.pixelScaleArcsec}″ pixels, plus sky and dark) reaches ${node.saturationE} e⁻`,
      // `practice`: the Gaussian peak-pixel fraction is common practice with no single source.
      "peak pixel of a Gaussian star image, [erf(p/(2√2σ))]², against the node's saturation level (standard observing practice; see Methods: Exposure, saturation and stacking)",
      'practice',
    ),
    perVisitPrecisionGoalPpm: explained(
      goalPpm,
      'ppm',
      goalWhy,
      DETECTION_SOURCE,
      o.perVisitPrecisionPpm !== undefined ? 'choice' : 'derived',
    ),
    exposureSeconds:
      o.exposureSeconds !== undefined
        ? explained(
            exposure.exposureSeconds,
            's',
            `your input (the node allows ${node.minExposureSeconds}–${node.maxExposureSeconds} s); the automatic choice would be ${fmt(automatic.exposureSeconds)} s`,
            "your input, within the node's exposure range",
            'choice',
          )
        : explained(
            exposure.exposureSeconds,
            's',
            exposure.limitedBy === 'targetPrecision'
              ? 'shortest exposure reaching the precision goal'
              : exposure.limitedBy === 'minExposure'
                ? "the node's shortest exposure: the goal is reached already"
                : `limited by ${LIMIT_WORDS[exposure.limitedBy]}`,
            // Howell (2006) and Merline & Howell (1995) from memory (docs/science.md "Checked values").
            'CCD equation, Howell (2006), Handbook of CCD Astronomy, and Merline & Howell (1995), Exp. Astron. 6, 163, with scintillation and the floor, solved for the exposure time',
            'memory',
          ),
    exposuresPerVisit: explained(
      stack.exposuresPerVisit,
      '1',
      stack.why,
      // `practice`: stacking with a floor that does not average down is common practice, no single source.
      o.exposuresPerVisit !== undefined
        ? 'your input'
        : 'σ_visit² = (σ₁² − floor²)/k + floor²: standard observing practice (see Methods: Exposure, saturation and stacking)',
      o.exposuresPerVisit !== undefined ? 'choice' : 'practice',
    ),
    perVisitPrecisionPpm: explained(
      sigmaPpm,
      'ppm',
      `${stack.exposuresPerVisit > 1 ? `${stack.exposuresPerVisit} exposures of ` : ''}photon ${fmt(exposure.precision.components.photonPpm)}, sky ${fmt(exposure.precision.components.skyPpm)}, read ${fmt(exposure.precision.components.readPpm)}, scintillation ${fmt(exposure.precision.components.scintillationPpm)} (${node.scintillationModel === 'young1967' ? 'Young 1967, uncorrected' : 'Osborn et al. 2015'}), floor ${fmt(floorPpm)} ppm in quadrature`,
      // Howell (2006) from memory (docs/science.md "Checked values").
      'CCD equation, Howell (2006), Handbook of CCD Astronomy; ' +
        (node.scintillationModel === 'young1967'
          ? 'Young (1967), AJ 72, 747, in its usual restatement'
          : 'Osborn et al. (2015), MNRAS 452, 1707, eq. 7'),
      'memory',
    ),
    perVisitPrecisionMmag: explained(
      MAG_PER_RELATIVE_FLUX * sigmaPpm * 1e-3,
      'mmag',
      `σ(mag) = ${fmt(MAG_PER_RELATIVE_FLUX, 5)}·σ(flux)/flux`,
      '2.5/ln 10: the derivative of the magnitude scale (exact)',
      'derived',
    ),
    nightlyPrecisionPpm: explained(
      nightlySigmaPpm(whitePpm, floorPpm, visitsPerNight),
      'ppm',
      `mean of ${countOf(visitsPerNight, 'visit')}: sqrt(${fmt(whitePpm)}²/${visitsPerNight} + ${fmt(floorPpm)}²) — the floor does not average down within a night${series === 'visits' ? '; short periods are analysed on single visits' : ''}`,
      NIGHTLY_NOISE_SOURCE,
      'practice',
    ),
    // One cadence story in the same words: the sample interval the period needs, the night
    // step that keeps it, and the visits a night (the cadence's, or more for the completeness).
    sampleIntervalDays: explained(
      cad.sampleIntervalDays,
      'd',
      `the period needs a sample at least every ${fmt(cad.sampleIntervalDays)} d (${cad.samplesPerCycle} per rotation of the shortest plausible period, ${fmt(pMin)} d)`,
      CADENCE_PRACTICE,
      'practice',
    ),
    nightStepDays: explained(
      nightStep,
      'd',
      nightStep < cad.nightStepDays
        ? `every night: the cadence needs ${nightStepText(cad.nightStepDays)}, ${pct(o.completeness)} completeness needs every night`
        : cad.sampleIntervalDays >= 1
          ? `${nightStepText(nightStep)}: a sample at least every ${fmt(cad.sampleIntervalDays)} d, in whole nights`
          : `every night: a sample at least every ${fmt(cad.sampleIntervalDays)} d needs several a night`,
      CADENCE_PRACTICE,
      'practice',
    ),
    visitsPerNight: explained(
      visitsPerNight,
      '1',
      visitsPerNight > cad.visitsPerNight
        ? `${visitsPerNight} a night: the cadence needs ${cad.visitsPerNight}, ${pct(o.completeness)} completeness needs ${visitsPerNight}`
        : `${visitsPerNight} a night: ${cad.why}`,
      CADENCE_PRACTICE,
      'practice',
    ),
    baselineForCyclesDays: explained(
      bl.forCyclesDays,
      'd',
      `${o.baselineCycles} rotations of the longest plausible period ${fmt(pMax)} d`,
      BASELINE_PRACTICE,
      'practice',
    ),
    baselineForPrecisionDays: explained(
      bl.forPrecisionDays,
      'd',
      target.periodPrecisionDays === undefined
        ? 'no period precision requested'
        : `σP = ${target.periodPrecisionDays} d at the longest plausible period: T = P²·sqrt(6/n)·σ_night/(π·A·σP), nights n growing with T`,
      PERIOD_PRECISION_SOURCE,
      'memory',
    ),
    baselineDays: explained(
      baseline,
      'd',
      sz.drivenBy === 'baseline' || sz.drivenBy === 'unreachable'
        ? `stretched for ${pct(o.completeness)} completeness: more nights, since the floor limits each night (whole days)`
        : bl.setBy === 'precision'
          ? 'set by the requested period precision (whole days)'
          : bl.setBy === 'minimum'
            ? 'set by the minimum baseline asked for (whole days)'
            : `set to cover ${o.baselineCycles} rotations of the longest plausible period (whole days)`,
      BASELINE_PRACTICE,
      'practice',
    ),
    visitNights: explained(
      sz.nights,
      '1',
      `${countOf(sz.nights, 'night')}: ${nightStepText(nightStep)} over ${baseline} d, first night included (clear nights; weather adds calendar time)`,
      BASELINE_PRACTICE,
      'practice',
    ),
    searchMinFrequencyPerDay: explained(
      fmin,
      'd⁻¹',
      `periods up to ${fmt(longestSearched)} d: ${longestSearched < o.searchLongPeriodFactor * pMax ? 'the baseline' : `${o.searchLongPeriodFactor} × the longest plausible period`}`,
      SEARCH_BAND_ASSUMPTION,
      'choice',
    ),
    searchMaxFrequencyPerDay: explained(
      fmax,
      'd⁻¹',
      `periods down to ${o.searchPeriodFraction} × the shortest plausible period (the P/2 harmonic of two spot groups)`,
      SEARCH_BAND_ASSUMPTION,
      'choice',
    ),
    independentFrequencies: explained(
      sz.threshold.effectiveFrequencies,
      '1',
      `Baluev's W = fmax·sqrt(4π·var t) = ${fmt(fmax)} d⁻¹ × ${baseline} d × sqrt(π/3), with the visits spread over the baseline`,
      THRESHOLD_SOURCE,
      'derived',
    ),
    detectionThresholdPower: explained(
      sz.threshold.power,
      '1',
      `the periodogram power (standard normalisation) whose false-alarm probability is ${o.falseAlarmProbability} for ${countOf(sz.threshold.points, series === 'nightlyMeans' ? 'nightly mean' : 'visit')} searched up to ${fmt(fmax)} d⁻¹`,
      BALUEV_SOURCE,
      'derived',
    ),
    requestedCompleteness: explained(
      o.completeness,
      '1',
      'chance of recovering the period that the plan is sized for',
      "your input: the proposal's completeness setting",
      'choice',
    ),
    completeness: explained(
      sz.completeness,
      '1',
      `probability that the period's peak clears the threshold, with λ = ${sz.threshold.points}·A²/(2σ²) = ${fmt(sz.noncentrality)}`,
      `${DETECTION_SOURCE}; ${MARCUM_SOURCE}`,
      'derived',
    ),
    visitsForCadence: explained(
      nCad,
      '1',
      `the cadence's ${countOf(cad.visitsPerNight, 'visit')} a night on ${countOf(visitNightCount(baseline, cad.nightStepDays), 'night')} over ${baseline} d`,
      CADENCE_PRACTICE,
      'practice',
    ),
    visitsForCompleteness50: explained(
      levels[0].drivenBy === 'unreachable' ? null : levels[0].visits,
      '1',
      levelWhy(0.5, levels[0]),
      DETECTION_SOURCE,
      'derived',
    ),
    visitsForCompleteness90: explained(
      levels[1].drivenBy === 'unreachable' ? null : levels[1].visits,
      '1',
      levelWhy(0.9, levels[1]),
      DETECTION_SOURCE,
      'derived',
    ),
    visitsForCompleteness99: explained(
      levels[2].drivenBy === 'unreachable' ? null : levels[2].visits,
      '1',
      levelWhy(0.99, levels[2]),
      DETECTION_SOURCE,
      'derived',
    ),
    visits: explained(
      visits,
      '1',
      sz.drivenBy === 'cadence'
        ? `the cadence's ${countOf(nCad, 'visit')} already give ${pct(sz.completeness)} completeness`
        : `${visitsPerNight} a night on ${countOf(sz.nights, 'night')} for ${pct(o.completeness)} completeness (the cadence alone: ${countOf(nCad, 'visit')})`,
      DETECTION_SOURCE,
      'derived',
    ),
    expectedPeriodPrecisionDays: explained(
      expectedSigmaP.sigmaPeriodDays,
      'd',
      `σP at the longest plausible period from ${countOf(sz.nights, 'nightly mean')} over ${baseline} d`,
      PERIOD_PRECISION_SOURCE,
      'memory',
    ),
    visitSeconds: explained(
      visitSeconds,
      's',
      stack.exposuresPerVisit > 1
        ? `${stack.exposuresPerVisit} × ${fmt(exposure.exposureSeconds)} s exposures + ${stack.exposuresPerVisit - 1} × ${o.readoutSeconds} s readout + overhead ${node.overheadSeconds} s`
        : `exposure ${fmt(exposure.exposureSeconds)} s + overhead ${node.overheadSeconds} s`,
      "the node's overhead per visit",
      'facility',
    ),
    nodeHoursClear: explained(
      hoursClear,
      'h',
      `${countOf(visits, 'visit')} × ${fmt(visitSeconds)} s`,
      'definition of node-hours (see Methods: Node-hours)',
      'practice',
    ),
    nodeHours: explained(
      hours,
      'h',
      `clear hours / (1 − weather loss ${node.weatherLossFraction}), rounded up to ${HOURS_STEP} h`,
      `the node's weather loss; rounding up to ${HOURS_STEP} h is an assumption of this product (see Methods: Node-hours)`,
      'choice',
    ),
    feeMinor: explained(
      fee,
      `${node.currency} minor units`,
      `${fmt(hours)} h × ${node.rateMinorPerHour} per hour, rounded to the unit`,
      "the node's rate card",
      'facility',
    ),
  };
  return {
    targetName: target.name ?? null,
    relation: o.relation,
    relationLabel: relInfo.label,
    turnoverScale: period.turnoverScale,
    turnoverScaleLabel: tauInfo.label,
    nodeBand: node.band,
    currency: node.currency,
    feasible: !flags.some((f) => f.severity === 'blocking'),
    quantities: q,
    precision: exposure.precision,
    analysis: {
      series,
      minFrequencyPerDay: fmin,
      maxFrequencyPerDay: fmax,
      falseAlarmProbability: o.falseAlarmProbability,
    },
    flags,
  };
}

interface StackChoice {
  exposuresPerVisit: number;
  sigmaPpm: number;
  why: string;
}

/**
 * Step 4c: exposures per visit. A single exposure capped by saturation (bright stars) or by
 * the node's longest exposure (faint ones) may miss the goal; stacking k exposures in one
 * visit averages the photon, sky, read and scintillation noise down by √k (independent
 * between exposures) but not the systematic floor (the same comparison stars, the same flat
 * field): σ_visit² = (σ₁² − floor²)/k + floor² (Spincycle's model; common practice, no source).
 */
function exposuresPerVisitStep(exposure: ExposureChoice, node: NodeSpec, o: ResolvedOptions, goalPpm: number): StackChoice {
  const singlePpm = exposure.precision.totalPpm;
  const floorPpm = exposure.precision.components.floorPpm;
  // A fixed exposure is the user's decision; only the automatic one is stacked automatically.
  const stackable = o.exposureSeconds === undefined && (exposure.limitedBy === 'saturation' || exposure.limitedBy === 'maxExposure');
  const maxStack = Math.max(
    1,
    Math.floor((o.maxVisitSeconds - node.overheadSeconds + o.readoutSeconds) / (exposure.exposureSeconds + o.readoutSeconds)),
  );
  // Node time for detection ∝ σ_visit²(k) × visit length(k); its minimum over k is the most
  // stacking worth doing, and reaching the goal needs no more than k_goal.
  const randomVar = Math.max(0, singlePpm ** 2 - floorPpm ** 2);
  const stackTime = (k: number) =>
    (randomVar / k + floorPpm ** 2) * (k * exposure.exposureSeconds + (k - 1) * o.readoutSeconds + node.overheadSeconds);
  let k = 1;
  let why = 'one exposure per visit reaches the goal';
  if (o.exposuresPerVisit !== undefined) {
    k = o.exposuresPerVisit;
    why = 'your input';
  } else if (!exposure.reachesTarget && stackable && !exposure.saturatesAtMinExposure) {
    let kBest = 1;
    for (let j = 2; j <= maxStack; j++) if (stackTime(j) < stackTime(kBest)) kBest = j;
    const kGoal = goalPpm > floorPpm * 1.001 ? Math.ceil(randomVar / (goalPpm ** 2 - floorPpm ** 2) - 1e-9) : Infinity;
    k = Math.max(1, Math.min(kBest, kGoal));
    why =
      k === kGoal
        ? `${k} exposures of ${fmt(exposure.exposureSeconds)} s (capped by ${LIMIT_WORDS[exposure.limitedBy]}) reach the goal of ${fmt(goalPpm)} ppm`
        : k === 1
          ? 'stacking would not save node time here'
          : `${k} exposures of ${fmt(exposure.exposureSeconds)} s (capped by ${LIMIT_WORDS[exposure.limitedBy]}) need the least node time for the detection (more would mostly average down what the floor keeps)`;
  } else if (!exposure.reachesTarget) {
    why = 'one exposure per visit (stacking does not help here)';
  }
  return { exposuresPerVisit: k, sigmaPpm: Math.sqrt(randomVar / k + floorPpm ** 2), why };
}

/** Flags of the exposure step: saturation, and a goal not reached. */
function exposureFlags(
  exposure: ExposureChoice,
  automatic: ExposureChoice,
  node: NodeSpec,
  o: ResolvedOptions,
  goalPpm: number,
  sigmaPpm: number,
  reachesGoal: boolean,
): ScienceFlag[] {
  if (exposure.saturatesAtMinExposure) {
    return [
      flag(
        'saturatesAtMinExposure',
        'blocking',
        `the star saturates even at the shortest exposure (${node.minExposureSeconds} s; saturation after ${fmt(exposure.saturationLimitSeconds)} s): defocus or a fainter band is needed`,
        SATURATION_SOURCE,
      ),
    ];
  }
  if (o.exposureSeconds !== undefined && exposure.precision.saturated) {
    return [
      flag(
        'saturatesAtChosenExposure',
        'blocking',
        `the star saturates at the chosen exposure of ${fmt(exposure.exposureSeconds)} s (saturation after ${fmt(exposure.saturationLimitSeconds)} s): choose a shorter exposure or the automatic one (${fmt(automatic.exposureSeconds)} s)`,
        SATURATION_SOURCE,
      ),
    ];
  }
  if (!reachesGoal) {
    return [
      flag(
        'precisionGoalNotReached',
        'info',
        o.exposureSeconds === undefined
          ? `the precision goal ${fmt(goalPpm)} ppm is not reached (best ${fmt(sigmaPpm)} ppm at ${fmt(exposure.exposureSeconds)} s, limited by ${LIMIT_WORDS[exposure.limitedBy]}): more visits make up for it`
          : `the precision goal ${fmt(goalPpm)} ppm is not reached at the chosen exposure (${fmt(sigmaPpm)} ppm at ${fmt(exposure.exposureSeconds)} s): more visits make up for it`,
      ),
    ];
  }
  return [];
}

interface ResolvedOptions {
  relation: GyroRelationId;
  turnoverScale: TurnoverScale | undefined;
  falseAlarmProbability: number;
  completeness: number;
  minBaselineDays: number | undefined;
  maxBaselineDays: number;
  searchLongPeriodFactor: number;
  sky: PlanSkyConditions | undefined;
  samplesPerCycle: number;
  baselineCycles: number;
  periodRangeSigma: number;
  amplitudeModel: Partial<AmplitudeModelCoefficients>;
  perVisitPrecisionPpm: number | undefined;
  exposureSeconds: number | undefined;
  exposuresPerVisit: number | undefined;
  readoutSeconds: number;
  maxVisitSeconds: number;
  planningAltitudeDeg: number;
  observableHoursPerNight: number;
  aliasPeriodDays: number;
  minVisitsPerNightShortPeriod: number;
  searchPeriodFraction: number;
  coherenceCycles: number;
  weakenedBrakingRossby: number | undefined;
  photometry: PhotometryOptions;
}

function resolveOptions(options: TargetPlanOptions, system: TargetColourSystem, node: NodeSpec): ResolvedOptions {
  const o = options ?? {};
  return prefixed('options', () => ({
    relation: requireOneOf(o.relation ?? defaultRelationFor(system), 'relation', GYRO_RELATIONS),
    turnoverScale: o.turnoverScale === undefined ? undefined : requireOneOf(o.turnoverScale, 'turnoverScale', TURNOVER_SCALES),
    completeness: requireInRange(o.completeness ?? PLAN_DEFAULTS.completeness, 'completeness', 0.5, 0.99),
    minBaselineDays: o.minBaselineDays === undefined ? undefined : requireInRange(o.minBaselineDays, 'minBaselineDays', 1, 3650),
    maxBaselineDays: requireInRange(o.maxBaselineDays ?? PLAN_DEFAULTS.maxBaselineDays, 'maxBaselineDays', 1, 3650),
    searchLongPeriodFactor: requireInRange(
      o.searchLongPeriodFactor ?? PLAN_DEFAULTS.searchLongPeriodFactor,
      'searchLongPeriodFactor',
      1,
      100,
    ),
    sky: o.sky === undefined ? undefined : validateSky(o.sky),
    falseAlarmProbability: requireInRange(
      o.falseAlarmProbability ?? PLAN_DEFAULTS.falseAlarmProbability,
      'falseAlarmProbability',
      0,
      0.5,
      true,
    ),
    samplesPerCycle: requireInRange(o.samplesPerCycle ?? PLAN_DEFAULTS.samplesPerCycle, 'samplesPerCycle', 2, 100),
    baselineCycles: requireInRange(o.baselineCycles ?? PLAN_DEFAULTS.baselineCycles, 'baselineCycles', 1, 100),
    periodRangeSigma: requireInRange(o.periodRangeSigma ?? PLAN_DEFAULTS.periodRangeSigma, 'periodRangeSigma', 0, 5),
    amplitudeModel: o.amplitudeModel ?? {},
    perVisitPrecisionPpm:
      o.perVisitPrecisionPpm === undefined ? undefined : requirePositive(o.perVisitPrecisionPpm, 'perVisitPrecisionPpm'),
    exposureSeconds:
      o.exposureSeconds === undefined
        ? undefined
        : requireInRange(o.exposureSeconds, 'exposureSeconds', node.minExposureSeconds, node.maxExposureSeconds),
    exposuresPerVisit: o.exposuresPerVisit === undefined ? undefined : requireInteger(o.exposuresPerVisit, 'exposuresPerVisit', 1),
    readoutSeconds: requireInRange(o.readoutSeconds ?? PLAN_DEFAULTS.readoutSeconds, 'readoutSeconds', 0, 600),
    maxVisitSeconds: requireInRange(o.maxVisitSeconds ?? PLAN_DEFAULTS.maxVisitSeconds, 'maxVisitSeconds', 1, 7200),
    planningAltitudeDeg: requireInRange(
      o.planningAltitudeDeg ?? Math.max(PLAN_DEFAULTS.planningAltitudeDeg, node.altitudeLimitDeg),
      'planningAltitudeDeg',
      Math.max(1, node.altitudeLimitDeg),
      90,
    ),
    observableHoursPerNight: requireInRange(
      o.observableHoursPerNight ?? PLAN_DEFAULTS.observableHoursPerNight,
      'observableHoursPerNight',
      0.1,
      24,
    ),
    aliasPeriodDays: requireInRange(o.aliasPeriodDays ?? PLAN_DEFAULTS.aliasPeriodDays, 'aliasPeriodDays', 0, 30),
    minVisitsPerNightShortPeriod: requireInteger(
      o.minVisitsPerNightShortPeriod ?? PLAN_DEFAULTS.minVisitsPerNightShortPeriod,
      'minVisitsPerNightShortPeriod',
      1,
    ),
    searchPeriodFraction: requireInRange(o.searchPeriodFraction ?? PLAN_DEFAULTS.searchPeriodFraction, 'searchPeriodFraction', 0.05, 1),
    coherenceCycles: requirePositive(o.coherenceCycles ?? PLAN_DEFAULTS.coherenceCycles, 'coherenceCycles'),
    weakenedBrakingRossby: o.weakenedBrakingRossby,
    photometry: o.photometry ?? {},
  }));
}

function validateSky(sky: PlanSkyConditions): PlanSkyConditions {
  requireInRange(sky?.medianMagPerArcsec2, 'sky.medianMagPerArcsec2', 10, 25);
  requireInRange(sky.worstMagPerArcsec2, 'sky.worstMagPerArcsec2', 10, 25);
  requireInteger(sky.usableNights, 'sky.usableNights', 0);
  return sky;
}

/**
 * The exposure the caller fixed, in the same shape as the automatic choice, so that the rest
 * of the plan reads one object. `limitedBy` keeps the automatic choice's reason for reference
 * only; `saturatesAtMinExposure` stays a property of the node and star (not of the choice).
 */
function fixedExposure(setup: PhotometrySetup, automatic: ExposureChoice, exposureSeconds: number, goalPpm: number): ExposureChoice {
  const precision = visitPrecisionAt(setup, exposureSeconds);
  return {
    exposureSeconds,
    precision,
    limitedBy: automatic.limitedBy,
    reachesTarget: precision.totalPpm <= goalPpm * (1 + 1e-9),
    targetPrecisionPpm: goalPpm,
    saturationLimitSeconds: automatic.saturationLimitSeconds,
    saturatesAtMinExposure: automatic.saturatesAtMinExposure,
  };
}

/**
 * Runs `fn`, giving any ScienceInputError's field its full path: options sub-objects
 * (`photometry.*`, `amplitudeModel.*`) go under `options.`, node and site fields keep theirs,
 * anything else goes under `prefix.`.
 */
function prefixed<T>(prefix: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (!(err instanceof ScienceInputError)) throw err;
    const f = err.field;
    if (/^(node|site|target|options)[.[]/.test(f)) throw err;
    const full = /^(photometry|amplitudeModel|sky)[.[]/.test(f) ? `options.${f}` : `${prefix}.${f}`;
    throw new ScienceInputError(full, err.reason);
  }
}

function inputName(q: string): string {
  return { bvMag: '(B−V)0', teffK: 'Teff', massSolar: 'mass', vKsMag: '(V−Ks)0' }[q] ?? q;
}
