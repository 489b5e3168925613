/**
 * The steps of a target plan as separate, pure functions (computeTargetPlan in target-plan.ts
 * chains them and explains every number). Each step takes only what the steps before it
 * produced, so each can be tested on its own:
 *
 *   colour → period → amplitude → precision (exposure, stacking) → cadence → baseline →
 *   visits (completeness) → hours and fee; the sky check against the site's windows follows
 *   in planning/node-target-plan.ts.
 */
import { type ResolvedColour, resolveColour } from './colour-sequence';
import {
  type DetectionThreshold,
  baselineForPeriodPrecision,
  detectionProbability,
  detectionThreshold,
  noncentralityForCompleteness,
} from './detection';
import { type ScienceFlag, flag, fmt } from './explained';
import { type GyroRelationId, type PeriodPrediction, predictPeriod } from './gyrochronology';
import { ScienceInputError } from './science-input-error';
import {
  type AmplitudeModelCoefficients,
  type SpotAmplitude,
  RPER_PER_SEMI_AMPLITUDE,
  amplitudeModel,
  amplitudeRossby,
  spotAmplitude,
} from './spot-amplitude';
import { type TurnoverScale, type TurnoverTime, defaultTurnoverScaleFor, turnoverTimeForColour } from './turnover-time';

// ---------------------------------------------------------------------------------------
// 1–2. Colour and period.

export interface PeriodStepInput {
  relation: GyroRelationId;
  colour: { value: number; system: 'BV' | 'BPRP' };
  reddeningEbvMag?: number;
  ageMyr: number;
  ageUncertaintyMyr?: number;
  rangeSigma: number;
  /** τ scale chosen by the caller; default: the one better calibrated for the star's type. */
  turnoverScale?: TurnoverScale;
  weakenedBrakingRossby?: number;
  /** Period supplied by the proposer (overrides the relation), days. */
  explicitPeriodDays?: number;
  explicitPeriodUncertaintyDays?: number;
}

export interface PeriodStep {
  colour: ResolvedColour;
  turnoverScale: TurnoverScale;
  turnoverScaleWhy: string;
  prediction: PeriodPrediction;
  periodDays: number;
  shortestPeriodDays: number;
  longestPeriodDays: number;
  /** True when the proposer's period is used instead of the relation's. */
  explicit: boolean;
  /** Why the relation gives no period (null when it does, or when an explicit one is used). */
  noExpectedPeriod: string | null;
  flags: ScienceFlag[];
}

/**
 * Fractional 1σ of a proposer's period when they give none: spots at different latitudes
 * and their evolution make measured periods of one star differ by several per cent
 * (Spincycle's choice, no source).
 */
export const EXPLICIT_PERIOD_DEFAULT_FRACTION = 0.1;

/** Step 1–2: the colour de-reddened, the τ scale, and the period with its plausible range. */
export function periodStep(input: PeriodStepInput): PeriodStep {
  const colour = resolveColour(input.colour, input.reddeningEbvMag);
  const scaleChoice = input.turnoverScale ? { scale: input.turnoverScale, why: 'your input' } : defaultTurnoverScaleFor(colour);
  const prediction = predictPeriod({
    relation: input.relation,
    colour: input.colour,
    reddeningEbvMag: input.reddeningEbvMag,
    ageMyr: input.ageMyr,
    ageUncertaintyMyr: input.ageUncertaintyMyr,
    rangeSigma: input.rangeSigma,
    turnoverScale: scaleChoice.scale,
    weakenedBrakingRossby: input.weakenedBrakingRossby,
  });
  const flags = prediction.flags.filter((f) => f.code !== 'rossbyUnavailable');
  if (input.explicitPeriodDays !== undefined) {
    const p = input.explicitPeriodDays;
    if (!(Number.isFinite(p) && p > 0)) throw new ScienceInputError('periodDays', `must be a positive number of days (got ${p})`);
    const sigma = input.explicitPeriodUncertaintyDays ?? EXPLICIT_PERIOD_DEFAULT_FRACTION * p;
    if (!(Number.isFinite(sigma) && sigma >= 0))
      throw new ScienceInputError('periodUncertaintyDays', `must not be negative (got ${sigma})`);
    const k = input.rangeSigma;
    // The relation's own verdict becomes information: the proposer's period replaces it.
    const kept = flags.map((f) => (f.code === 'noExpectedPeriod' ? { ...f, severity: 'info' as const } : f));
    kept.push(flag('explicitPeriod', 'info', `your period ${fmt(p)} ± ${fmt(sigma)} d is used instead of ${prediction.relationLabel}`));
    return {
      colour,
      turnoverScale: scaleChoice.scale,
      turnoverScaleWhy: scaleChoice.why,
      prediction,
      periodDays: p,
      shortestPeriodDays: Math.max(0.1 * p, p - k * sigma),
      longestPeriodDays: p + k * sigma,
      explicit: true,
      noExpectedPeriod: null,
      flags: kept,
    };
  }
  return {
    colour,
    turnoverScale: scaleChoice.scale,
    turnoverScaleWhy: scaleChoice.why,
    prediction,
    periodDays: prediction.periodDays,
    shortestPeriodDays: prediction.rangeDays.low,
    longestPeriodDays: prediction.rangeDays.high,
    explicit: false,
    noExpectedPeriod: prediction.noResult ? prediction.noResult.reason : null,
    flags,
  };
}

