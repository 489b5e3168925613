/**
 * Detecting a period in a campaign (SCIENCE.md §6): the detection threshold at a false-alarm
 * probability over the searched band, the probability that a sinusoid's peak clears it
 * (completeness), the noise of a night when the systematic floor is correlated within the
 * night, and the period precision a baseline gives.
 *
 * The model, in one place:
 * - The periodogram is analysed on nightly means (several visits of one night averaged), so
 *   that the floor — the same comparison stars and flat field all night — counts once per
 *   night: σ_night² = σ_white²/k + σ_floor² for k visits in the night [common practice, no
 *   single source; SCIENCE.md §6].
 * - For a sinusoid of semi-amplitude A in n nightly means of noise σ_night, 2z (z the power
 *   in the normalisation where noise alone gives z ~ Exp(1)) is non-central χ² with 2 degrees
 *   of freedom and non-centrality λ = n·A²/(2σ_night²) [derived from the periodogram
 *   definition, SCIENCE.md §6]. The period is detected when z clears the threshold z0:
 *   Pd = Q1(√λ, √(2·z0)) (Marcum Q-function).
 * - z0 is the power whose false-alarm probability over the searched band is p, by Baluev
 *   (2008), MNRAS 385, 1279, eq. 6 in its large-N form: FAP(z) = 1 − (1 − e^(−z))·exp(−W·√z·e^(−z)),
 *   W = fmax·sqrt(4π·var(t)), var(t) = T²/12 for visits spread evenly over a baseline T.
 *   This is the same false-alarm probability the product's periodogram reports (see
 *   lomb-scargle/false-alarm.ts), so the plan and the analysis agree on what "detected" means.
 */
import { baluevGamma, logGamma } from './lomb-scargle/false-alarm';
import { requireInRange, requireNonNegative, requirePositive } from './science-input-error';

// The non-central F form is derived in this product from the periodogram's definition (the
// `[derived here]` note of SCIENCE.md); users read it as following from the definitions.
export const DETECTION_SOURCE =
  'Pd = P(Z > Z0), λ = n·A²/(2σ²): the sinusoid’s χ² is non-central with 2 degrees of freedom, the residual central with n − 3 (a non-central F tail; Marcum Q1 as n → ∞), which follows from the definitions (see Methods: Detection probability (completeness)); Z0 from Baluev (2008), MNRAS 385, 1279, eq. 6';
export const THRESHOLD_SOURCE =
  'Baluev (2008), MNRAS 385, 1279, eq. 6, large-N form: FAP(z) = 1 − (1 − e^(−z))·exp(−W·√z·e^(−z)), W = fmax·sqrt(4π·var t)';
// Johnson, Kotz & Balakrishnan from memory: the chapter number is not checked (29 here, 30 in
// the regularised-beta comment below; docs/science.md "Checked values"), so none is shown.
export const MARCUM_SOURCE =
  'Marcum Q1 as a Poisson mixture of χ² tails: Q1(a, b) = Σj Pois(j; a²/2)·P(Pois(b²/2) ≤ j) (Johnson, Kotz & Balakrishnan (1995), Continuous Univariate Distributions, vol. 2)';
// Common practice, no single source (SCIENCE.md `practice` tag).
export const NIGHTLY_NOISE_SOURCE =
  'σ_night² = σ_white²/k + σ_floor²: the floor is correlated within a night (an assumption of this product; see Methods: Nightly means)';
// The Kovács (1981) form from memory; Montgomery & O'Donoghue's derivation and assumptions
// confirmed, the formula itself not legible there (docs/science.md "Checked values").
export const PERIOD_PRECISION_SOURCE = "Montgomery & O'Donoghue (1999), DSSN 13, 28: σf = sqrt(6/N)·σ/(π·A·T), σP = P²·σf";

/** Completeness levels every plan reports the price of (the proposal's own level is added). */
export const COMPLETENESS_LEVELS = [0.5, 0.9, 0.99] as const;

