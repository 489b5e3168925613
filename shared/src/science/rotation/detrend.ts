/**
 * Detrending before the periodogram, each step optional and recorded in plain words:
 * 1. zero points per node, or per node and night, removed;
 * 2. iterative clipping about the median with a robust σ = 1.4826·MAD (the median absolute
 *    deviation scaled to a Gaussian σ; Rousseeuw & Croux (1993), JASA 88, 1273, from memory);
 * 3. binning to a fixed interval.
 * Times must be sorted (measureRotation sorts them).
 */
import type { DetrendOptions, LightCurveValueKind } from '../../photometry/photometry';
import { countOf, fmt } from '../explained';
import { jdToIso } from './time-systems';

/** A night: points of one node separated by gaps of at most this many days. */
export const NIGHT_GAP_DAYS = 0.3;
/** MAD → σ for Gaussian noise. */
export const MAD_TO_SIGMA = 1.4826;
/** Iterations of the clipping at most. */
export const MAX_CLIP_ITERATIONS = 10;
/** Zero points listed at most (the count of all is given). */
export const MAX_LISTED_OFFSETS = 50;
export const DETREND_SOURCES = {
  clipping: 'Robust σ = 1.4826·MAD: Rousseeuw & Croux (1993), JASA 88, 1273 (from memory); iterative clipping: common practice, no source',
  offsets: 'Zero points per node (and night) by the median: common practice in differential photometry, no source',
  binning: 'Binning: weighted mean, error 1/sqrt(Σ1/σ²), or the pooled within-bin scatter / sqrt(n): common practice, no source',
};

export interface Series {
  t: Float64Array;
  y: Float64Array;
  /** 1σ errors, or null. */
  e: Float64Array | null;
  nodes: (string | null)[];
}

export interface DetrendResult extends Series {
  pointsClipped: number;
  offsets: { label: string; value: number }[];
  offsetCount: number;
  binnedPoints: number | null;
  steps: string[];
  /** Points dropped with their zero point (a night of one point: nothing left once its zero point is removed). */
  pointsDropped: number;
}

/** Median of a copy of the values. */
export function median(values: ArrayLike<number>): number {
  const a = Float64Array.from(values).sort();
  const n = a.length;
  if (n === 0) return NaN;
  return n % 2 === 1 ? a[(n - 1) >> 1] : 0.5 * (a[n / 2 - 1] + a[n / 2]);
}

/** The selected points of a series. */
function subset(s: Series, keep: Uint8Array): Series {
  let m = 0;
  for (let i = 0; i < keep.length; i++) m += keep[i];
  const t = new Float64Array(m);
  const y = new Float64Array(m);
  const e = s.e ? new Float64Array(m) : null;
  const nodes: (string | null)[] = new Array<string | null>(m);
  for (let i = 0, j = 0; i < keep.length; i++) {
    if (!keep[i]) continue;
    t[j] = s.t[i];
    y[j] = s.y[i];
    if (e && s.e) e[j] = s.e[i];
    nodes[j] = s.nodes[i];
    j++;
  }
  return { t, y, e, nodes };
}

/** Runs the chosen steps on a time-sorted series. */
export function detrendSeries(input: Series, kind: LightCurveValueKind, options: DetrendOptions): DetrendResult {
  const steps: string[] = [];
  let s: Series = { t: input.t, y: Float64Array.from(input.y), e: input.e, nodes: input.nodes };
  let offsets: { label: string; value: number }[] = [];
  let offsetCount = 0;
  let pointsDropped = 0;

  const anyNode = input.nodes.some((node) => node !== null);
  if (options.offsets === 'node' && !anyNode) {
    steps.push('The points name no node: there is no zero point to remove between nodes.');
  } else if (options.offsets !== 'none') {
    const r = removeZeroPoints(s, kind, options.offsets);
    s = r.series;
    offsets = r.offsets.slice(0, MAX_LISTED_OFFSETS);
    offsetCount = r.offsets.length;
    pointsDropped = r.dropped;
    steps.push(...r.steps);
  } else {
    steps.push('No zero points removed: the points of every node are compared as they are.');
  }

  let pointsClipped = 0;
  if (options.clipSigma !== null) {
    const r = clip(s, options.clipSigma);
    s = r.series;
    pointsClipped = r.clipped;
    steps.push(r.step);
  } else {
    steps.push('No clipping: every point is kept.');
  }

  let binnedPoints: number | null = null;
  if (options.binMinutes !== null) {
    const before = s.t.length;
    s = binSeries(s, options.binMinutes / 1440);
    binnedPoints = s.t.length;
    steps.push(
      `Binned to ${fmt(options.binMinutes)} minutes (bins counted from the first point): ${countOf(before, 'point')} became ${countOf(binnedPoints, 'bin')}; each bin's time and value are the mean of its points${input.e ? ' (weighted by 1/σ²), its error 1/sqrt(Σ1/σ²)' : ', its error the pooled scatter within bins over sqrt(n)'}.`,
    );
  }
  return { ...s, pointsClipped, offsets, offsetCount, binnedPoints, steps, pointsDropped };
}

