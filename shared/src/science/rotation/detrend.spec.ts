import { seededRandom } from '../seeded-random';
import { binSeries, clip, detrendSeries, mergeEqualTimes, removeZeroPoints, type Series } from './detrend';

function noisy(n: number, seed: number, nodes: { code: string; zeroPoint: number }[]): Series {
  const r = seededRandom(seed);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const codes: string[] = [];
  for (let i = 0; i < n; i++) {
    t[i] = 2460600 + i * 0.05;
    const node = nodes[i % nodes.length];
    codes.push(node.code);
    y[i] = 12 + node.zeroPoint + 0.01 * Math.sin((2 * Math.PI * t[i]) / 3.3) + r.normal(0, 0.003);
  }
  return { t, y, e: null, nodes: codes };
}

describe('detrending', () => {
  it('recovers injected per-node zero points (differences within 2 mmag)', () => {
    // Injected: N2 − N1 = +0.050 mag, N3 − N1 = −0.030 mag (set in this test).
    const s = noisy(1200, 1, [
      { code: 'N1', zeroPoint: 0 },
      { code: 'N2', zeroPoint: 0.05 },
      { code: 'N3', zeroPoint: -0.03 },
    ]);
    const r = removeZeroPoints(s, 'mag', 'node');
    const v = Object.fromEntries(r.offsets.map((o) => [o.label, o.value]));
    expect(v['node N2'] - v['node N1']).toBeCloseTo(0.05, 2);
    expect(Math.abs(v['node N2'] - v['node N1'] - 0.05)).toBeLessThan(0.002);
    expect(Math.abs(v['node N3'] - v['node N1'] + 0.03)).toBeLessThan(0.002);
    // After removal the nodes share one level.
    const mean = (code: string) => {
      let sum = 0;
      let k = 0;
      r.series.nodes.forEach((n, i) => {
        if (n === code) {
          sum += r.series.y[i];
          k++;
        }
      });
      return sum / k;
    };
    expect(Math.abs(mean('N2') - mean('N1'))).toBeLessThan(0.002);
  });

  it('divides fluxes by the ratio of the medians (a magnitude zero point is a factor in flux)', () => {
    const s: Series = {
      t: Float64Array.from([1, 2, 3, 4, 5, 6]),
      y: Float64Array.from([0.98, 1, 1, 2, 2, 2.04]),
      e: null,
      nodes: ['A', 'A', 'A', 'B', 'B', 'B'],
    };
    const r = removeZeroPoints(s, 'flux', 'node');
    // Worked by hand: medians 1 and 2, overall median (1 + 2)/2 = 1.5 → A × 1.5, B × 0.75.
    [1.47, 1.5, 1.5, 1.5, 1.5, 1.53].forEach((v, i) => expect(r.series.y[i]).toBeCloseTo(v, 12));
    expect(r.offsets).toEqual([
      { label: 'node A', value: -0.5 },
      { label: 'node B', value: 0.5 },
    ]);
  });

  it('splits nights at gaps over 0.3 d per node, drops nights of one point, and warns about slow variation', () => {
    const s: Series = {
      t: Float64Array.from([0.1, 0.2, 0.45, 1.1, 1.2, 2.1]).map((x) => x + 2460600),
      y: Float64Array.from([1, 2, 3, 4, 5, 6]),
      e: null,
      nodes: ['A', 'A', 'A', 'A', 'A', 'A'],
    };
    const r = removeZeroPoints(s, 'mag', 'node_night');
    // Worked by hand: nights {0.1, 0.2, 0.45} (gaps 0.1, 0.25), {1.1, 1.2}, {2.1} alone → dropped.
    expect(r.offsets).toHaveLength(2);
    expect(r.dropped).toBe(1);
    expect(r.series.t).toHaveLength(5);
    expect(r.steps.join(' ')).toMatch(/remove any variation slower than a night/);
  });

  it('clips injected outliers and nothing else', () => {
    const s = noisy(500, 2, [{ code: 'N1', zeroPoint: 0 }]);
    for (const i of [10, 50, 120, 300, 499]) s.y[i] += i % 2 ? 0.5 : -0.4;
    const r = clip(s, 5);
    expect(r.clipped).toBe(5);
    expect(r.series.t).toHaveLength(495);
    expect(Array.from(r.series.y).every((v) => Math.abs(v - 12) < 0.1)).toBe(true);
  });

  it('bins to fixed intervals from the first point: counts, mean times, weighted values and errors', () => {
    const s: Series = {
      t: Float64Array.from([0, 0.004, 0.006, 0.03, 0.032]),
      y: Float64Array.from([1, 2, 3, 10, 20]),
      e: Float64Array.from([1, 1, 1, 1, 2]),
      nodes: ['A', 'A', 'B', 'A', 'A'],
    };
    const b = binSeries(s, 10 / 1440);
    // Worked by hand: 10 min = 0.006944 d → bins [0, 0.0069): 3 points, [0.0278, 0.0347): 2 points.
    expect(b.t).toHaveLength(2);
    expect(b.t[0]).toBeCloseTo(0.01 / 3, 12);
    expect(b.y[0]).toBeCloseTo(2, 12);
    expect(b.e![0]).toBeCloseTo(1 / Math.sqrt(3), 12);
    // Weights 1 and 1/4: (10 + 20/4)/(1.25) = 12; error 1/sqrt(1.25).
    expect(b.y[1]).toBeCloseTo(12, 12);
    expect(b.e![1]).toBeCloseTo(1 / Math.sqrt(1.25), 12);
    expect(b.nodes).toEqual([null, 'A']);
  });

  it('records every step in plain words, and the binned count', () => {
    const s = noisy(300, 3, [{ code: 'N1', zeroPoint: 0 }]);
    const r = detrendSeries(s, 'mag', { offsets: 'node', clipSigma: 4, binMinutes: 180 });
    expect(r.steps).toHaveLength(3);
    expect(r.binnedPoints).toBe(r.t.length);
    // 300 points 0.05 d apart over 14.95 d, 3-h bins of 0.125 d: 120 bins (worked by hand: 14.95/0.125 = 119.6 → bins 0…119).
    expect(r.binnedPoints).toBe(120);
  });

  it('averages points that share a time', () => {
    const s: Series = { t: Float64Array.from([1, 1, 2]), y: Float64Array.from([1, 3, 5]), e: null, nodes: ['A', 'B', 'A'] };
    const r = mergeEqualTimes(s);
    expect(r.merged).toBe(1);
    expect(Array.from(r.series.y)).toEqual([2, 5]);
    expect(r.series.nodes).toEqual([null, 'A']);
  });
});
