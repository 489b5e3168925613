/**
 * The double-period check. A star with two spot groups on opposite sides shows two dips per
 * rotation, and the periodogram's highest peak is then at half the rotation period (its first
 * harmonic); the rotation period is twice the best period (common practice, no source: the
 * usual caution of rotation-period surveys). A single sinusoid cannot tell: the check fits two
 * harmonics of the doubled period, y = c + Σₖ₌₁,₂ (aₖ·sin(2πk·t/2P) + bₖ·cos(2πk·t/2P)), whose
 * k = 2 term is the best period's sinusoid, and flags the best period when the odd harmonic
 * improves the weighted fit more than noise would: N·ln(χ²₁/χ²₂) ≥ 13.8, the 0.1 % point of χ²
 * with 2 degrees of freedom (two extra parameters; Wilks (1938), Ann. Math. Stat. 9, 60, from
 * memory). Only when the doubled period fits in the time covered.
 */
import type { PreparedLightCurve } from '../lomb-scargle/light-curve';

export const DOUBLE_PERIOD_THRESHOLD = 13.8;

export const DOUBLE_PERIOD_RULE_TEXT =
  'The period may be twice the best one (two spot groups give two dips per turn) when adding the doubled period’s own sinusoid to the fit improves it more than noise would: likelihood ratio N·ln(χ² one harmonic / χ² two harmonics) of at least 13.8, the 0.1 % level for two extra parameters.';

export interface DoublePeriodCheck {
  flagged: boolean;
  /** The doubled period, days (null when it does not fit in the time covered). */
  doublePeriodDays: number | null;
  /** N·ln(χ²₁/χ²₂) (null when not evaluated). */
  likelihoodRatio: number | null;
  /** Semi-amplitude of the doubled period's own sinusoid, in the value's unit (null when not evaluated). */
  oddAmplitude: number | null;
  message: string | null;
}

/** Weighted least squares of y on the columns (normal equations, Gaussian elimination); the weighted χ² of the residuals, or NaN. */
function weightedChiSquare(data: PreparedLightCurve, columns: ((i: number) => number)[]): { chi2: number; coefficients: number[] } {
  const m = columns.length;
  const a = Array.from({ length: m }, () => new Float64Array(m + 1));
  const row = new Float64Array(m);
  for (let i = 0; i < data.n; i++) {
    for (let j = 0; j < m; j++) row[j] = columns[j](i);
    const w = data.w[i];
    for (let j = 0; j < m; j++) {
      for (let k = j; k < m; k++) a[j][k] += w * row[j] * row[k];
      a[j][m] += w * row[j] * data.y[i];
    }
  }
  for (let j = 0; j < m; j++) for (let k = 0; k < j; k++) a[j][k] = a[k][j];
  for (let col = 0; col < m; col++) {
    let pivot = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    if (!(Math.abs(a[pivot][col]) > 1e-300)) return { chi2: NaN, coefficients: [] };
    [a[col], a[pivot]] = [a[pivot], a[col]];
    for (let r = col + 1; r < m; r++) {
      const factor = a[r][col] / a[col][col];
      for (let k = col; k <= m; k++) a[r][k] -= factor * a[col][k];
    }
  }
  const x = new Array<number>(m).fill(0);
  for (let r = m - 1; r >= 0; r--) {
    let s = a[r][m];
    for (let k = r + 1; k < m; k++) s -= a[r][k] * x[k];
    x[r] = s / a[r][r];
  }
  let chi2 = 0;
  for (let i = 0; i < data.n; i++) {
    let model = 0;
    for (let j = 0; j < m; j++) model += x[j] * columns[j](i);
    const r = data.y[i] - model;
    chi2 += data.w[i] * r * r;
  }
  return { chi2, coefficients: x };
}

/** Whether the best period (frequency `f`, 1/d) may be half the rotation period. */
export function checkDoublePeriod(data: PreparedLightCurve, f: number): DoublePeriodCheck {
  const none: DoublePeriodCheck = { flagged: false, doublePeriodDays: null, likelihoodRatio: null, oddAmplitude: null, message: null };
  const doubled = 2 / f;
  if (!(doubled <= data.baselineDays) || data.n < 10) return none;
  const w2 = 2 * Math.PI * f;
  const w1 = w2 / 2;
  const one = () => 1;
  const s2 = (i: number) => Math.sin(w2 * data.t[i]);
  const c2 = (i: number) => Math.cos(w2 * data.t[i]);
  const s1 = (i: number) => Math.sin(w1 * data.t[i]);
  const c1 = (i: number) => Math.cos(w1 * data.t[i]);
  const single = weightedChiSquare(data, [one, s2, c2]);
  const double = weightedChiSquare(data, [one, s2, c2, s1, c1]);
  if (!Number.isFinite(single.chi2) || !Number.isFinite(double.chi2) || !(double.chi2 > 0)) {
    return { ...none, doublePeriodDays: doubled };
  }
  const ratio = data.n * Math.log(single.chi2 / double.chi2);
  const oddAmplitude = Math.hypot(double.coefficients[3], double.coefficients[4]);
  const flagged = ratio >= DOUBLE_PERIOD_THRESHOLD;
  return {
    flagged,
    doublePeriodDays: doubled,
    likelihoodRatio: ratio,
    oddAmplitude,
    message: flagged
      ? `The rotation period may be ${doubled.toFixed(3)} d, twice the best period: folded at ${doubled.toFixed(3)} d the two dips differ more than noise allows (likelihood ratio ${ratio.toFixed(1)} ≥ ${DOUBLE_PERIOD_THRESHOLD}), as when two spot groups face the observer in turn.`
      : null,
  };
}
