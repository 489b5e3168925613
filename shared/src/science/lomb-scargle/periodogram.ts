/**
 * Periodogram analysis of returned photometry: the power on a grid, the best period and its
 * false-alarm probability, the strongest K peaks, and the best-fit sinusoid.
 */
import { ScienceInputError, requireFinite, requireInteger, requireOneOf } from '../science-input-error';
import { PPM_PER_MMAG } from '../spot-amplitude';
import { BALUEV_SOURCE, baluevFalseAlarmProbability } from './false-alarm';
import {
  type AutoGridOptions,
  type FrequencyGrid,
  FREQUENCY_GRID_SOURCE,
  autoFrequencyGrid,
  gridMaxFrequency,
  validateGrid,
} from './frequency-grid';
import { type LightCurve, type PreparedLightCurve, isPreparedLightCurve, prepareLightCurve } from './light-curve';
import {
  type FastMethodOptions,
  type LombScargleMethod,
  FAST_METHOD_SOURCE,
  LOMB_SCARGLE_METHODS,
  LOMB_SCARGLE_SOURCE,
  lombScarglePower,
  lombScarglePowerAt,
} from './lomb-scargle-power';

/** The best-fit sinusoid y(t) = offset + A·sin(2πf(t − t_ref) + φ) (weighted least squares). */
export interface SinusoidFit {
  frequencyPerDay: number;
  /** Mean level, in the unit of the values. */
  offset: number;
  /** Semi-amplitude A ≥ 0, in the unit of the values. */
  semiAmplitude: number;
  /** Phase φ in radians, (−π, π], at `referenceTimeDays`. */
  phaseRad: number;
  /** t_ref: the earliest time of the series. */
  referenceTimeDays: number;
  /** Coefficients of sin and cos of 2πf(t − t_ref). */
  sinCoefficient: number;
  cosCoefficient: number;
}

/**
 * Weighted least-squares fit of offset + a·sin + b·cos at one frequency, as astropy's
 * `LombScargle.model_parameters` (design matrix [1, sin, cos]/dy against (y − ȳ)/dy), with
 * times counted from the earliest one.
 */
export function fitSinusoid(lc: LightCurve | PreparedLightCurve, frequencyPerDay: number): SinusoidFit {
  const data = isPreparedLightCurve(lc) ? lc : prepareLightCurve(lc);
  const f = requireFinite(frequencyPerDay, 'frequencyPerDay');
  if (f <= 0) throw new ScienceInputError('frequencyPerDay', `must be positive (got ${f})`);
  const { n, t, y, w } = data;
  // Normal equations with weights w (the scale of w cancels).
  let s1 = 0,
    ss = 0,
    sc = 0,
    sss = 0,
    ssc = 0,
    scc = 0,
    sy = 0,
    ssy = 0,
    scy = 0;
  const omega = 2 * Math.PI * f;
  for (let i = 0; i < n; i++) {
    const wi = w[i];
    const s = Math.sin(omega * t[i]);
    const c = Math.cos(omega * t[i]);
    const yi = y[i];
    s1 += wi;
    ss += wi * s;
    sc += wi * c;
    sss += wi * s * s;
    ssc += wi * s * c;
    scc += wi * c * c;
    sy += wi * yi;
    ssy += wi * s * yi;
    scy += wi * c * yi;
  }
  const theta = solve3([s1, ss, sc, ss, sss, ssc, sc, ssc, scc], [sy, ssy, scy]);
  if (!theta) throw new ScienceInputError('frequencyPerDay', `the sinusoid is degenerate at ${f} d⁻¹ for these times`);
  const [c0, a, b] = theta;
  return {
    frequencyPerDay: f,
    offset: data.weightedMean + c0,
    semiAmplitude: Math.hypot(a, b),
    phaseRad: Math.atan2(b, a),
    referenceTimeDays: data.timeOriginDays,
    sinCoefficient: a,
    cosCoefficient: b,
  };
}

/** Solves a 3×3 system (row-major) by Gaussian elimination with partial pivoting; null if singular. */
function solve3(m: number[], r: number[]): [number, number, number] | null {
  const a = [m.slice(0, 3).concat(r[0]), m.slice(3, 6).concat(r[1]), m.slice(6, 9).concat(r[2])];
  for (let col = 0; col < 3; col++) {
    let p = col;
    for (let row = col + 1; row < 3; row++) if (Math.abs(a[row][col]) > Math.abs(a[p][col])) p = row;
    if (Math.abs(a[p][col]) < 1e-300) return null;
    [a[col], a[p]] = [a[p], a[col]];
    for (let row = col + 1; row < 3; row++) {
      const k = a[row][col] / a[col][col];
      for (let j = col; j < 4; j++) a[row][j] -= k * a[col][j];
    }
  }
  const x = [0, 0, 0];
  for (let row = 2; row >= 0; row--) {
    let s = a[row][3];
    for (let j = row + 1; j < 3; j++) s -= a[row][j] * x[j];
    x[row] = s / a[row][row];
  }
  if (!x.every(Number.isFinite)) return null;
  return [x[0], x[1], x[2]];
}