/**
 * Removes one zero point per group (node, or node and night): the group's median minus the
 * median of all points is subtracted from magnitudes; fluxes are divided by the ratio of the
 * medians (a zero point in magnitudes is a factor in flux). `value` is the difference of the
 * medians in the value's unit. Groups of one point are dropped (nothing is left of them).
 */
export function removeZeroPoints(
  s: Series,
  kind: LightCurveValueKind,
  mode: 'node' | 'node_night',
): { series: Series; offsets: { label: string; value: number }[]; steps: string[]; dropped: number } {
  const n = s.t.length;
  const reference = median(s.y);
  // Group index per point: by node, then (node_night) split where a node's consecutive points are more than NIGHT_GAP_DAYS apart.
  const group = new Int32Array(n);
  const labels: string[] = [];
  const byNode = new Map<string, number[]>();
  for (let i = 0; i < n; i++) {
    const key = s.nodes[i] ?? '';
    const list = byNode.get(key);
    if (list) list.push(i);
    else byNode.set(key, [i]);
  }
  for (const [node, idx] of byNode) {
    const name = node === '' ? 'points without a node' : `node ${node}`;
    if (mode === 'node') {
      const g = labels.length;
      labels.push(name);
      for (const i of idx) group[i] = g;
      continue;
    }
    let g = -1;
    let last = -Infinity;
    for (const i of idx) {
      if (s.t[i] - last > NIGHT_GAP_DAYS) {
        g = labels.length;
        labels.push(`${name}, night from ${jdToIso(s.t[i]).slice(0, 10)}`);
      }
      last = s.t[i];
      group[i] = g;
    }
  }
  const members: number[][] = labels.map(() => []);
  for (let i = 0; i < n; i++) members[group[i]].push(i);
  const y = Float64Array.from(s.y);
  const keep = new Uint8Array(n).fill(1);
  const offsets: { label: string; value: number }[] = [];
  let dropped = 0;
  let droppedGroups = 0;
  for (let g = 0; g < labels.length; g++) {
    const idx = members[g];
    if (mode === 'node_night' && idx.length === 1) {
      keep[idx[0]] = 0;
      dropped++;
      droppedGroups++;
      continue;
    }
    const m = median(idx.map((i) => s.y[i]));
    offsets.push({ label: labels[g], value: m - reference });
    if (kind === 'mag') for (const i of idx) y[i] -= m - reference;
    else for (const i of idx) y[i] *= reference / m;
  }
  const steps: string[] = [];
  const how =
    kind === 'mag'
      ? 'its median minus the median of all points was subtracted'
      : 'its points were divided by the ratio of its median to the median of all points (a zero point in magnitudes is a factor in flux)';
  if (mode === 'node') {
    steps.push(`One zero point per node (${countOf(offsets.length, 'node')}): ${how}.`);
  } else {
    steps.push(
      `One zero point per node and night (${countOf(offsets.length, 'night')}; a night is a node's run of points with no gap longer than ${NIGHT_GAP_DAYS} d): ${how}.`,
    );
    steps.push(
      'Caution: zero points per night also remove any variation slower than a night, so a rotation period of more than a few days is weakened or removed; use one zero point per node for slow rotators.',
    );
    if (droppedGroups > 0) {
      steps.push(
        `${countOf(dropped, 'point')} alone in ${droppedGroups === 1 ? 'its night was' : 'their nights were'} left out: nothing of a night of one point is left once its zero point is removed.`,
      );
    }
  }
  let series: Series = { t: s.t, y, e: s.e, nodes: s.nodes };
  if (dropped > 0) series = subset(series, keep);
  return { series, offsets, steps, dropped };
}

/**
 * Iterative clipping at k·σ about the median, σ = 1.4826·MAD (falling back to the standard
 * deviation when more than half the values are equal), until no point is removed or
 * {@link MAX_CLIP_ITERATIONS} passes.
 */
