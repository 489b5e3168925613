import { seededRandom } from '../seeded-random';
import { ScienceInputError } from '../science-input-error';
import { baluevFalseAlarmProbability, baluevGamma, logGamma } from './false-alarm';
import { autoFrequencyGrid, gridFrequencies } from './frequency-grid';
import { type LightCurve, prepareLightCurve } from './light-curve';
import { lombScarglePower, lombScarglePowerAt } from './lomb-scargle-power';
import { analyzePeriodogram, fitSinusoid, topPeaks } from './periodogram';

function synthetic(n: number, seed: number, withErrors: boolean, periodDays = 3.3, amp = 1): LightCurve {
  const r = seededRandom(seed);
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  const dy = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = r.uniform(0, n / 10);
  for (let i = 0; i < n; i++) {
    dy[i] = withErrors ? r.uniform(0.5, 1.5) : 1;
    y[i] = 10 + amp * Math.sin((2 * Math.PI * t[i]) / periodDays + 0.4) + r.normal(0, dy[i]);
  }
  return withErrors ? { timeDays: t, values: y, uncertainties: dy } : { timeDays: t, values: y };
}

// SCIENCE.md §8 check values 13 and 14 are astropy's: they are asserted against astropy run in
// the test, in test/reference/science-check-values.spec.ts, not copied here as numbers.

describe('lombScarglePower', () => {
  it('exact method on a grid equals direct evaluation at the same frequencies', () => {
    const lc = synthetic(300, 3, true);
    const d = prepareLightCurve(lc);
    const grid = autoFrequencyGrid(d.baselineDays, d.n, { samplesPerPeak: 5 });
    const a = lombScarglePower(d, grid, { method: 'exact' });
    const b = lombScarglePowerAt(d, gridFrequencies(grid));
    let maxDiff = 0;
    for (let k = 0; k < a.length; k++) maxDiff = Math.max(maxDiff, Math.abs(a[k] - b[k]));
    expect(maxDiff).toBeLessThan(1e-10);
  });

  it('fast method agrees with the exact one within 1e-3 for a few thousand points, same peak', () => {
    const d = prepareLightCurve(synthetic(4000, 11, false));
    const grid = autoFrequencyGrid(d.baselineDays, d.n, { samplesPerPeak: 5, maximumFrequencyPerDay: 2 });
    const exact = lombScarglePower(d, grid, { method: 'exact' });
    const fast = lombScarglePower(d, grid, { method: 'fast' });
    let maxDiff = 0;
    for (let k = 0; k < exact.length; k++) maxDiff = Math.max(maxDiff, Math.abs(exact[k] - fast[k]));
    expect(maxDiff).toBeLessThan(1e-3);
    expect(topPeaks(fast, 1)[0]).toBe(topPeaks(exact, 1)[0]);
  });

  it('does not depend on the time origin (days since an epoch or Julian dates)', () => {
    const lc = synthetic(200, 5, true);
    const shifted = { ...lc, timeDays: Array.from(lc.timeDays, (t) => t + 2460000.5) };
    const f = [0.1, 0.303, 1.7];
    const a = lombScarglePowerAt(lc, f);
    const b = lombScarglePowerAt(shifted, f);
    for (let k = 0; k < f.length; k++) expect(b[k]).toBeCloseTo(a[k], 9);
  });

  it('stays within [0, 1] and finite, including zero frequency', () => {
    const d = prepareLightCurve(synthetic(500, 8, true));
    const p = lombScarglePower(d, { minFrequencyPerDay: 0, stepPerDay: 0.002, count: 2000 }, { method: 'exact' });
    for (const v of p) {
      expect(Number.isFinite(v)).toBe(true);
      expect(v).toBeGreaterThanOrEqual(0);
      expect(v).toBeLessThanOrEqual(1 + 1e-12);
    }
    expect(p[0]).toBe(0);
  });
});