/**
 * Marcum Q-function of order 1, Q1(a, b) = P(X > b²) for X non-central χ² with 2 degrees of
 * freedom and non-centrality a² — the probability that a sinusoid of "signal-to-noise" a in
 * Gaussian noise gives a periodogram power above b²/2. Computed as the Poisson mixture
 * Σj Pois(j; a²/2)·P(Pois(b²/2) ≤ j) (all terms positive; {@link MARCUM_SOURCE}), summed over
 * ±12σ of the mixing Poisson. Identities: Q1(0, b) = exp(−b²/2), Q1(a, 0) = 1.
 */
export function marcumQ1(a: number, b: number): number {
  const mu = 0.5 * requireNonNegative(a, 'a') ** 2;
  const nu = 0.5 * requireNonNegative(b, 'b') ** 2;
  if (nu === 0) return 1;
  if (mu === 0) return Math.exp(-nu);
  const spread = 12 * Math.sqrt(mu) + 12;
  const jMin = Math.max(0, Math.floor(mu - spread));
  const jMax = Math.ceil(mu + spread);
  // Poisson CDF of ν at jMin, summed from where its terms matter; q runs one term ahead.
  const iStart = Math.max(0, Math.floor(nu - 12 * Math.sqrt(nu) - 12));
  let cdf = 0;
  let q: number;
  if (iStart <= jMin) {
    q = poissonTerm(iStart, nu);
    for (let i = iStart; i <= jMin; i++) {
      cdf += q;
      q *= nu / (i + 1);
    }
  } else {
    q = poissonTerm(jMin + 1, nu);
  }
  let p = poissonTerm(jMin, mu);
  let sum = 0;
  for (let j = jMin; j <= jMax; j++) {
    sum += p * Math.min(1, cdf);
    p *= mu / (j + 1);
    cdf += q;
    // A term that underflowed is recomputed in logarithms (the recurrence would stay at 0).
    q = q > 0 ? (q * nu) / (j + 2) : poissonTerm(j + 2, nu);
  }
  return Math.min(1, Math.max(0, sum));
}

/** Pois(j; m) = e^(−m)·m^j/j!, evaluated in logarithms so that large m and j do not underflow. */
function poissonTerm(j: number, m: number): number {
  return Math.exp(-m + j * Math.log(m) - logGamma(j + 1));
}

/**
 * Effective number of independent frequencies of a search up to fmax over a baseline T with
 * visits spread evenly: Baluev's W = fmax·sqrt(4π·var t) with var t = T²/12, i.e.
 * fmax·T·sqrt(π/3) (at least 1).
 */
export function effectiveFrequencyCount(baselineDays: number, maxFrequencyPerDay: number): number {
  const t = requirePositive(baselineDays, 'baselineDays');
  const f = requirePositive(maxFrequencyPerDay, 'maxFrequencyPerDay');
  return Math.max(1, f * t * Math.sqrt(Math.PI / 3));
}

/** False-alarm probability of power z over W effective frequencies ({@link THRESHOLD_SOURCE}). */
export function falseAlarmOfPower(power: number, effectiveFrequencies: number): number {
  const z = Math.max(0, power);
  const single = Math.exp(-z);
  const tau = effectiveFrequencies * Math.sqrt(z) * single;
  return Math.min(1, Math.max(0, -Math.expm1(-tau) + single * Math.exp(-tau)));
}

/**
 * Detection threshold z0: the power whose false-alarm probability over the searched band is
 * p ({@link THRESHOLD_SOURCE}); FAP(z) falls monotonically for z ≥ ½, so a bisection finds it.
 */
export function detectionThresholdPower(effectiveFrequencies: number, falseAlarmProbability: number): number {
  const w = Math.max(1, requirePositive(effectiveFrequencies, 'effectiveFrequencies'));
  const p = requireInRange(falseAlarmProbability, 'falseAlarmProbability', 0, 1, true);
  let lo = 0.5;
  let hi = Math.log(w / p) + 0.5 * Math.log(Math.log(w / p) + 1) + 5;
  if (falseAlarmOfPower(lo, w) <= p) return lo;
  while (falseAlarmOfPower(hi, w) > p) hi *= 2;
  for (let i = 0; i < 60 && hi - lo > 1e-10 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (falseAlarmOfPower(mid, w) > p) lo = mid;
    else hi = mid;
  }
  return hi;
}