/** What the values are: magnitudes, or fluxes (any unit; amplitudes are then relative to the mean). */
export const VALUE_KINDS = ['mag', 'flux'] as const;
export type ValueKind = (typeof VALUE_KINDS)[number];

export interface PeriodogramOptions extends AutoGridOptions, FastMethodOptions {
  method?: LombScargleMethod;
  /** An explicit grid instead of the automatic one. */
  grid?: FrequencyGrid;
  /** Number of peaks to list (default 5). */
  top?: number;
  /** Values are magnitudes (default) or fluxes. */
  valueKind?: ValueKind;
}

export interface PeriodogramPeak {
  frequencyPerDay: number;
  periodDays: number;
  power: number;
  /** Baluev (2008) false-alarm probability of a peak this high anywhere up to the grid's fmax. */
  falseAlarmProbability: number;
}

export interface PeriodogramResult {
  method: LombScargleMethod;
  normalization: 'standard';
  pointCount: number;
  baselineDays: number;
  hasUncertainties: boolean;
  grid: FrequencyGrid & { maxFrequencyPerDay: number };
  /**
   * The best peak, refined between the grid's neighbours on the exact power (golden-section
   * search); `power` and `falseAlarmProbability` are exact values at the refined frequency.
   */
  best: PeriodogramPeak & {
    /**
     * 1σ period uncertainty from the fit: σP = P²·sqrt(6/N)·σ/(π·A·T) with σ the residual rms
     * (Montgomery & O'Donoghue 1999, from memory); null when the amplitude is zero.
     */
    periodUncertaintyDays: number | null;
    /** The grid point of the peak and the method's power there (the fast method is approximate). */
    gridFrequencyPerDay: number;
    gridPower: number;
    fit: SinusoidFit;
    /** Rms of the residuals from the fitted sinusoid, unit of the values. */
    residualRms: number;
    /** Semi-amplitude in ppm of the mean flux (from mag via 920.6 ppm/mmag, or flux/mean). */
    semiAmplitudePpm: number;
  };
  /** Strongest local maxima, highest first (the best peak included). */
  peaks: PeriodogramPeak[];
  sources: { periodogram: string; grid: string; falseAlarm: string; fastMethod?: string };
}

/** Full analysis: grid, power, best period, FAP, top peaks, fitted sinusoid. */
export function analyzePeriodogram(lc: LightCurve, options: PeriodogramOptions = {}): PeriodogramResult {
  const data = prepareLightCurve(lc);
  const method = requireOneOf(options.method ?? 'fast', 'method', LOMB_SCARGLE_METHODS);
  const top = requireInteger(options.top ?? 5, 'top', 1);
  const kind = requireOneOf(options.valueKind ?? 'mag', 'valueKind', VALUE_KINDS);
  if (!(data.baselineDays > 0)) throw new ScienceInputError('series', 'all times are equal');
  const grid = options.grid ? validateGrid(options.grid) : autoFrequencyGrid(data.baselineDays, data.n, options);
  const power = lombScarglePower(data, grid, { method, oversampling: options.oversampling, order: options.order });
  const fmax = gridMaxFrequency(grid);
  const fap = (z: number) =>
    baluevFalseAlarmProbability(z, { pointCount: data.n, maximumFrequencyPerDay: fmax, timeVarianceDays2: data.timeVariance });

  const peakIdx = topPeaks(power, top);
  const freqAt = (k: number) => grid.minFrequencyPerDay + grid.stepPerDay * k;
  const peaks: PeriodogramPeak[] = peakIdx.map((k) => {
    const f = freqAt(k);
    return { frequencyPerDay: f, periodDays: f > 0 ? 1 / f : Infinity, power: power[k], falseAlarmProbability: fap(power[k]) };
  });
  const bestPeak = peaks[0];
  if (!bestPeak || !(bestPeak.frequencyPerDay > 0)) throw new ScienceInputError('series', 'no periodogram peak above zero frequency');
  // The grid point is within half a step of the peak: refine on the exact power.
  const refined = refinePeak(data, bestPeak.frequencyPerDay, grid.stepPerDay);
  const fit = fitSinusoid(data, refined.frequencyPerDay);
  const semiAmplitudePpm = kind === 'mag' ? fit.semiAmplitude * 1000 * PPM_PER_MMAG : (fit.semiAmplitude / Math.abs(fit.offset)) * 1e6;
  const residualRms = residualRmsOf(data, fit);
  const sigmaF =
    fit.semiAmplitude > 0 ? (Math.sqrt(6 / data.n) * residualRms) / (Math.PI * fit.semiAmplitude * data.baselineDays) : Infinity;
  const periodUncertaintyDays = sigmaF / (refined.frequencyPerDay * refined.frequencyPerDay);
  return {
    method,
    normalization: 'standard',
    pointCount: data.n,
    baselineDays: data.baselineDays,
    hasUncertainties: data.hasUncertainties,
    grid: { ...grid, maxFrequencyPerDay: fmax },
    best: {
      frequencyPerDay: refined.frequencyPerDay,
      periodDays: 1 / refined.frequencyPerDay,
      periodUncertaintyDays: Number.isFinite(periodUncertaintyDays) ? periodUncertaintyDays : null,
      power: refined.power,
      falseAlarmProbability: fap(refined.power),
      gridFrequencyPerDay: bestPeak.frequencyPerDay,
      gridPower: bestPeak.power,
      fit,
      residualRms,
      semiAmplitudePpm: Number.isFinite(semiAmplitudePpm) ? semiAmplitudePpm : 0,
    },
    peaks,
    sources: {
      periodogram: LOMB_SCARGLE_SOURCE,
      grid: FREQUENCY_GRID_SOURCE,
      falseAlarm: BALUEV_SOURCE,
      ...(method === 'fast' ? { fastMethod: FAST_METHOD_SOURCE } : {}),
    },
  };
}