describe('bad input', () => {
  it.each([
    [{ timeDays: [], values: [] }, 'series', /at least 4 points/],
    [{ timeDays: [1, 2, 3], values: [1, 2, 3] }, 'series', /at least 4 points/],
    [{ timeDays: [1, 2, 3, 4], values: [1, 2, 3] }, 'series', /3 values/],
    [{ timeDays: [1, 2, Number.NaN, 4], values: [1, 2, 3, 4] }, 'series[2].timeDays', /finite/],
    [{ timeDays: [1, 2, 3, 4], values: [1, Number.POSITIVE_INFINITY, 3, 4] }, 'series[1].value', /finite/],
    [{ timeDays: [1, 2, 3, 2], values: [1, 2, 3, 4] }, 'series[3].timeDays', /duplicates the time of series\[1\]/],
    [{ timeDays: [1, 2, 3, 4], values: [1, 2, 3, 4], uncertainties: [1, 0, 1, 1] }, 'series[1].uncertainty', /positive/],
    [{ timeDays: [1, 2, 3, 4], values: [5, 5, 5, 5] }, 'series', /all equal/],
  ])('%# throws naming the field', (lc, field, message) => {
    let err: unknown;
    try {
      lombScarglePower(lc as LightCurve, { minFrequencyPerDay: 0.01, stepPerDay: 0.01, count: 10 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ScienceInputError);
    expect((err as ScienceInputError).field).toBe(field);
    expect((err as Error).message).toMatch(message);
  });

  it('rejects bad grids and methods', () => {
    const lc = synthetic(50, 1, false);
    expect(() => lombScarglePower(lc, { minFrequencyPerDay: -1, stepPerDay: 0.01, count: 10 })).toThrow(/grid.minFrequencyPerDay/);
    expect(() => lombScarglePower(lc, { minFrequencyPerDay: 0, stepPerDay: 0, count: 10 })).toThrow(/grid.stepPerDay/);
    expect(() => lombScarglePower(lc, { minFrequencyPerDay: 0, stepPerDay: 0.1, count: 0 })).toThrow(/grid.count/);
    expect(() => lombScarglePower(lc, { minFrequencyPerDay: 0, stepPerDay: 0.1, count: 5 }, { method: 'slow' as never })).toThrow(/method/);
    expect(() => autoFrequencyGrid(10, 50, { maximumFrequencyPerDay: 1e9 })).toThrow(/maximumFrequencyPerDay: gives/);
    expect(() => lombScarglePowerAt(lc, [Number.NaN])).toThrow(/frequencies\[0\]/);
  });
});

describe('Baluev false-alarm probability', () => {
  it('uses a log-gamma accurate to ~1e-14 (Γ(5) = 24, Γ(½) = √π)', () => {
    expect(logGamma(5)).toBeCloseTo(Math.log(24), 13);
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
    expect(baluevGamma(1e5)).toBeCloseTo(1 - 0.75 / 1e5, 8);
  });

  it('falls as the power rises, and stays within [0, 1] for any power', () => {
    const input = { pointCount: 100, maximumFrequencyPerDay: 2, timeVarianceDays2: 300 };
    let last = 1;
    for (let z = 0; z <= 1.0001; z += 0.05) {
      const f = baluevFalseAlarmProbability(z, input);
      expect(f).toBeLessThanOrEqual(last + 1e-15);
      expect(f).toBeGreaterThanOrEqual(0);
      last = f;
    }
    expect(baluevFalseAlarmProbability(1.2, input)).toBe(0);
    expect(baluevFalseAlarmProbability(-0.1, input)).toBe(1);
  });
});

describe('analyzePeriodogram', () => {
  it('recovers the period, semi-amplitude and phase of a sinusoid', () => {
    const lc = synthetic(2000, 21, true, 3.3, 0.5);
    const r = analyzePeriodogram(lc, { maximumFrequencyPerDay: 2, top: 3 });
    expect(r.best.periodDays).toBeCloseTo(3.3, 1);
    expect(r.best.fit.semiAmplitude).toBeCloseTo(0.5, 1);
    expect(r.best.falseAlarmProbability).toBeLessThan(1e-10);
    expect(r.peaks).toHaveLength(3);
    expect(r.peaks[0].power).toBeGreaterThanOrEqual(r.peaks[1].power);
    expect(r.best.fit.offset).toBeCloseTo(10, 1);
    // Phase at the reference epoch: sin(2πt/P + 0.4) at t = t_ref.
    const tRef = r.best.fit.referenceTimeDays;
    const expectedPhase = Math.atan2(Math.sin((2 * Math.PI * tRef) / 3.3 + 0.4), Math.cos((2 * Math.PI * tRef) / 3.3 + 0.4));
    expect(Math.cos(r.best.fit.phaseRad - expectedPhase)).toBeGreaterThan(0.95);
  });

  it('fitSinusoid rejects a zero frequency', () => {
    expect(() => fitSinusoid(synthetic(20, 2, false), 0)).toThrow(/frequencyPerDay/);
  });

  it('gives noise a high false-alarm probability', () => {
    const r = seededRandom(99);
    const t = Array.from({ length: 200 }, (_, i) => i * 0.37 + r.uniform(0, 0.2));
    const y = t.map(() => r.normal(0, 1));
    const res = analyzePeriodogram({ timeDays: t, values: y }, { maximumFrequencyPerDay: 1 });
    expect(res.best.falseAlarmProbability).toBeGreaterThan(0.01);
  });
});
