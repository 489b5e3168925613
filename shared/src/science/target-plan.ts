/**
 * The target plan: every requirement of one target on one node — period and its range,
 * amplitude, per-visit precision and exposure, cadence, baseline, visits, node-hours and fee
 * — each number with its unit, a "why" line and the source of its formula.
 *
 * Order of the computation (each step uses only the steps above it):
 *  1. period and its plausible range from colour and age (gyrochronology);
 *  2. τc, Rossby number, and the spot amplitude at the longest plausible period (the
 *     smallest amplitude in the range: sizing for it is conservative);
 *  3. magnitude in the node's band, airmass at the planning altitude;
 *  4. cadence from the shortest plausible period (samples per cycle; several visits per
 *     night under ≈ 2 d);
 *  5. baseline for the coherence rule (cycles of the longest plausible period);
 *  6. per-visit precision goal: the σ at which the cadence's own visits already reach the
 *     detection threshold (or the caller's value), and the shortest exposure reaching it
 *     without saturating (or the caller's fixed exposure, flagged when it saturates);
 *  7. visits for detection; baseline for the requested period precision (σP solved for T);
 *  8. visits = the larger of detection and cadence, spread over the visit nights;
 *  9. node-hours = visits × (exposure + overhead) / (1 − weather loss); fee at the node's rate.
 */
import type { NodeBand, NodeSpec, SiteSpec } from '../facility/facility-types';
import { type TargetColourSystem, TARGET_COLOUR_SYSTEMS, colourLabel, DWARF_SEQUENCE_SOURCE, REDDENING_RATIOS } from './colour-sequence';
import {
  DETECTION_SOURCE,
  PERIOD_PRECISION_SOURCE,
  baselineForPeriodPrecision,
  detectionThresholdPower,
  expectedFalseAlarmProbability,
  independentFrequencyCount,
  periodPrecision,
  visitsForDetection,
} from './detection';
import { type Explained, type ScienceFlag, explained, flag, fmt } from './explained';
import { type GyroRelationId, GYRO_RELATIONS, GYRO_RELATION_INFO, PROPAGATION_METHOD, predictPeriod } from './gyrochronology';
import { BAND_ZERO_POINTS, EXTINCTION_SOURCE, convertMagnitude } from './photometric-bands';
import { ScienceInputError, requireInRange, requireInteger, requireOneOf, requirePositive } from './science-input-error';
import {
  type AmplitudeModelCoefficients,
  AMPLITUDE_MODEL_SOURCE,
  RPER_PER_SEMI_AMPLITUDE,
  amplitudeModel,
  amplitudeExponent,
  spotAmplitude,
} from './spot-amplitude';
import { type TurnoverScale, TURNOVER_SCALES, TURNOVER_SCALE_INFO, turnoverTimeForColour } from './turnover-time';
import {
  type ExposureChoice,
  type PhotometryOptions,
  type PhotometrySetup,
  type VisitPrecision,
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
}

/** Choices of the plan; every field has a documented default. */
export interface TargetPlanOptions {
  /** Gyrochronology relation. Default: Angus et al. (2019) for BP−RP colours, Barnes (2007) for B−V. */
  relation?: GyroRelationId;
  /**
   * τ scale of the Rossby number. Default Noyes (1984): the amplitude model's anchors are
   * Noyes Rossby numbers (solar Ro ≈ 2.18).
   */
  turnoverScale?: TurnoverScale;
  /** False-alarm probability of the detection (default 0.01). */
  falseAlarmProbability?: number;
  /** Samples per cycle of the shortest plausible period (default 10; SCIENCE.md §6: 8–10). */
  samplesPerCycle?: number;
  /** Cycles of the longest plausible period the baseline covers (default 3; SCIENCE.md §6). */
  baselineCycles?: number;
  /** Width of the plausible period range in σ (default 1). */
  periodRangeSigma?: number;
  amplitudeModel?: Partial<AmplitudeModelCoefficients>;
  /** Per-visit precision goal, ppm; default: the σ at which the cadence's visits just reach detection. */
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
  /** Baselines longer than this many cycles of the nominal period get a spot-coherence caution (default 10). */
  coherenceCycles?: number;
  weakenedBrakingRossby?: number;
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
  starPhotonRatePerSecond: Explained;
  saturationLimitSeconds: Explained;
  perVisitPrecisionGoalPpm: Explained;
  exposureSeconds: Explained;
  exposuresPerVisit: Explained;
  perVisitPrecisionPpm: Explained;
  perVisitPrecisionMmag: Explained;
  sampleIntervalDays: Explained;
  nightStepDays: Explained;
  visitsPerNight: Explained;
  baselineForCyclesDays: Explained;
  baselineForPrecisionDays: Explained<number | null>;
  baselineDays: Explained;
  searchMaxFrequencyPerDay: Explained;
  independentFrequencies: Explained;
  detectionThresholdPower: Explained;
  visitsForDetection: Explained;
  visitsForCadence: Explained;
  visits: Explained;
  expectedFalseAlarmProbability: Explained;
  expectedPeriodPrecisionDays: Explained;
  visitSeconds: Explained;
  nodeHoursClear: Explained;
  nodeHours: Explained;
  feeMinor: Explained;
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
  flags: ScienceFlag[];
}

