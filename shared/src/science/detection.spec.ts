import fc from 'fast-check';
import {
  baselineForPeriodPrecision,
  campaignNoncentrality,
  detectionProbability,
  detectionThreshold,
  detectionThresholdPower,
  marcumDetectionProbability,
  effectiveFrequencyCount,
  falseAlarmOfPower,
  marcumQ1,
  nightlySigmaPpm,
  noncentralityForCompleteness,
  periodPrecision,
} from './detection';
import { baluevFalseAlarmProbability } from './lomb-scargle/false-alarm';

describe('periodPrecision', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it("σP ≈ 0.101 d for N 60, A 0.005, σ 0.003, T 60 d, P 10 d (SCIENCE.md §8 #15, [derived] from the Montgomery & O'Donoghue 1999 form)", () => {
    const r = periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: 60, periodDays: 10 });
    expect(r.sigmaPeriodDays).toBeCloseTo(0.101, 3);
  });

  it('is inverted by baselineForPeriodPrecision', () => {
    const t = baselineForPeriodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, periodDays: 10, periodPrecisionDays: 0.05 });
    const r = periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: t, periodDays: 10 });
    expect(r.sigmaPeriodDays).toBeCloseTo(0.05, 12);
  });
});

describe('marcumQ1', () => {
  it('Q1(0, b) = exp(−b²/2) and Q1(a, 0) = 1 (identities, SCIENCE.md §6)', () => {
    for (const b of [0.1, 1, 2.5, 7]) expect(marcumQ1(0, b)).toBeCloseTo(Math.exp(-(b * b) / 2), 14);
    for (const a of [0, 0.3, 4, 30]) expect(marcumQ1(a, 0)).toBe(1);
  });

  it('equals the integral of the Rice density from b to ∞ (derived: Q1(a, b) = ∫ x·e^(−(x²+a²)/2)·I0(ax) dx, Simpson rule)', () => {
    // I0 by its power series (Abramowitz & Stegun 1964, 9.6.12), scaled by e^(−ax) to stay finite.
    const i0Scaled = (z: number) => {
      let term = 1;
      let sum = 1;
      for (let k = 1; k < 400; k++) {
        term *= (z * z) / (4 * k * k);
        sum += term;
        if (term < 1e-17 * sum) break;
      }
      return sum * Math.exp(-z);
    };
    const rice = (x: number, a: number) => x * Math.exp(-((x - a) ** 2) / 2) * i0Scaled(a * x);
    for (const [a, b] of [
      [1, 1],
      [2, 3],
      [5, 4],
      [3, 5],
      [6, 4.2],
    ]) {
      const top = Math.max(a, b) + 12;
      const n = 4000;
      const h = (top - b) / n;
      let sum = rice(b, a) + rice(top, a);
      for (let i = 1; i < n; i++) sum += (i % 2 ? 4 : 2) * rice(b + i * h, a);
      expect(marcumQ1(a, b)).toBeCloseTo((sum * h) / 3, 8);
    }
  });

  it('Q1(a, b) ≈ Φ(a − b) for large arguments (SCIENCE.md §6)', () => {
    // Φ(0) = ½: for a = b large, Q1 → ½ from above (the Rice density is skewed).
    expect(marcumQ1(60, 60)).toBeGreaterThan(0.5);
    expect(marcumQ1(60, 60)).toBeLessThan(0.51);
  });

  it('falls with b and rises with a (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0.01, max: 20, noNaN: true }),
        fc.double({ min: 0.01, max: 3, noNaN: true }),
        (a, b, d) => {
          expect(marcumQ1(a, b + d)).toBeLessThanOrEqual(marcumQ1(a, b) + 1e-12);
          expect(marcumQ1(a + d, b)).toBeGreaterThanOrEqual(marcumQ1(a, b) - 1e-12);
        },
      ),
    );
  });
});

