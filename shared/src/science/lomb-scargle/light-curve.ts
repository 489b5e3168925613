/**
 * Light curves as the periodogram takes them, and their validation and preparation
 * (weights, centring, time origin) shared by every evaluation method.
 */
import { ScienceInputError } from '../science-input-error';

/** A time series: times in days, values (magnitude or flux), optional 1σ uncertainties. */
export interface LightCurve {
  timeDays: ArrayLike<number>;
  values: ArrayLike<number>;
  /** 1σ uncertainty of each value, same unit as the values (absent: equal weights). */
  uncertainties?: ArrayLike<number>;
}

/** A validated light curve, ready for the sums of the periodogram. */
export interface PreparedLightCurve {
  n: number;
  /** Times minus `timeOriginDays` (the earliest time): the power does not depend on the origin. */
  t: Float64Array;
  /** Values minus their weighted mean. */
  y: Float64Array;
  /** Weights 1/σ², normalised to sum 1 (equal when no uncertainties). */
  w: Float64Array;
  /** Σ w·y² of the centred values. */
  yy: number;
  timeOriginDays: number;
  baselineDays: number;
  weightedMean: number;
  hasUncertainties: boolean;
  /** Weighted variance of the times, for the Baluev effective baseline (unweighted when no uncertainties). */
  timeVariance: number;
}

/** True for a light curve already through {@link prepareLightCurve} (its typed arrays and sums). */
export function isPreparedLightCurve(lc: LightCurve | PreparedLightCurve): lc is PreparedLightCurve {
  return (lc as PreparedLightCurve).yy !== undefined && (lc as PreparedLightCurve).w instanceof Float64Array;
}

/** Minimum number of points: the floating-mean sinusoid has 3 parameters. */
export const MIN_POINTS = 4;

/**
 * Validates and prepares a light curve. Throws {@link ScienceInputError} naming the row
 * (`series[3].timeDays`, `series[3].value`, `series[3].uncertainty`) for a non-finite value, a
 * non-positive uncertainty or a duplicate time; `series` for too few points or constant values.
 */
export function prepareLightCurve(lc: LightCurve): PreparedLightCurve {
  if (typeof lc !== 'object' || lc === null || !lc.timeDays || !lc.values) throw new ScienceInputError('series', 'is missing');
  const n = lc.timeDays.length;
  if (lc.values.length !== n) {
    throw new ScienceInputError('series', `has ${n} times but ${lc.values.length} values`);
  }
  if (lc.uncertainties && lc.uncertainties.length !== n) {
    throw new ScienceInputError('series', `has ${n} times but ${lc.uncertainties.length} uncertainties`);
  }
  if (n < MIN_POINTS) throw new ScienceInputError('series', `needs at least ${MIN_POINTS} points (got ${n})`);

  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const w = new Float64Array(n);
  let tMin = Infinity;
  let tMax = -Infinity;
  const src = lc.timeDays;
  const vals = lc.values;
  const errs = lc.uncertainties;
  let wSum = 0;
  for (let i = 0; i < n; i++) {
    const ti = src[i];
    const yi = vals[i];
    if (typeof ti !== 'number' || !Number.isFinite(ti))
      throw new ScienceInputError(`series[${i}].timeDays`, `must be a finite number (got ${String(ti)})`);
    if (typeof yi !== 'number' || !Number.isFinite(yi))
      throw new ScienceInputError(`series[${i}].value`, `must be a finite number (got ${String(yi)})`);
    let wi = 1;
    if (errs) {
      const e = errs[i];
      if (typeof e !== 'number' || !Number.isFinite(e) || e <= 0) {
        throw new ScienceInputError(`series[${i}].uncertainty`, `must be a positive finite number (got ${String(e)})`);
      }
      wi = 1 / (e * e);
      if (!Number.isFinite(wi)) throw new ScienceInputError(`series[${i}].uncertainty`, `is too small (${e})`);
    }
    t[i] = ti;
    y[i] = yi;
    w[i] = wi;
    wSum += wi;
    if (ti < tMin) tMin = ti;
    if (ti > tMax) tMax = ti;
  }
  checkDuplicateTimes(t);

  let mean = 0;
  let tMean = 0;
  for (let i = 0; i < n; i++) {
    w[i] /= wSum;
    t[i] -= tMin;
    mean += w[i] * y[i];
    tMean += w[i] * t[i];
  }
  let yy = 0;
  let tVar = 0;
  for (let i = 0; i < n; i++) {
    const d = y[i] - mean;
    y[i] = d;
    yy += w[i] * d * d;
    const dt = t[i] - tMean;
    tVar += w[i] * dt * dt;
  }
  if (!(yy > 0)) throw new ScienceInputError('series', 'values are all equal: there is nothing to fit');
  return {
    n,
    t,
    y,
    w,
    yy,
    timeOriginDays: tMin,
    baselineDays: tMax - tMin,
    weightedMean: mean,
    hasUncertainties: Boolean(errs),
    timeVariance: tVar,
  };
}

/** Throws naming the later row of the first pair of equal times. */
function checkDuplicateTimes(t: Float64Array): void {
  const sorted = t.slice().sort();
  let dup = false;
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i] === sorted[i - 1]) {
      dup = true;
      break;
    }
  }
  if (!dup) return;
  const seen = new Map<number, number>();
  for (let i = 0; i < t.length; i++) {
    const first = seen.get(t[i]);
    if (first !== undefined) {
      throw new ScienceInputError(`series[${i}].timeDays`, `duplicates the time of series[${first}] (${t[i]}); merge or drop one`);
    }
    seen.set(t[i], i);
  }
}