/** Large-N detection probability Q1(√λ, √(2·z0)) (SCIENCE.md §6); see {@link detectionProbability} for finite N. */
export function marcumDetectionProbability(noncentrality: number, thresholdPower: number): number {
  return marcumQ1(
    Math.sqrt(requireNonNegative(noncentrality, 'noncentrality')),
    Math.sqrt(2 * requireNonNegative(thresholdPower, 'thresholdPower')),
  );
}

/**
 * The detection threshold of a search, as the product's periodogram applies it: the
 * standard-normalised power Z0 (fraction of the weighted variance a sinusoid explains) whose
 * Baluev (2008) false-alarm probability, for `points` values spread evenly over the baseline,
 * equals p — the same formula as lomb-scargle/false-alarm.ts (astropy's), with var t = T²/12.
 */
export interface DetectionThreshold {
  /** Z0, standard normalisation (0–1). */
  power: number;
  /** Values in the analysed series (nightly means or visits). */
  points: number;
  /** Baluev's W = fmax·sqrt(4π·var t). */
  effectiveFrequencies: number;
  falseAlarmProbability: number;
}

/** Z0 for `points` values over `baselineDays`, searched up to fmax, at false-alarm probability p. */
export function detectionThreshold(
  points: number,
  baselineDays: number,
  maxFrequencyPerDay: number,
  falseAlarmProbability: number,
): DetectionThreshold {
  const n = requirePositive(points, 'points');
  if (n < 4)
    return { power: 1, points: n, effectiveFrequencies: effectiveFrequencyCount(baselineDays, maxFrequencyPerDay), falseAlarmProbability };
  const p = requireInRange(falseAlarmProbability, 'falseAlarmProbability', 0, 1, true);
  const t = requirePositive(baselineDays, 'baselineDays');
  const fmax = requirePositive(maxFrequencyPerDay, 'maxFrequencyPerDay');
  // Baluev's FAP (lomb-scargle/false-alarm.ts) with its constants hoisted out of the search.
  const count = Math.round(n);
  const nh = count - 1;
  const w = fmax * t * Math.sqrt(Math.PI / 3);
  const gw = baluevGamma(nh) * w;
  const lnP = Math.log(p);
  // Bracket from the large-N guess z0 ≈ ln(W/p) + 2, Z ≈ 1 − e^(−2·z0/(N−3)); then regula
  // falsi with the Illinois modification (common practice, no source).
  let lo = 0;
  let hLo = -lnP;
  let hi = Math.min(1 - 1e-12, -Math.expm1((-2 * (Math.log(Math.max(1, w) / p) + 2)) / (count - 3)));
  let hHi = lnFapAbove(hi, count, gw, lnP);
  while (hHi > 0 && hi < 1 - 1e-12) {
    lo = hi;
    hLo = hHi;
    hi = 1 - (1 - hi) / 4;
    hHi = lnFapAbove(hi, count, gw, lnP);
  }
  if (!Number.isFinite(hHi)) {
    // FAP underflowed at hi: fall back to bisection on the sign.
    for (let i = 0; i < 60 && hi - lo > 1e-12; i++) {
      const mid = 0.5 * (lo + hi);
      if (lnFapAbove(mid, count, gw, lnP) > 0) lo = mid;
      else hi = mid;
    }
    return { power: hi, points: n, effectiveFrequencies: Math.max(1, w), falseAlarmProbability: p };
  }
  let side = 0;
  for (let i = 0; i < 100 && hi - lo > 1e-11; i++) {
    const x = (lo * hHi - hi * hLo) / (hHi - hLo);
    const hx = lnFapAbove(x, count, gw, lnP);
    if (Math.abs(hx) < 1e-11) {
      hi = x;
      break;
    }
    if (hx > 0) {
      lo = x;
      hLo = hx;
      if (side === -1) hHi /= 2;
      side = -1;
    } else {
      hi = x;
      hHi = hx;
      if (side === 1) hLo /= 2;
      side = 1;
    }
  }
  return { power: hi, points: n, effectiveFrequencies: Math.max(1, w), falseAlarmProbability: p };
}