/**
 * Version of the plan model: raise it whenever a change makes the same inputs give different
 * numbers, so that stored plans (the server keeps them per proposal) are marked out of date.
 * 2: exposures stacked per visit; 3: suggestions name what is possible (exposure, other node).
 */
export const TARGET_PLAN_MODEL_VERSION = 3;

export const PLAN_DEFAULTS = {
  falseAlarmProbability: 0.01,
  samplesPerCycle: 10,
  baselineCycles: 3,
  periodRangeSigma: 1,
  observableHoursPerNight: 6,
  aliasPeriodDays: 2,
  minVisitsPerNightShortPeriod: 3,
  searchPeriodFraction: 0.5,
  coherenceCycles: 10,
  planningAltitudeDeg: 45,
  readoutSeconds: 5,
  maxVisitSeconds: 600,
} as const;

const CHOICE = "Spincycle's choice, no source";
const RULE = 'common practice, no single source (SCIENCE.md §6)';
/** Billing granularity of node-hours (Spincycle's choice). */
const HOURS_STEP = 0.01;

/** Default relation for a colour system (documented in {@link TargetPlanOptions.relation}). */
export function defaultRelationFor(system: TargetColourSystem): GyroRelationId {
  return system === 'BPRP' ? 'angus2019' : 'barnes2007';
}

/**
 * Computes the plan of one target on one node. Throws {@link ScienceInputError} naming the
 * field (`target.ageMyr`, `node.apertureM`, `options.samplesPerCycle`...) for bad input;
 * never returns NaN.
 */
