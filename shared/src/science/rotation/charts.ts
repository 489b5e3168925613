/**
 * Thinning of the series sent to the charts (a few thousand points at most), and the power
 * levels of given false-alarm probabilities.
 */
import type { MeasurementCharts } from '../../photometry/photometry';
import { type BaluevInput, baluevFalseAlarmProbability } from '../lomb-scargle/false-alarm';

export const CHART_LIMITS = { spectrum: 2000, lightCurve: 3000, folded: 2000, phaseBins: 50 } as const;
export const FALSE_ALARM_LEVELS = [0.1, 0.01, 0.001] as const;

/**
 * At most `max` points of a spectrum: the grid cut into equal stretches, each represented by
 * its highest point (so that no peak disappears).
 */
export function thinSpectrum(frequency: ArrayLike<number>, power: ArrayLike<number>, max: number = CHART_LIMITS.spectrum) {
  const n = power.length;
  const f: number[] = [];
  const p: number[] = [];
  if (n <= max) {
    for (let i = 0; i < n; i++) {
      f.push(frequency[i]);
      p.push(power[i]);
    }
    return { frequencyPerDay: f, power: p };
  }
  const stretch = n / max;
  for (let s = 0; s < max; s++) {
    const a = Math.floor(s * stretch);
    const b = Math.min(n, Math.floor((s + 1) * stretch));
    let best = a;
    for (let i = a + 1; i < b; i++) if (power[i] > power[best]) best = i;
    f.push(frequency[best]);
    p.push(power[best]);
  }
  return { frequencyPerDay: f, power: p };
}

/**
 * The light curve for display, days since `epoch`: as is up to {@link CHART_LIMITS}.lightCurve
 * points, else averaged in equal time bins (baseline / limit wide; empty bins skipped), with
 * the error of each mean (from the errors, or the scatter in the bin over sqrt(n)).
 */
export function displayLightCurve(
  t: Float64Array,
  y: Float64Array,
  e: Float64Array | null,
  epoch: number,
  max: number = CHART_LIMITS.lightCurve,
): MeasurementCharts['lightCurve'] {
  const n = t.length;
  if (n <= max) {
    return { timeDays: Array.from(t, (v) => v - epoch), values: Array.from(y), errors: e ? Array.from(e) : null };
  }
  const width = (t[n - 1] - t[0]) / max;
  const timeDays: number[] = [];
  const values: number[] = [];
  const errors: number[] = [];
  let i = 0;
  while (i < n) {
    const bin = Math.min(max - 1, Math.floor((t[i] - t[0]) / width));
    let j = i;
    let st = 0;
    let sy = 0;
    let syy = 0;
    let sw = 0;
    while (j < n && Math.min(max - 1, Math.floor((t[j] - t[0]) / width)) === bin) {
      st += t[j];
      sy += y[j];
      syy += y[j] * y[j];
      if (e) sw += 1 / (e[j] * e[j]);
      j++;
    }
    const k = j - i;
    const mean = sy / k;
    timeDays.push(st / k - epoch);
    values.push(mean);
    const scatter = k > 1 ? Math.sqrt(Math.max(0, syy / k - mean * mean) / (k - 1)) : 0;
    errors.push(e ? 1 / Math.sqrt(sw) : scatter);
    i = j;
  }
  return { timeDays, values, errors: e || errors.some((v) => v > 0) ? errors : null };
}

/** Folded at `frequency` from `epoch`: at most `max` points (an even stride) and the mean in each phase bin (all points). */
export function foldedCurve(
  t: Float64Array,
  y: Float64Array,
  epoch: number,
  frequencyPerDay: number,
  max: number = CHART_LIMITS.folded,
  binCount: number = CHART_LIMITS.phaseBins,
): MeasurementCharts['folded'] {
  const n = t.length;
  const stride = Math.max(1, Math.ceil(n / max));
  const phase: number[] = [];
  const values: number[] = [];
  const sums = new Float64Array(binCount);
  const counts = new Int32Array(binCount);
  for (let i = 0; i < n; i++) {
    const x = (t[i] - epoch) * frequencyPerDay;
    const ph = x - Math.floor(x);
    const b = Math.min(binCount - 1, Math.floor(ph * binCount));
    sums[b] += y[i];
    counts[b]++;
    if (i % stride === 0) {
      phase.push(ph);
      values.push(y[i]);
    }
  }
  const bins: { phase: number; mean: number; count: number }[] = [];
  for (let b = 0; b < binCount; b++)
    if (counts[b] > 0) bins.push({ phase: (b + 0.5) / binCount, mean: sums[b] / counts[b], count: counts[b] });
  return { phase, values, bins };
}

/** The power whose Baluev false-alarm probability is `p` (bisection; the FAP falls as the power rises). */
export function powerForFalseAlarm(p: number, input: BaluevInput): number {
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (baluevFalseAlarmProbability(mid, input) > p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