// ---------------------------------------------------------------------------------------
// 3. Amplitude.

export interface AmplitudeStep {
  model: AmplitudeModelCoefficients;
  tau: TurnoverTime;
  rossby: number;
  rossbyAtLongestPeriod: number;
  /** Ro at the longest period moved to the amplitude model's anchor scale (Ro/Ro☉ on the same scale). */
  anchorRossby: number;
  nominal: SpotAmplitude;
  /** Amplitude at the longest plausible period: the smallest in the range, which sizing uses. */
  used: SpotAmplitude;
  semiAmplitudePpm: number;
}

/** Step 3: τc, Rossby number and the spot amplitude at the longest plausible period. */
export function amplitudeStep(period: PeriodStep, overrides: Partial<AmplitudeModelCoefficients>): AmplitudeStep {
  const tau = turnoverTimeForColour(period.colour, period.turnoverScale);
  const model = amplitudeModel(overrides);
  const rossby = period.periodDays / tau.tauDays;
  const roMax = period.longestPeriodDays / tau.tauDays;
  const nominal = spotAmplitude(amplitudeRossby(rossby, period.turnoverScale), model);
  const anchorRossby = amplitudeRossby(roMax, period.turnoverScale);
  const used = spotAmplitude(anchorRossby, model);
  return {
    model,
    tau,
    rossby,
    rossbyAtLongestPeriod: roMax,
    anchorRossby,
    nominal,
    used,
    semiAmplitudePpm: used.rperPpm / RPER_PER_SEMI_AMPLITUDE,
  };
}

// ---------------------------------------------------------------------------------------
// 5. Cadence.

export interface CadenceStep {
  samplesPerCycle: number;
  sampleIntervalDays: number;
  visitsPerNight: number;
  nightStepDays: number;
  /** Why this many visits a night, in the words of the plan's cadence story (no leading count). */
  why: string;
}

/** Step 5: visits per night and night step for ≥ s samples per cycle of the shortest period. */
export function cadenceStep(
  shortestPeriodDays: number,
  samplesPerCycle: number,
  aliasPeriodDays: number,
  minVisitsPerNightShortPeriod: number,
): CadenceStep {
  const pMin = shortestPeriodDays;
  const s = samplesPerCycle;
  const sampleIntervalDays = pMin / s;
  if (sampleIntervalDays >= 1) {
    const nightStepDays = Math.floor(sampleIntervalDays);
    return {
      samplesPerCycle: s,
      sampleIntervalDays,
      visitsPerNight: 1,
      nightStepDays,
      why: `one visit per visit night keeps a sample at least every ${fmt(sampleIntervalDays)} d`,
    };
  }
  let visitsPerNight = Math.ceil(s / pMin - 1e-9);
  let why = `a sample at least every ${fmt(sampleIntervalDays)} d`;
  if (pMin < aliasPeriodDays && visitsPerNight < minVisitsPerNightShortPeriod) {
    visitsPerNight = minVisitsPerNightShortPeriod;
    why = `spread over the night, they break the 1 d⁻¹ aliases of periods under ${aliasPeriodDays} d`;
  }
  return { samplesPerCycle: s, sampleIntervalDays, visitsPerNight, nightStepDays: 1, why };
}

/** Visit nights in a baseline of T days with a visit night every s nights (first night included). */
export function visitNightCount(baselineDays: number, nightStepDays: number): number {
  return Math.floor(baselineDays / nightStepDays + 1e-9) + 1;
}

// ---------------------------------------------------------------------------------------
// 6. Baseline.