export function computeTargetPlan(
  target: TargetPlanTarget,
  node: NodeSpec,
  site: SiteSpec,
  options: TargetPlanOptions = {},
): TargetPlan {
  if (typeof target !== 'object' || target === null) throw new ScienceInputError('target', 'is missing');
  validateNodeSpec(node);
  validateSiteSpec(site);
  const system = prefixed('target', () => requireOneOf(target.colour?.system, 'colour.system', TARGET_COLOUR_SYSTEMS));
  const o = resolveOptions(options, system, node);
  const flags: ScienceFlag[] = [];

  // 1. Period and its plausible range.
  const prediction = prefixed('target', () =>
    predictPeriod({
      relation: o.relation,
      colour: target.colour,
      reddeningEbvMag: target.reddeningEbvMag,
      ageMyr: target.ageMyr,
      ageUncertaintyMyr: target.ageUncertaintyMyr,
      rangeSigma: o.periodRangeSigma,
      turnoverScale: o.turnoverScale,
      weakenedBrakingRossby: o.weakenedBrakingRossby,
    }),
  );
  flags.push(...prediction.flags.filter((f) => f.code !== 'rossbyUnavailable'));
  const relInfo = GYRO_RELATION_INFO[o.relation];
  const P = prediction.periodDays;
  const pMin = prediction.rangeDays.low;
  const pMax = prediction.rangeDays.high;
  const colour = prediction.colour;

  // 2. τc, Ro, amplitude.
  const tau = prefixed('target', () => turnoverTimeForColour(colour, o.turnoverScale));
  const tauInfo = TURNOVER_SCALE_INFO[o.turnoverScale];
  const ro = P / tau.tauDays;
  const roMax = pMax / tau.tauDays;
  const model = prefixed('options', () => amplitudeModel(o.amplitudeModel));
  const ampNominal = spotAmplitude(ro, model);
  const ampUsed = spotAmplitude(roMax, model);
  const semiAmplitudePpm = ampUsed.rperPpm / RPER_PER_SEMI_AMPLITUDE;

  // 3. Magnitude in the node's band; airmass.
  const mag = prefixed('target', () => convertMagnitude(target.magnitude, node.band, colour));
  const airmass = airmassKastenYoung(o.planningAltitudeDeg);
  const setup = prefixed('target', () => photometrySetup(node, site, mag.magnitude, airmass, o.photometry));

  // 4. Cadence from the shortest plausible period.
  const s = o.samplesPerCycle;
  const sampleInterval = pMin / s;
  let visitsPerNight: number;
  let nightStep: number;
  let cadenceWhy: string;
  if (sampleInterval >= 1) {
    visitsPerNight = 1;
    nightStep = Math.floor(sampleInterval);
    cadenceWhy =
      nightStep === 1
        ? `one visit per night gives ≥ ${s} samples per ${fmt(pMin)}-d cycle`
        : `one visit every ${nightStep} nights gives ≥ ${s} samples per ${fmt(pMin)}-d cycle`;
  } else {
    nightStep = 1;
    visitsPerNight = Math.ceil(s / pMin - 1e-9);
    cadenceWhy = `${visitsPerNight} visits per night give ≥ ${s} samples per ${fmt(pMin)}-d cycle`;
    if (pMin < o.aliasPeriodDays && visitsPerNight < o.minVisitsPerNightShortPeriod) {
      visitsPerNight = o.minVisitsPerNightShortPeriod;
      cadenceWhy = `${visitsPerNight} visits per night spread over the night break the 1 d⁻¹ aliases of periods under ${o.aliasPeriodDays} d`;
    }
  }

  // 5. Baseline for the coherence rule.
  const baselineCycles = o.baselineCycles * pMax;
  const visitNights = (T: number) => Math.floor(T / nightStep) + 1;
  const cadenceVisits = (T: number) => visitsPerNight * visitNights(T);

  // 6. Precision goal and exposure.
  const fmax = 1 / (o.searchPeriodFraction * pMin);
  const m0 = independentFrequencyCount(baselineCycles, fmax);
  const z00 = detectionThresholdPower(m0, o.falseAlarmProbability);
  const nCad0 = cadenceVisits(Math.ceil(baselineCycles));
  const goalPpm = o.perVisitPrecisionPpm ?? semiAmplitudePpm * Math.sqrt(nCad0 / (4 * z00));
  const goalWhy =
    o.perVisitPrecisionPpm !== undefined
      ? 'requested per-visit precision'
      : `the σ at which the ${nCad0} visits of the cadence alone reach the detection threshold: A·sqrt(N/(4·z0))`;
  const automatic = chooseExposureFromSetup(setup, node, goalPpm);
  const exposure = o.exposureSeconds === undefined ? automatic : fixedExposure(setup, automatic, o.exposureSeconds, goalPpm);
  // 6b. Exposures per visit. A single exposure capped by saturation (bright stars) or by the
  // node's longest exposure (faint ones) may miss the goal; stacking k exposures in one visit
  // averages the photon, sky, read and scintillation noise down by √k (independent between
  // exposures) but not the systematic floor (the same comparison stars, the same flat field):
  // σ_visit² = (σ₁² − floor²)/k + floor² (Spincycle's model; common practice, no source).
  const singlePpm = exposure.precision.totalPpm;
  const floorPpm = exposure.precision.components.floorPpm;
  // A fixed exposure is the user's decision; only the automatic one is stacked automatically.
  const stackable = o.exposureSeconds === undefined && (exposure.limitedBy === 'saturation' || exposure.limitedBy === 'maxExposure');
  const maxStack = Math.max(1, Math.floor((o.maxVisitSeconds - node.overheadSeconds + o.readoutSeconds) / (exposure.exposureSeconds + o.readoutSeconds)));
  // Node time for detection ∝ σ_visit²(k) × visit length(k); its minimum over k is the most
  // stacking worth doing, and reaching the goal needs no more than k_goal.
  const randomVar = Math.max(0, singlePpm ** 2 - floorPpm ** 2);
  const stackTime = (k: number) =>
    (randomVar / k + floorPpm ** 2) * (k * exposure.exposureSeconds + (k - 1) * o.readoutSeconds + node.overheadSeconds);
  let exposuresPerVisit = 1;
  let stackWhy = 'one exposure per visit reaches the goal';
  if (o.exposuresPerVisit !== undefined) {
    exposuresPerVisit = o.exposuresPerVisit;
    stackWhy = 'chosen by the user';
  } else if (!exposure.reachesTarget && stackable && !exposure.saturatesAtMinExposure) {
    let kBest = 1;
    for (let k = 2; k <= maxStack; k++) if (stackTime(k) < stackTime(kBest)) kBest = k;
    const kGoal = goalPpm > floorPpm * 1.001 ? Math.ceil(randomVar / (goalPpm ** 2 - floorPpm ** 2) - 1e-9) : Infinity;
    exposuresPerVisit = Math.max(1, Math.min(kBest, kGoal));
    stackWhy =
      exposuresPerVisit === kGoal
        ? `${exposuresPerVisit} exposures of ${fmt(exposure.exposureSeconds)} s (capped by ${exposure.limitedBy}) reach the goal of ${fmt(goalPpm)} ppm`
        : exposuresPerVisit === 1
          ? 'stacking would not save node time here'
          : `${exposuresPerVisit} exposures of ${fmt(exposure.exposureSeconds)} s (capped by ${exposure.limitedBy}) need the least node time for the detection (more would mostly average down what the floor keeps)`;
  } else if (!exposure.reachesTarget) {
    stackWhy = 'one exposure per visit (stacking does not help here)';
  }
  const sigmaPpm = Math.sqrt(randomVar / exposuresPerVisit + floorPpm ** 2);
  const reachesGoal = sigmaPpm <= goalPpm * (1 + 1e-9);
  if (exposure.saturatesAtMinExposure) {
    flags.push(
      flag(
        'saturatesAtMinExposure',
        'blocking',
        `the star saturates even at the shortest exposure (${node.minExposureSeconds} s; saturation after ${fmt(exposure.saturationLimitSeconds)} s): defocus or a fainter band is needed`,
        'Gaussian PSF peak pixel against the node saturationE',
      ),
    );
  } else if (o.exposureSeconds !== undefined && exposure.precision.saturated) {
    // Same style as the flag above: the chosen exposure fills the peak pixel past saturationE.
    flags.push(
      flag(
        'saturatesAtChosenExposure',
        'blocking',
        `the star saturates at the chosen exposure of ${fmt(exposure.exposureSeconds)} s (saturation after ${fmt(exposure.saturationLimitSeconds)} s): choose a shorter exposure or the automatic one (${fmt(automatic.exposureSeconds)} s)`,
        'Gaussian PSF peak pixel against the node saturationE',
      ),
    );
  } else if (!reachesGoal) {
    flags.push(
      flag(
        'precisionGoalNotReached',
        'info',
        o.exposureSeconds === undefined
          ? `the precision goal ${fmt(goalPpm)} ppm is not reached (best ${fmt(sigmaPpm)} ppm at ${fmt(exposure.exposureSeconds)} s, limited by ${exposure.limitedBy}): more visits make up for it`
          : `the precision goal ${fmt(goalPpm)} ppm is not reached at the chosen exposure (${fmt(sigmaPpm)} ppm at ${fmt(exposure.exposureSeconds)} s): more visits make up for it`,
      ),
    );
  }

  // 7. Visits for detection; baseline for the requested period precision.
  const detectionVisits = (T: number) => {
    const m = independentFrequencyCount(T, fmax);
    const z0 = detectionThresholdPower(m, o.falseAlarmProbability);
    const n = visitsForDetection({ semiAmplitudePpm, sigmaPpm, independentFrequencies: m, falseAlarmProbability: o.falseAlarmProbability });
    return { m, z0, n };
  };
  const visitsAt = (T: number) => Math.max(detectionVisits(T).n, cadenceVisits(T));
  let baselineForPrecision: number | null = null;
  let baseline = Math.ceil(baselineCycles - 1e-9);
  const sigmaP = target.periodPrecisionDays;
  if (sigmaP !== undefined) {
    prefixed('target', () => requirePositive(sigmaP, 'periodPrecisionDays'));
    const tPrec = (T: number) =>
      baselineForPeriodPrecision({ visits: visitsAt(T), sigmaPpm, semiAmplitudePpm, periodDays: pMax, periodPrecisionDays: sigmaP });
    if (tPrec(baseline) > baseline) {
      // T − T_prec(N(T)) increases with T (N grows with T, T_prec falls): bisect for the root.
      let lo = baseline;
      let hi = baseline * 2;
      while (tPrec(hi) > hi && hi < 1e6) hi *= 2;
      if (hi >= 1e6) {
        throw new ScienceInputError('target.periodPrecisionDays', `${sigmaP} d cannot be reached within a million days of baseline`);
      }
      for (let i = 0; i < 60 && hi - lo > 1e-3; i++) {
        const mid = 0.5 * (lo + hi);
        if (tPrec(mid) > mid) lo = mid;
        else hi = mid;
      }
      baselineForPrecision = hi;
      baseline = Math.ceil(hi - 1e-9);
    } else {
      baselineForPrecision = tPrec(baseline);
    }
  }

  // 8. Visits: detection or cadence, whichever needs more, spread over the visit nights.
  const det = detectionVisits(baseline);
  const nCad = cadenceVisits(baseline);
  let visits = nCad;
  let visitsWhy = `the cadence needs ${nCad} visits (${visitsPerNight} per night on ${visitNights(baseline)} nights); detection needs ${det.n}`;
  if (det.n > nCad) {
    // Spread the detection's visits over every night of the baseline: up to
    // ceil(N / nights) per night, so that the cadence is kept and no visit is wasted.
    if (nightStep > 1) nightStep = 1;
    const nights = visitNights(baseline);
    visitsPerNight = Math.max(visitsPerNight, Math.ceil(det.n / nights - 1e-9));
    visits = det.n;
    visitsWhy = `detection needs ${det.n} visits, more than the cadence's ${nCad}: up to ${visitsPerNight} per night on ${nights} nights (${fmt(det.n / nights)} on average)`;
    flags.push(
      flag(
        'detectionDrivesVisits',
        'info',
        `detection at FAP ${o.falseAlarmProbability} needs more visits than the cadence; visits within a night count fully only if the node's errors are white`,
        DETECTION_SOURCE,
      ),
    );
  }
  const visitSeconds = exposuresPerVisit * exposure.exposureSeconds + (exposuresPerVisit - 1) * o.readoutSeconds + node.overheadSeconds;
  const nightSeconds = o.observableHoursPerNight * 3600;
  if (visitsPerNight * visitSeconds > nightSeconds) {
    flags.push(
      flag(
        'nightlyVisitsDoNotFit',
        'blocking',
        `${visitsPerNight} visits of ${fmt(visitSeconds)} s do not fit in ${o.observableHoursPerNight} observable hours per night`,
      ),
    );
  }
  if (baseline > o.coherenceCycles * P) {
    flags.push(
      flag(
        'baselineBeyondSpotCoherence',
        'caution',
        `the baseline spans ${fmt(baseline / P)} cycles: spots evolve, so the signal may lose coherence over it`,
        RULE,
      ),
    );
  }
  const expectedSigmaP = periodPrecision({ visits, sigmaPpm, semiAmplitudePpm, baselineDays: baseline, periodDays: pMax });
  const expectedFap = expectedFalseAlarmProbability({ visits, semiAmplitudePpm, sigmaPpm, independentFrequencies: det.m });

  // 9. Hours and fee.
  const hoursClear = (visits * visitSeconds) / 3600;
  const hours = Math.ceil(hoursClear / (1 - node.weatherLossFraction) / HOURS_STEP - 1e-9) * HOURS_STEP;
  const fee = Math.round(hours * node.rateMinorPerHour);

  const cl = colourLabel(colour.intrinsic.system);
  const rl = colourLabel(prediction.relationColour.system);
  const bandZp = BAND_ZERO_POINTS[node.band];
  const q: TargetPlanQuantities = {
    intrinsicColourMag: explained(
      colour.intrinsic.value,
      'mag',
      colour.reddeningEbvMag > 0
        ? `${cl} ${fmt(colour.observed.value)} de-reddened by E(B−V) = ${colour.reddeningEbvMag}`
        : `${cl} as given (no reddening)`,
      colour.reddeningEbvMag > 0 ? REDDENING_RATIOS[colour.intrinsic.system].source : 'the target colour',
      colour.reddeningEbvMag > 0 ? 'memory' : 'paper',
    ),
    relationColourMag: explained(
      prediction.relationColour.value,
      'mag',
      `${rl} taken by ${relInfo.label}: ${prediction.relationColour.origin}`,
      prediction.relationColour.system === colour.intrinsic.system ? 'the target colour' : DWARF_SEQUENCE_SOURCE,
      'paper',
    ),
    periodDays: explained(P, 'd', `${relInfo.label} at ${rl} ${fmt(prediction.relationColour.value)} and ${fmt(prediction.ageMyr)} Myr`, relInfo.citation, 'paper'),
    shortestPeriodDays: explained(
      pMin,
      'd',
      `−${o.periodRangeSigma}σ of the period from the age uncertainty (${fmt(prediction.ageUncertaintyMyr)} Myr) and the relation's coefficients`,
      PROPAGATION_METHOD,
      'choice',
    ),
    longestPeriodDays: explained(pMax, 'd', `+${o.periodRangeSigma}σ of the period (same propagation)`, PROPAGATION_METHOD, 'choice'),
    turnoverTimeDays: explained(tau.tauDays, 'd', `${tauInfo.label} τc at ${inputName(tau.inputQuantity)} ${fmt(tau.inputValue)} (${tau.inputOrigin})`, tauInfo.citation, 'paper'),
    rossbyNumber: explained(ro, '1', `P/τc on the ${tauInfo.label} scale`, `Ro = P/τc; τc: ${tauInfo.citation}`, 'derived'),
    rossbyNumberAtLongestPeriod: explained(roMax, '1', `longest plausible period over τc (${tauInfo.label} scale): sets the smallest amplitude`, `Ro = P/τc; τc: ${tauInfo.citation}`, 'derived'),
    amplitudeRperPpm: explained(
      ampUsed.rperPpm,
      'ppm',
      ampUsed.regime === 'saturated'
        ? `saturated (Ro ${fmt(roMax)} ≤ ${model.saturationRossby})`
        : `${fmt(model.anchorRperPpm)} ppm·(Ro/${model.anchorRossby})^−${fmt(amplitudeExponent(model), 4)} at the longest plausible period (Ro ${fmt(roMax)}); ${fmt(ampNominal.rperPpm)} ppm at the nominal period`,
      AMPLITUDE_MODEL_SOURCE,
      'derived',
    ),
    semiAmplitudePpm: explained(semiAmplitudePpm, 'ppm', `R_per/${fmt(RPER_PER_SEMI_AMPLITUDE, 4)} (5–95 % range of a sinusoid is 2·sin(0.45π)·A)`, 'SCIENCE.md §3 conversion [derived]', 'derived'),
    magnitudeInNodeBand: explained(
      mag.magnitude,
      'mag',
      mag.fromBand === mag.band
        ? `catalogue ${mag.band} magnitude`
        : `${mag.fromBand} ${fmt(target.magnitude.value)} moved to ${mag.band} by ${fmt(mag.offsetMag)} mag (observed B−V ${fmt(mag.observedBvMag ?? 0)}, BP−RP ${fmt(mag.observedBpRpMag ?? 0)})`,
      mag.source,
      mag.fromBand === mag.band ? 'paper' : 'memory',
    ),
    airmass: explained(airmass, '1', `planning altitude ${fmt(o.planningAltitudeDeg)}° (sky windows give the real range)`, 'Kasten & Young (1989), Appl. Opt. 28, 4735 (from memory)', 'memory'),
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
      'Gaussian PSF peak fraction [erf(p/(2√2σ))]² (common practice, no source)',
      'practice',
    ),
    perVisitPrecisionGoalPpm: explained(goalPpm, 'ppm', goalWhy, DETECTION_SOURCE, o.perVisitPrecisionPpm !== undefined ? 'choice' : 'derived'),
    exposureSeconds:
      o.exposureSeconds !== undefined
        ? explained(
            exposure.exposureSeconds,
            's',
            `chosen by the user (node range ${node.minExposureSeconds}–${node.maxExposureSeconds} s); the automatic choice would be ${fmt(automatic.exposureSeconds)} s`,
            "the user's choice, within the node's exposure range",
            'choice',
          )
        : explained(
            exposure.exposureSeconds,
            's',
            exposure.limitedBy === 'targetPrecision'
              ? 'shortest exposure reaching the precision goal'
              : `${exposure.limitedBy === 'minExposure' ? 'the node minimum: the goal is reached already' : `limited by ${exposure.limitedBy}`}`,
            'CCD equation (Howell 2006; Merline & Howell 1995, from memory) + scintillation + floor, solved for t',
            'memory',
          ),
    exposuresPerVisit: explained(exposuresPerVisit, '1', stackWhy, 'σ_visit² = (σ₁² − floor²)/k + floor² (common practice, no source)', o.exposuresPerVisit !== undefined ? 'choice' : 'practice'),
    perVisitPrecisionPpm: explained(
      sigmaPpm,
      'ppm',
      `${exposuresPerVisit > 1 ? `${exposuresPerVisit} exposures of ` : ''}photon ${fmt(exposure.precision.components.photonPpm)}, sky ${fmt(exposure.precision.components.skyPpm)}, read ${fmt(exposure.precision.components.readPpm)}, scintillation ${fmt(exposure.precision.components.scintillationPpm)} (${node.scintillationModel}), floor ${fmt(exposure.precision.components.floorPpm)} ppm in quadrature`,
      'CCD equation, Howell (2006), Handbook of CCD Astronomy (from memory); ' +
        (node.scintillationModel === 'young1967' ? 'Young (1967), AJ 72, 747' : 'Osborn et al. (2015), MNRAS 452, 1707') +
        ' (from memory)',
      'memory',
    ),
    perVisitPrecisionMmag: explained(MAG_PER_RELATIVE_FLUX * sigmaPpm * 1e-3, 'mmag', `σ(mag) = ${fmt(MAG_PER_RELATIVE_FLUX, 5)}·σ(flux)/flux`, 'Howell (2006), Handbook of CCD Astronomy', 'memory'),
    sampleIntervalDays: explained(sampleInterval, 'd', `shortest plausible period ${fmt(pMin)} d / ${s} samples per cycle`, RULE, 'practice'),
    nightStepDays: explained(nightStep, 'd', nightStep === 1 ? 'visits every night' : `a visit night every ${nightStep} nights`, RULE, 'practice'),
    visitsPerNight: explained(
      visitsPerNight,
      '1',
      visits > nCad ? `at most ${visitsPerNight} per night to fit the detection's ${visits} visits; ${cadenceWhy}` : cadenceWhy,
      RULE,
      'practice',
    ),
    baselineForCyclesDays: explained(baselineCycles, 'd', `${o.baselineCycles} cycles of the longest plausible period ${fmt(pMax)} d`, RULE, 'practice'),
    baselineForPrecisionDays: explained(
      baselineForPrecision,
      'd',
      sigmaP === undefined
        ? 'no period precision requested'
        : `σP = ${sigmaP} d at the longest plausible period: T = P²·sqrt(6/N)·σ/(π·A·σP), N growing with T`,
      PERIOD_PRECISION_SOURCE,
      'memory',
    ),
    baselineDays: explained(
      baseline,
      'd',
      baselineForPrecision !== null && baselineForPrecision > baselineCycles
        ? 'set by the requested period precision (whole days)'
        : 'set by the cycles rule (whole days)',
      RULE,
      'practice',
    ),
    searchMaxFrequencyPerDay: explained(fmax, 'd⁻¹', `periods down to ${o.searchPeriodFraction} × the shortest plausible period (the P/2 harmonic of two spot groups)`, CHOICE, 'choice'),
    independentFrequencies: explained(det.m, '1', `T·fmax = ${baseline} d × ${fmt(fmax)} d⁻¹`, DETECTION_SOURCE, 'derived'),
    detectionThresholdPower: explained(det.z0, '1', `ln(M/p) with p = ${o.falseAlarmProbability}`, DETECTION_SOURCE, 'derived'),
    visitsForDetection: explained(
      det.n,
      '1',
      `4σ²·ln(M/p)/A² with σ ${fmt(sigmaPpm)} ppm and A ${fmt(semiAmplitudePpm)} ppm`,
      DETECTION_SOURCE,
      'derived',
    ),
    visitsForCadence: explained(nCad, '1', `visits per night × visit nights over ${baseline} d`, RULE, 'practice'),
    visits: explained(visits, '1', visitsWhy, DETECTION_SOURCE, 'derived'),
    expectedFalseAlarmProbability: explained(
      expectedFap,
      '1',
      `expected FAP of the signal's peak with these visits: 1 − (1 − e^(−N·A²/4σ²))^M`,
      DETECTION_SOURCE,
      'derived',
    ),
    expectedPeriodPrecisionDays: explained(expectedSigmaP.sigmaPeriodDays, 'd', `σP at the longest plausible period with ${visits} visits over ${baseline} d`, PERIOD_PRECISION_SOURCE, 'memory'),
    visitSeconds: explained(
      visitSeconds,
      's',
      exposuresPerVisit > 1
        ? `${exposuresPerVisit} × ${fmt(exposure.exposureSeconds)} s exposures + ${exposuresPerVisit - 1} × ${o.readoutSeconds} s readout + overhead ${node.overheadSeconds} s`
        : `exposure ${fmt(exposure.exposureSeconds)} s + overhead ${node.overheadSeconds} s`, "the node's overhead per visit", 'facility'),
    nodeHoursClear: explained(hoursClear, 'h', `${visits} visits × ${fmt(visitSeconds)} s`, 'definition of node-hours', 'practice'),
    nodeHours: explained(
      hours,
      'h',
      `clear hours / (1 − weather loss ${node.weatherLossFraction}), rounded up to ${HOURS_STEP} h`,
      `node weather loss; rounding: ${CHOICE}`,
      'choice',
    ),
    feeMinor: explained(fee, `${node.currency} minor units`, `${fmt(hours)} h × ${node.rateMinorPerHour} per hour, rounded to the unit`, "the node's rate card", 'facility'),
  };
  return {
    targetName: target.name ?? null,
    relation: o.relation,
    relationLabel: relInfo.label,
    turnoverScale: o.turnoverScale,
    turnoverScaleLabel: tauInfo.label,
    nodeBand: node.band,
    currency: node.currency,
    feasible: !flags.some((f) => f.severity === 'blocking'),
    quantities: q,
    precision: exposure.precision,
    flags,
  };
}