/**
 * Maximises the exact power on [f − df, f + df] by golden-section search (the grid's
 * neighbours bracket the peak; common practice, no source).
 */
export function refinePeak(
  data: PreparedLightCurve,
  frequencyPerDay: number,
  stepPerDay: number,
): { frequencyPerDay: number; power: number } {
  const g = (Math.sqrt(5) - 1) / 2;
  let a = Math.max(frequencyPerDay - stepPerDay, frequencyPerDay * 1e-3);
  let b = frequencyPerDay + stepPerDay;
  const p = (f: number) => lombScarglePowerAt(data, [f])[0];
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let pc = p(c);
  let pd = p(d);
  for (let i = 0; i < 40 && b - a > 1e-12 * frequencyPerDay; i++) {
    if (pc > pd) {
      b = d;
      d = c;
      pd = pc;
      c = b - g * (b - a);
      pc = p(c);
    } else {
      a = c;
      c = d;
      pc = pd;
      d = a + g * (b - a);
      pd = p(d);
    }
  }
  const f = pc > pd ? c : d;
  const best = Math.max(pc, pd);
  const atGrid = p(frequencyPerDay);
  return atGrid >= best ? { frequencyPerDay, power: atGrid } : { frequencyPerDay: f, power: best };
}

function residualRmsOf(data: PreparedLightCurve, fit: SinusoidFit): number {
  const omega = 2 * Math.PI * fit.frequencyPerDay;
  const c0 = fit.offset - data.weightedMean;
  let s = 0;
  for (let i = 0; i < data.n; i++) {
    const x = omega * data.t[i];
    const r = data.y[i] - (c0 + fit.sinCoefficient * Math.sin(x) + fit.cosCoefficient * Math.cos(x));
    s += r * r;
  }
  return Math.sqrt(s / data.n);
}

/** Indices of the `k` highest local maxima (edges count when higher than their neighbour), highest first. */
export function topPeaks(power: Float64Array, k: number): number[] {
  const n = power.length;
  const idx: number[] = [];
  const val: number[] = [];
  for (let i = 0; i < n; i++) {
    const p = power[i];
    if ((i > 0 && power[i - 1] > p) || (i < n - 1 && power[i + 1] >= p)) continue;
    if (idx.length === k && p <= val[k - 1]) continue;
    // Insert keeping descending order (k is small): replace the smallest, then bubble up.
    let j: number;
    if (idx.length < k) {
      idx.push(i);
      val.push(p);
      j = idx.length - 1;
    } else {
      j = k - 1;
      idx[j] = i;
      val[j] = p;
    }
    while (j > 0 && val[j - 1] < val[j]) {
      [idx[j - 1], idx[j]] = [idx[j], idx[j - 1]];
      [val[j - 1], val[j]] = [val[j], val[j - 1]];
      j--;
    }
  }
  if (idx.length === 0 && n > 0) {
    let best = 0;
    for (let i = 1; i < n; i++) if (power[i] > power[best]) best = i;
    idx.push(best);
  }
  return idx;
}