describe('detectionThresholdPower', () => {
  it('is the power whose Baluev false-alarm probability is p (inverse of falseAlarmOfPower)', () => {
    for (const [w, p] of [
      [10, 0.01],
      [300, 0.01],
      [5000, 0.001],
      [2, 0.2],
    ]) {
      expect(falseAlarmOfPower(detectionThresholdPower(w, p), w)).toBeCloseTo(p, 9);
    }
  });

  it('lies above ln(W/p), the count of independent frequencies alone (the √z factor of Baluev 2008)', () => {
    expect(detectionThresholdPower(300, 0.01)).toBeGreaterThan(Math.log(300 / 0.01));
  });

  it('W = fmax·T·sqrt(π/3) for visits spread evenly (var t = T²/12; Baluev 2008, W = fmax·sqrt(4π var t))', () => {
    expect(effectiveFrequencyCount(60, 0.2)).toBeCloseTo(0.2 * 60 * Math.sqrt(Math.PI / 3), 12);
  });

  it('rejects a FAP outside (0, 1), naming it', () => {
    expect(() => detectionThresholdPower(10, 0)).toThrow('falseAlarmProbability: must be greater than 0 and less than 1 (got 0)');
  });
});

describe('detectionProbability (finite number of nightly means)', () => {
  const th = (points: number) => detectionThreshold(points, 60, 0.5, 0.01);

  it('inverts with noncentralityForCompleteness (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 0.99, noNaN: true }), fc.integer({ min: 6, max: 2000 }), (c, n) => {
        const t = th(n);
        expect(detectionProbability(noncentralityForCompleteness(c, t), t)).toBeCloseTo(c, 6);
      }),
      { numRuns: 60 },
    );
  });

  it('tends to Marcum Q1(√λ, √(2·z0)) with z0 = (m/2)·Z0/(1 − Z0) as the points grow (SCIENCE.md §6, large-N form)', () => {
    const t = th(200000);
    const z0 = (0.5 * (t.points - 3) * t.power) / (1 - t.power);
    for (const lam of [10, 30, 60]) expect(detectionProbability(lam, t)).toBeCloseTo(marcumDetectionProbability(lam, z0), 3);
  });

  it('few precise nightly means need a larger λ than Marcum says (the variance is estimated from the data)', () => {
    const few = th(20);
    const z0 = (0.5 * (few.points - 3) * few.power) / (1 - few.power);
    expect(noncentralityForCompleteness(0.9, few)).toBeGreaterThan(noncentralityForCompleteness(0.9, th(200000)));
    expect(detectionProbability(noncentralityForCompleteness(0.9, few), few)).toBeCloseTo(0.9, 6);
    expect(marcumDetectionProbability(noncentralityForCompleteness(0.9, few), z0)).toBeGreaterThan(0.9);
  });

  it('the threshold is the power whose Baluev FAP equals p, as the periodogram computes it', () => {
    const t = th(40);
    expect(baluevFalseAlarmProbability(t.power, { pointCount: 40, maximumFrequencyPerDay: 0.5, timeVarianceDays2: 3600 / 12 })).toBeCloseTo(
      0.01,
      8,
    );
  });

  it('sizing for the mean (power at the threshold) gives only about half (SCIENCE.md §6)', () => {
    const z0 = 12;
    expect(marcumDetectionProbability(2 * z0, z0)).toBeGreaterThan(0.4);
    expect(marcumDetectionProbability(2 * z0, z0)).toBeLessThan(0.6);
  });
});

describe('nightly noise (floor correlated within a night)', () => {
  it('σ_night² = σ_white²/k + σ_floor²: more visits a night never go below the floor', () => {
    expect(nightlySigmaPpm(3000, 1000, 1)).toBeCloseTo(Math.hypot(3000, 1000), 9);
    expect(nightlySigmaPpm(3000, 1000, 9)).toBeCloseTo(Math.hypot(1000, 1000), 9);
    expect(nightlySigmaPpm(3000, 1000, 1e9)).toBeGreaterThan(1000);
  });

  it('λ = n·A²/(2σ²)', () => {
    expect(campaignNoncentrality(40, 1000, 2000)).toBeCloseTo(5, 12);
  });
});