export interface BaselineStep {
  /** Rotations rule: baselineCycles rotations of the longest plausible period, days. */
  forCyclesDays: number;
  /** For the requested period precision (null when none is asked). */
  forPrecisionDays: number | null;
  /** Longest of the rules and the caller's minimum, whole days. */
  baselineDays: number;
  setBy: 'cycles' | 'precision' | 'minimum';
}

/**
 * Step 6: the baseline from the rotations rule, the requested period precision (σP formula with
 * the nightly means of the cadence, solved for T with the night count growing with T) and the
 * caller's minimum (e.g. to reach a beat period).
 */
export function baselineStep(input: {
  longestPeriodDays: number;
  baselineCycles: number;
  periodPrecisionDays?: number;
  semiAmplitudePpm: number;
  nightlySigmaPpm: number;
  nightStepDays: number;
  minBaselineDays?: number;
}): BaselineStep {
  const forCyclesDays = input.baselineCycles * input.longestPeriodDays;
  let baselineDays = Math.ceil(forCyclesDays - 1e-9);
  let setBy: BaselineStep['setBy'] = 'cycles';
  let forPrecisionDays: number | null = null;
  const sigmaP = input.periodPrecisionDays;
  if (sigmaP !== undefined) {
    const tPrec = (T: number) =>
      baselineForPeriodPrecision({
        visits: visitNightCount(T, input.nightStepDays),
        sigmaPpm: input.nightlySigmaPpm,
        semiAmplitudePpm: input.semiAmplitudePpm,
        periodDays: input.longestPeriodDays,
        periodPrecisionDays: sigmaP,
      });
    if (tPrec(baselineDays) > baselineDays) {
      // T − T_prec(n(T)) increases with T (n grows with T, T_prec falls): bisect for the root.
      let lo = baselineDays;
      let hi = baselineDays * 2;
      while (tPrec(hi) > hi && hi < 1e6) hi *= 2;
      if (hi >= 1e6) throw new ScienceInputError('periodPrecisionDays', `${sigmaP} d cannot be reached within a million days of baseline`);
      for (let i = 0; i < 60 && hi - lo > 1e-3; i++) {
        const mid = 0.5 * (lo + hi);
        if (tPrec(mid) > mid) lo = mid;
        else hi = mid;
      }
      forPrecisionDays = hi;
      baselineDays = Math.ceil(hi - 1e-9);
      setBy = 'precision';
    } else {
      forPrecisionDays = tPrec(baselineDays);
    }
  }
  if (input.minBaselineDays !== undefined && input.minBaselineDays > baselineDays) {
    baselineDays = Math.ceil(input.minBaselineDays - 1e-9);
    setBy = 'minimum';
  }
  return { forCyclesDays, forPrecisionDays, baselineDays, setBy };
}

// ---------------------------------------------------------------------------------------
// 7. Visits for the requested completeness.

export interface VisitSizingInput {
  semiAmplitudePpm: number;
  /** Per-visit noise that averages down within a night (photon, sky, read, scintillation), ppm. */
  whitePpm: number;
  /** Per-visit systematic floor, correlated within a night, ppm. */
  floorPpm: number;
  completeness: number;
  falseAlarmProbability: number;
  maxFrequencyPerDay: number;
  /** The series the periodogram will analyse: nightly means, or single visits (short periods). */
  series: 'nightlyMeans' | 'visits';
  baselineDays: number;
  visitsPerNight: number;
  nightStepDays: number;
  /** Most visits that fit in a night. */
  maxVisitsPerNight: number;
  /** Longest baseline the sizing may stretch to, days. */
  maxBaselineDays: number;
  /** When unreachable, also compute the amplitude limits (an inversion; default true). */
  detail?: boolean;
  /** Thresholds already computed for the same search (key points·4096 + T), shared between sizings of one plan. */
  thresholdCache?: Map<number, DetectionThreshold>;
  /**
   * Detection probabilities already computed for the same plan, keyed by campaign (T, night
   * step, visits per night): they do not depend on the completeness asked, so the sizings of
   * the plan's completeness levels share them.
   */
  detectionCache?: Map<number, number>;
}