/**
 * Probability that a sinusoid of non-centrality λ = n·A²/(2σ²) in n values of Gaussian noise
 * gives a standard-normalised power above Z0 at its own frequency. With the variance
 * estimated from the data, Z = X/(X + Y), X non-central χ² with 2 degrees of freedom (λ), Y
 * central χ² with m = n − 3 (the residual of the 3-parameter fit) — a non-central F tail:
 *   Pd = Σj Pois(j; λ/2) · P(NB(m/2, Z0) ≤ j),
 * NB the negative binomial, from the Poisson mixture of the non-central χ² and
 * I_x(a, b) = x^a·Σ_{i<b} (a)_i/i!·(1 − x)^i for whole b [derived here; the mixture from
 * Johnson, Kotz & Balakrishnan (1995), ch. 30, from memory]. As n → ∞ it becomes Marcum's
 * Q1(√λ, √(2·z0)) with z0 = (m/2)·Z0/(1 − Z0) — the large-N form of SCIENCE.md §6 — which
 * overstates the completeness of campaigns with few, precise nightly means.
 */
export function detectionProbability(noncentrality: number, threshold: DetectionThreshold): number {
  return evaluateDetection(requireNonNegative(noncentrality, 'noncentrality'), threshold);
}

/** 1/j for j = 0…n (index 0 unused), grown on demand: the sums multiply instead of dividing. */
let RECIPROCALS = new Float64Array(0);
function reciprocals(n: number): Float64Array {
  if (RECIPROCALS.length <= n) {
    const next = new Float64Array(Math.max(n + 1, 2 * RECIPROCALS.length, 256));
    for (let j = 1; j < next.length; j++) next[j] = 1 / j;
    RECIPROCALS = next;
  }
  return RECIPROCALS;
}

/** ln NB(i; a, z) = ln[Γ(a+i)/(Γ(a)·i!)·z^i·(1−z)^a] (only where the recurrence underflowed). */
function logNegativeBinomial(i: number, a: number, z: number): number {
  return logGamma(a + i) - logGamma(a) - logGamma(i + 1) + i * Math.log(z) + a * Math.log1p(-z);
}

/** dPd/dλ of the last {@link evaluateDetection} call (a scratch value: no allocation per call). */
let lastSlope = 0;

/**
 * Pd and, with `withSlope` (the inversion), in `lastSlope` its derivative in λ: dPd/dμ = Σj Pois(j; μ)·NB(j + 1), since
 * dPois(j; μ)/dμ = Pois(j − 1; μ) − Pois(j; μ) (μ = λ/2).
 */