export function clip(s: Series, k: number): { series: Series; clipped: number; step: string } {
  const n = s.t.length;
  const keep = new Uint8Array(n).fill(1);
  let clipped = 0;
  let iterations = 0;
  let lastSigma = 0;
  let lastMedian = 0;
  for (; iterations < MAX_CLIP_ITERATIONS; iterations++) {
    const kept: number[] = [];
    for (let i = 0; i < n; i++) if (keep[i]) kept.push(s.y[i]);
    if (kept.length < 3) break;
    const med = median(kept);
    let sigma = MAD_TO_SIGMA * median(kept.map((v) => Math.abs(v - med)));
    if (!(sigma > 0)) {
      let ss = 0;
      for (const v of kept) ss += (v - med) ** 2;
      sigma = Math.sqrt(ss / kept.length);
    }
    lastSigma = sigma;
    lastMedian = med;
    if (!(sigma > 0)) break;
    let removed = 0;
    for (let i = 0; i < n; i++) {
      if (keep[i] && Math.abs(s.y[i] - med) > k * sigma) {
        keep[i] = 0;
        removed++;
      }
    }
    clipped += removed;
    if (removed === 0) {
      iterations++;
      break;
    }
  }
  const step = `Clipped at ${fmt(k)}σ about the median (σ = 1.4826 × the median absolute deviation, recomputed after each pass; ${countOf(iterations, 'pass', 'passes')}): ${countOf(clipped, 'point')} removed (last median ${fmt(lastMedian, 6)}, σ ${fmt(lastSigma)}).`;
  return { series: clipped > 0 ? subset(s, keep) : s, clipped, step };
}

/**
 * Bins a time-sorted series to `widthDays` (bin = floor((t − t₀)/width)): each bin's mean time
 * and mean value (weighted by 1/σ² with errors, error 1/sqrt(Σ1/σ²)); without errors the
 * error is the pooled within-bin rms over sqrt(n) (none when no bin has two points). A bin's
 * node is its points' node when they share one.
 */
export function binSeries(s: Series, widthDays: number): Series {
  const n = s.t.length;
  const t: number[] = [];
  const y: number[] = [];
  const e: number[] = [];
  const counts: number[] = [];
  const nodes: (string | null)[] = [];
  if (n === 0) return { t: new Float64Array(0), y: new Float64Array(0), e: s.e ? new Float64Array(0) : null, nodes };
  const t0 = s.t[0];
  let pooledSs = 0;
  let pooledDof = 0;
  let i = 0;
  while (i < n) {
    const bin = Math.floor((s.t[i] - t0) / widthDays);
    let j = i;
    while (j < n && Math.floor((s.t[j] - t0) / widthDays) === bin) j++;
    let sw = 0;
    let st = 0;
    let sy = 0;
    let node: string | null = s.nodes[i];
    for (let k = i; k < j; k++) {
      const w = s.e ? 1 / (s.e[k] * s.e[k]) : 1;
      sw += w;
      st += w * s.t[k];
      sy += w * s.y[k];
      if (s.nodes[k] !== node) node = null;
    }
    const mean = sy / sw;
    if (!s.e) {
      for (let k = i; k < j; k++) pooledSs += (s.y[k] - mean) ** 2;
      pooledDof += j - i - 1;
    }
    t.push(st / sw);
    y.push(mean);
    e.push(s.e ? 1 / Math.sqrt(sw) : 0);
    counts.push(j - i);
    nodes.push(node);
    i = j;
  }
  let errors: Float64Array | null = null;
  if (s.e) errors = Float64Array.from(e);
  else if (pooledDof > 0 && pooledSs > 0) {
    const rms = Math.sqrt(pooledSs / pooledDof);
    errors = Float64Array.from(counts, (c) => rms / Math.sqrt(c));
  }
  return { t: Float64Array.from(t), y: Float64Array.from(y), e: errors, nodes };
}

/**
 * Merges points that share a time exactly (a file uploaded twice, or two nodes' identical
 * timestamps): the periodogram needs distinct times. Mean value (weighted with errors), error
 * as for a bin. Returns the series unchanged when no time repeats.
 */
export function mergeEqualTimes(s: Series): { series: Series; merged: number } {
  let repeats = 0;
  for (let i = 1; i < s.t.length; i++) if (s.t[i] === s.t[i - 1]) repeats++;
  if (repeats === 0) return { series: s, merged: 0 };
  const t: number[] = [];
  const y: number[] = [];
  const e: number[] = [];
  const nodes: (string | null)[] = [];
  let i = 0;
  const n = s.t.length;
  while (i < n) {
    let j = i + 1;
    while (j < n && s.t[j] === s.t[i]) j++;
    let sw = 0;
    let sy = 0;
    let node: string | null = s.nodes[i];
    for (let k = i; k < j; k++) {
      const w = s.e ? 1 / (s.e[k] * s.e[k]) : 1;
      sw += w;
      sy += w * s.y[k];
      if (s.nodes[k] !== node) node = null;
    }
    t.push(s.t[i]);
    y.push(sy / sw);
    e.push(s.e ? 1 / Math.sqrt(sw) : 0);
    nodes.push(node);
    i = j;
  }
  return { series: { t: Float64Array.from(t), y: Float64Array.from(y), e: s.e ? Float64Array.from(e) : null, nodes }, merged: repeats };
}