export interface VisitSizing {
  baselineDays: number;
  nightStepDays: number;
  visitsPerNight: number;
  nights: number;
  visits: number;
  threshold: DetectionThreshold;
  noncentrality: number;
  /** Noise of one value of the analysed series (a nightly mean, or a visit), ppm. */
  seriesSigmaPpm: number;
  /** Detection probability the campaign delivers. */
  completeness: number;
  /** What set the visits: the cadence alone, more visits per night, a longer baseline, or nothing reaches it. */
  drivenBy: 'cadence' | 'visitsPerNight' | 'baseline' | 'unreachable';
  /** Smallest semi-amplitude the completeness reaches with the most visits per night over the longest baseline, ppm (NaN unless `detail`). */
  amplitudeLimitPpm: number;
  /** The same with unlimited visits per night: what the floor alone allows, ppm (NaN unless `detail`). */
  floorAmplitudeLimitPpm: number;
  /** Visits a night beyond which the floor dominates a night's mean (⌈σ_white²/σ_floor²⌉, within the limits). */
  usefulVisitsPerNight: number;
  /** The largest campaign the sizing may try: every night over this baseline with this many visits a night. */
  longestBaselineDays: number;
  mostVisitsPerNight: number;
}

/**
 * Step 7: the campaign that recovers the period with the requested completeness.
 * Nightly means carry σ_night² = σ_white²/k + σ_floor² (detection.ts): more visits in a night
 * stop helping once the floor dominates (k ≈ σ_white²/σ_floor²), then only more nights do.
 * Remedies when the cadence alone falls short, cheapest in node time first: every night
 * instead of every s-th, with up to that useful k; then a longer baseline up to
 * `maxBaselineDays`; then more visits per night up to what fits; beyond that the amplitude is
 * below what the floor allows and the plan says so. For short periods the series is single
 * visits (nightly means would average the signal away) and the floor counts per visit.
 */
export function sizeVisits(input: VisitSizingInput): VisitSizing {
  return new VisitSizer(input).size();
}

/**
 * The state of one {@link sizeVisits} call. A class rather than closures inside the function:
 * the runtime's TypeScript loader names every closure it creates (a property definition per
 * closure per call), which cost a sixth of the plan benchmark when sizing made seven per call.
 */
class VisitSizer {
  private readonly A: number;
  private readonly w2: number;
  private readonly f2: number;
  private readonly c: number;
  private readonly nightly: boolean;
  private readonly thresholds: Map<number, DetectionThreshold>;
  private readonly detections: Map<number, number>;
  private readonly kMax: number;
  private readonly kUseful: number;
  private readonly tMax: number;

  constructor(private readonly input: VisitSizingInput) {
    this.A = input.semiAmplitudePpm;
    this.w2 = input.whitePpm ** 2;
    this.f2 = input.floorPpm ** 2;
    this.c = input.completeness;
    this.nightly = input.series === 'nightlyMeans';
    this.thresholds = input.thresholdCache ?? new Map<number, DetectionThreshold>();
    this.detections = input.detectionCache ?? new Map<number, number>();
    const k0 = input.visitsPerNight;
    this.kMax = Math.max(k0, input.maxVisitsPerNight);
    this.kUseful = this.f2 > 0 ? Math.max(k0, Math.min(this.kMax, Math.ceil(this.w2 / this.f2))) : this.kMax;
    this.tMax = Math.max(input.baselineDays, Math.ceil(input.maxBaselineDays));
  }

  private thresholdFor(points: number, T: number): DetectionThreshold {
    const key = points * 4096 + T;
    let th = this.thresholds.get(key);
    if (!th) {
      th = detectionThreshold(points, T, this.input.maxFrequencyPerDay, this.input.falseAlarmProbability);
      this.thresholds.set(key, th);
    }
    return th;
  }

  /** Detection probability of the campaign (T, s, k), once per plan (whole T, s and k: exact keys). */
  private pdOf(T: number, s: number, k: number, points: number, var1: number): number {
    const cacheable = Number.isInteger(T) && Number.isInteger(s) && Number.isInteger(k) && T < 2 ** 20 && s < 2 ** 12 && k < 2 ** 20;
    const key = cacheable ? (T * 4096 + s) * 2 ** 20 + k : -1;
    let pd = cacheable ? this.detections.get(key) : undefined;
    if (pd === undefined) {
      pd = detectionProbability((points * this.A * this.A) / (2 * var1), this.thresholdFor(points, T));
      if (cacheable) this.detections.set(key, pd);
    }
    return pd;
  }

  /** Noise variance of one value of the analysed series with k visits a night. */
  private var1(k: number): number {
    return this.nightly ? this.w2 / k + this.f2 : this.w2 + this.f2;
  }

  private ok(T: number, s: number, k: number): boolean {
    const n = visitNightCount(T, s);
    return this.pdOf(T, s, k, this.nightly ? n : n * k, this.var1(k)) >= this.c;
  }