function evaluateDetection(lam: number, threshold: DetectionThreshold, withSlope = false): number {
  lastSlope = 0;
  const z = threshold.power;
  if (threshold.points < 4 || z >= 1) return 0;
  if (z <= 0) return 1;
  const a = 0.5 * (threshold.points - 3);
  const mu = 0.5 * lam;
  // ±7σ of the mixing Poisson (plus a margin for small means) leaves out < 1e-11 of its weight.
  const spread = 7 * Math.sqrt(mu) + 6;
  const jMin = Math.max(0, Math.floor(mu - spread));
  const jMax = Math.ceil(mu + spread);
  // Negative binomial NB(i; a, z) = Γ(a+i)/(Γ(a)·i!)·z^i·(1−z)^a, cumulated up to jMin.
  let nb = Math.exp(a * Math.log1p(-z));
  let cdf = 0;
  let underflowed = nb === 0;
  const inv = reciprocals(jMax + 2);
  for (let i = 0; i <= jMin; i++) {
    cdf += nb;
    nb = underflowed ? Math.exp(logNegativeBinomial(i + 1, a, z)) : nb * (a + i) * z * inv[i + 1];
    if (underflowed && nb > 0) underflowed = false;
  }
  let pois = jMin === 0 ? Math.exp(-mu) : poissonTerm(jMin, mu);
  let sum = 0;
  let slope = 0;
  let j = jMin;
  // Terms in logarithms only while the recurrence underflows (rare: many points and a high threshold).
  for (; underflowed && j <= jMax; j++) {
    sum += pois * (cdf < 1 ? cdf : 1);
    slope += pois * nb;
    pois *= mu * inv[j + 1];
    cdf += nb;
    nb = Math.exp(logNegativeBinomial(j + 2, a, z));
    if (nb > 0) underflowed = false;
  }
  if (withSlope) {
    for (; j <= jMax; j++) {
      sum += pois * (cdf < 1 ? cdf : 1);
      slope += pois * nb;
      pois *= mu * inv[j + 1];
      cdf += nb;
      nb *= (a + j + 1) * z * inv[j + 2];
    }
  } else {
    for (; j <= jMax; j++) {
      sum += pois * (cdf < 1 ? cdf : 1);
      pois *= mu * inv[j + 1];
      cdf += nb;
      nb *= (a + j + 1) * z * inv[j + 2];
    }
  }
  lastSlope = 0.5 * slope;
  return sum < 0 ? 0 : sum > 1 ? 1 : sum;
}

/**
 * The non-centrality λ at which the detection probability is `completeness`: the inverse of
 * {@link detectionProbability} in λ (it increases with λ), by safeguarded Newton steps.
 */
export function noncentralityForCompleteness(completeness: number, threshold: DetectionThreshold): number {
  const c = requireInRange(completeness, 'completeness', 0, 1, true);
  // Plans ask the same threshold for the same level several times (goal, sizing, limits): the
  // last few answers are kept in a small ring (no per-threshold maps for the collector to trace).
  for (let i = 0; i < MEMO_SIZE; i++) {
    if (memoThresholds[i] === threshold && memoLevels[i] === c) return memoValues[i];
  }
  const lam = invertDetection(c, threshold);
  memoThresholds[memoNext] = threshold;
  memoLevels[memoNext] = c;
  memoValues[memoNext] = lam;
  memoNext = (memoNext + 1) % MEMO_SIZE;
  return lam;
}

const MEMO_SIZE = 8;
const memoThresholds: Array<DetectionThreshold | undefined> = new Array(MEMO_SIZE).fill(undefined);
const memoLevels = new Float64Array(MEMO_SIZE);
const memoValues = new Float64Array(MEMO_SIZE);
let memoNext = 0;

function invertDetection(c: number, threshold: DetectionThreshold): number {
  if (threshold.points < 4 || threshold.power >= 1) return c <= 0 ? 0 : Infinity;
  // Pd at λ = 0 in closed form: only the j = 0 term of the mixture, P(NB ≤ 0) = (1 − Z0)^(m/2).
  if (threshold.power <= 0 || Math.exp(0.5 * (threshold.points - 3) * Math.log1p(-threshold.power)) >= c) return 0;
  // Safeguarded Newton from the large-N guess (√λ ≈ √(2·z0) + Φ⁻¹(c), SCIENCE.md §6) with the
  // analytic slope; a step that leaves the bracket is replaced by bisection (common practice).
  const m = threshold.points - 3;
  const z0 = (0.5 * m * threshold.power) / (1 - threshold.power);
  let x = (Math.sqrt(2 * z0) + normalQuantile(c)) ** 2;
  if (!(x > 0)) x = 1;
  let lo = 0;
  let hi = Infinity;
  for (let i = 0; i < 100; i++) {
    const f = evaluateDetection(x, threshold, true) - c;
    const slope = lastSlope;
    if (Math.abs(f) < 1e-10) return x;
    // Newton converges quadratically: a step below 1e-7·λ leaves an error near 1e-14·λ.
    if (slope > 0 && Math.abs(f / slope) < 1e-7 * x) return x - f / slope;
    if (f < 0) lo = x;
    else hi = x;
    let next = slope > 0 ? x - f / slope : Number.NaN;
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? 0.5 * (lo + hi) : Math.max(2 * x, x + 8);
    if (Number.isFinite(hi) && hi - lo < 1e-9 * hi) return hi;
    if (next > 1e9) return Infinity;
    x = next;
  }
  return x;
}