interface ResolvedOptions {
  relation: GyroRelationId;
  turnoverScale: TurnoverScale;
  falseAlarmProbability: number;
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
    turnoverScale: requireOneOf(o.turnoverScale ?? 'noyes1984', 'turnoverScale', TURNOVER_SCALES),
    falseAlarmProbability: requireInRange(o.falseAlarmProbability ?? PLAN_DEFAULTS.falseAlarmProbability, 'falseAlarmProbability', 0, 0.5, true),
    samplesPerCycle: requireInRange(o.samplesPerCycle ?? PLAN_DEFAULTS.samplesPerCycle, 'samplesPerCycle', 2, 100),
    baselineCycles: requireInRange(o.baselineCycles ?? PLAN_DEFAULTS.baselineCycles, 'baselineCycles', 1, 100),
    periodRangeSigma: requireInRange(o.periodRangeSigma ?? PLAN_DEFAULTS.periodRangeSigma, 'periodRangeSigma', 0, 5),
    amplitudeModel: o.amplitudeModel ?? {},
    perVisitPrecisionPpm: o.perVisitPrecisionPpm === undefined ? undefined : requirePositive(o.perVisitPrecisionPpm, 'perVisitPrecisionPpm'),
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
    observableHoursPerNight: requireInRange(o.observableHoursPerNight ?? PLAN_DEFAULTS.observableHoursPerNight, 'observableHoursPerNight', 0.1, 24),
    aliasPeriodDays: requireInRange(o.aliasPeriodDays ?? PLAN_DEFAULTS.aliasPeriodDays, 'aliasPeriodDays', 0, 30),
    minVisitsPerNightShortPeriod: requireInteger(o.minVisitsPerNightShortPeriod ?? PLAN_DEFAULTS.minVisitsPerNightShortPeriod, 'minVisitsPerNightShortPeriod', 1),
    searchPeriodFraction: requireInRange(o.searchPeriodFraction ?? PLAN_DEFAULTS.searchPeriodFraction, 'searchPeriodFraction', 0.05, 1),
    coherenceCycles: requirePositive(o.coherenceCycles ?? PLAN_DEFAULTS.coherenceCycles, 'coherenceCycles'),
    weakenedBrakingRossby: o.weakenedBrakingRossby,
    photometry: o.photometry ?? {},
  }));
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
    const full = /^(photometry|amplitudeModel)[.[]/.test(f) ? `options.${f}` : `${prefix}.${f}`;
    throw new ScienceInputError(full, err.reason);
  }
}

function inputName(q: string): string {
  return { bvMag: '(B−V)0', teffK: 'Teff', massSolar: 'mass', vKsMag: '(V−Ks)0' }[q] ?? q;
}