  /** Smallest whole k in [lo, hi] with ok, or null (ok is monotone in k). */
  private smallestK(T: number, s: number, lo: number, hi: number): number | null {
    const { A, w2, f2 } = this;
    if (this.nightly && hi - lo > 16) {
      // Wide range: the threshold does not depend on k, so λ needed once, then k in closed form from
      // n·A²/(2·(w²/k + f²)) ≥ λ.
      const n = visitNightCount(T, s);
      const allowed = (n * A * A) / (2 * noncentralityForCompleteness(this.c, this.thresholdFor(n, T))) - f2;
      if (!(allowed > 0)) return null;
      const k = Math.max(lo, w2 === 0 ? 1 : Math.ceil(w2 / allowed - 1e-9));
      if (k > hi) return null;
      // Guard the rounding at the boundary with the direct check.
      return this.ok(T, s, k) ? k : k + 1 <= hi ? k + 1 : null;
    }
    if (!this.ok(T, s, hi)) return null;
    while (hi - lo > 0) {
      const mid = Math.floor((lo + hi) / 2);
      if (this.ok(T, s, mid)) hi = mid;
      else lo = mid + 1;
    }
    return hi;
  }

  /** Semi-amplitude the completeness reaches over the longest campaign with series noise sigma (both limits share its threshold). */
  private limitAt(sigma: number, lamMax: { value?: number }): number {
    const nMax = visitNightCount(this.tMax, 1);
    const points = this.nightly ? nMax : nMax * this.kMax;
    lamMax.value ??= noncentralityForCompleteness(this.c, this.thresholdFor(points, this.tMax));
    return Math.sqrt((2 * lamMax.value * sigma * sigma) / points);
  }

  private result(T: number, s: number, k: number, drivenBy: VisitSizing['drivenBy']): VisitSizing {
    const n = visitNightCount(T, s);
    const points = this.nightly ? n : n * k;
    const var1 = this.var1(k);
    const th = this.thresholdFor(points, T);
    const unreachable = drivenBy === 'unreachable' && (this.input.detail ?? true);
    const lamMax: { value?: number } = {};
    return {
      baselineDays: T,
      nightStepDays: s,
      visitsPerNight: k,
      nights: n,
      visits: n * k,
      threshold: th,
      noncentrality: (points * this.A * this.A) / (2 * var1),
      seriesSigmaPpm: Math.sqrt(var1),
      completeness: this.pdOf(T, s, k, points, var1),
      drivenBy,
      amplitudeLimitPpm: unreachable
        ? this.limitAt(this.nightly ? Math.sqrt(this.w2 / this.kMax + this.f2) : Math.sqrt(this.w2 + this.f2), lamMax)
        : Number.NaN,
      floorAmplitudeLimitPpm: unreachable ? this.limitAt(Math.sqrt(this.f2), lamMax) : Number.NaN,
      usefulVisitsPerNight: this.kUseful,
      longestBaselineDays: this.tMax,
      mostVisitsPerNight: this.kMax,
    };
  }

  size(): VisitSizing {
    const { input, kUseful, kMax, tMax } = this;
    const T0 = input.baselineDays;
    const k0 = input.visitsPerNight;
    // 1. The cadence as it stands.
    if (this.ok(T0, input.nightStepDays, k0)) return this.result(T0, input.nightStepDays, k0, 'cadence');
    // Nothing reaches it: the longest baseline with the most visits a night falls short. The
    // plan then keeps the cadence's own campaign and says what completeness that gives: showing
    // the largest campaign tried (every night, the night full of visits) would price thousands
    // of visits that cannot reach the goal either.
    if (!this.ok(tMax, 1, kMax)) return this.result(T0, input.nightStepDays, k0, 'unreachable');
    // 2. Every night, up to the useful visits per night.
    const kEvery = this.smallestK(T0, 1, k0, kUseful);
    if (kEvery !== null) return this.result(T0, 1, kEvery, 'visitsPerNight');
    // 3. A longer baseline at the useful visits per night (ok rises with T).
    if (tMax > T0 && this.ok(tMax, 1, kUseful)) {
      let lo = T0;
      let hi = tMax;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (this.ok(mid, 1, kUseful)) hi = mid;
        else lo = mid;
      }
      return this.result(hi, 1, this.smallestK(hi, 1, k0, kUseful) ?? kUseful, 'baseline');
    }
    // 4. The longest baseline, more visits per night up to what fits.
    const kLong = kUseful < kMax ? this.smallestK(tMax, 1, kUseful + 1, kMax) : kMax;
    return this.result(tMax, 1, kLong ?? kMax, 'visitsPerNight');
  }
}