/**
 * Φ⁻¹(p), the standard normal quantile: Acklam's rational approximation (relative error
 * ≈ 1e-9; common practice, no source). Used only for starting values.
 */
export function normalQuantile(p: number): number {
  if (p <= 0) return -Infinity;
  if (p >= 1) return Infinity;
  const a = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628277459239];
  const b = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
  const c = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  if (p < low) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  if (p > 1 - low) {
    const q = Math.sqrt(-2 * Math.log1p(-p));
    return -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return (
    ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) /
    (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1)
  );
}

/** Noise of one night's mean of k visits: σ_night² = σ_white²/k + σ_floor² ({@link NIGHTLY_NOISE_SOURCE}). */
export function nightlySigmaPpm(whiteSigmaPpm: number, floorSigmaPpm: number, visitsPerNight: number): number {
  const k = requirePositive(visitsPerNight, 'visitsPerNight');
  return Math.sqrt(requireNonNegative(whiteSigmaPpm, 'whiteSigmaPpm') ** 2 / k + requireNonNegative(floorSigmaPpm, 'floorSigmaPpm') ** 2);
}

/** λ of a campaign of n nights with nightly noise σ_night: n·A²/(2σ_night²). */
export function campaignNoncentrality(nights: number, semiAmplitudePpm: number, nightlySigma: number): number {
  const s = requirePositive(nightlySigma, 'nightlySigmaPpm');
  return (requireNonNegative(nights, 'nights') * requireNonNegative(semiAmplitudePpm, 'semiAmplitudePpm') ** 2) / (2 * s * s);
}

/** Frequency and period precision of a sinusoid fit (Montgomery & O'Donoghue 1999). */
export function periodPrecision(input: {
  visits: number;
  sigmaPpm: number;
  semiAmplitudePpm: number;
  baselineDays: number;
  periodDays: number;
}): { sigmaFrequencyPerDay: number; sigmaPeriodDays: number } {
  const n = requirePositive(input.visits, 'visits');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const a = requirePositive(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const t = requirePositive(input.baselineDays, 'baselineDays');
  const p = requirePositive(input.periodDays, 'periodDays');
  const sigmaF = (Math.sqrt(6 / n) * s) / (Math.PI * a * t);
  return { sigmaFrequencyPerDay: sigmaF, sigmaPeriodDays: p * p * sigmaF };
}

/**
 * Baseline that gives the requested period precision with N visits: the σP formula solved
 * for T, T = P²·sqrt(6/N)·σ/(π·A·σP) [derived from Montgomery & O'Donoghue 1999].
 */
export function baselineForPeriodPrecision(input: {
  visits: number;
  sigmaPpm: number;
  semiAmplitudePpm: number;
  periodDays: number;
  periodPrecisionDays: number;
}): number {
  const n = requirePositive(input.visits, 'visits');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const a = requirePositive(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const p = requirePositive(input.periodDays, 'periodDays');
  const sp = requirePositive(input.periodPrecisionDays, 'periodPrecisionDays');
  return (p * p * Math.sqrt(6 / n) * s) / (Math.PI * a * sp);
}

/** ln FAP(z) − ln p of the threshold search in detectionThreshold (decreasing in z); gw = γ(N−1)·W. */
function lnFapAbove(z: number, count: number, gw: number, lnP: number): number {
  const l = Math.log1p(-z);
  const single = Math.exp(0.5 * (count - 3) * l);
  const tau = gw * Math.exp(0.5 * (count - 4) * l) * Math.sqrt(0.5 * (count - 1) * z);
  return Math.log(-Math.expm1(-tau) + single * Math.exp(-tau)) - lnP;
}
