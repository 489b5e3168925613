import fc from 'fast-check';
import {
  baselineForPeriodPrecision,
  detectionThresholdPower,
  expectedFalseAlarmProbability,
  independentFrequencyCount,
  periodPrecision,
  visitsForDetection,
} from './detection';

describe('periodPrecision', () => {
  it('σP ≈ 0.101 d for N 60, A 0.005, σ 0.003, T 60 d, P 10 d (SCIENCE.md §8 #15, [derived] from the Montgomery & O\'Donoghue 1999 form — from memory)', () => {
    const r = periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: 60, periodDays: 10 });
    expect(r.sigmaPeriodDays).toBeCloseTo(0.101, 3);
  });

  it('is inverted by baselineForPeriodPrecision', () => {
    const t = baselineForPeriodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, periodDays: 10, periodPrecisionDays: 0.05 });
    const r = periodPrecision({ visits: 60, semiAmplitudePpm: 5000, sigmaPpm: 3000, baselineDays: t, periodDays: 10 });
    expect(r.sigmaPeriodDays).toBeCloseTo(0.05, 12);
  });
});

describe('visitsForDetection', () => {
  it('is 4σ²·ln(M/p)/A² rounded up (SCIENCE.md §6 [derived])', () => {
    const n = visitsForDetection({ semiAmplitudePpm: 1000, sigmaPpm: 2000, independentFrequencies: 100, falseAlarmProbability: 0.01 });
    expect(n).toBe(Math.ceil(16 * Math.log(1e4)));
    expect(detectionThresholdPower(100, 0.01)).toBeCloseTo(Math.log(1e4), 12);
    expect(independentFrequencyCount(60, 0.2)).toBeCloseTo(12, 12);
  });

  it('at the computed visits the expected FAP is at or below the requested one (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 100, max: 20000, noNaN: true }),
        fc.double({ min: 100, max: 20000, noNaN: true }),
        fc.double({ min: 1, max: 1e4, noNaN: true }),
        fc.double({ min: 1e-4, max: 0.2, noNaN: true }),
        (a, s, m, p) => {
          const n = visitsForDetection({ semiAmplitudePpm: a, sigmaPpm: s, independentFrequencies: m, falseAlarmProbability: p });
          expect(expectedFalseAlarmProbability({ visits: n, semiAmplitudePpm: a, sigmaPpm: s, independentFrequencies: m })).toBeLessThanOrEqual(p * 1.000001);
        },
      ),
    );
  });

  it('rejects a FAP outside (0, 1) and a zero amplitude', () => {
    const base = { semiAmplitudePpm: 1000, sigmaPpm: 2000, independentFrequencies: 100, falseAlarmProbability: 0.01 };
    expect(() => visitsForDetection({ ...base, falseAlarmProbability: 0 })).toThrow(/falseAlarmProbability: must be within/);
    expect(() => visitsForDetection({ ...base, semiAmplitudePpm: 0 })).toThrow(/semiAmplitudePpm: must be positive/);
    expect(() => visitsForDetection({ ...base, sigmaPpm: Number.NaN })).toThrow(/sigmaPpm/);
  });
});

describe('expectedFalseAlarmProbability', () => {
  it('more visits never lower detectability (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 5000 }),
        fc.integer({ min: 0, max: 5000 }),
        fc.double({ min: 10, max: 1e4, noNaN: true }),
        fc.double({ min: 10, max: 1e4, noNaN: true }),
        fc.double({ min: 1, max: 1e5, noNaN: true }),
        (n1, extra, a, s, m) => {
          const f = (visits: number) => expectedFalseAlarmProbability({ visits, semiAmplitudePpm: a, sigmaPpm: s, independentFrequencies: m });
          expect(f(n1 + extra)).toBeLessThanOrEqual(f(n1));
        },
      ),
    );
  });

  it('is 1 with no visits and in [0, 1] always', () => {
    expect(expectedFalseAlarmProbability({ visits: 0, semiAmplitudePpm: 100, sigmaPpm: 100, independentFrequencies: 10 })).toBe(1);
    expect(expectedFalseAlarmProbability({ visits: 1e6, semiAmplitudePpm: 100, sigmaPpm: 100, independentFrequencies: 10 })).toBe(0);
  });
});
