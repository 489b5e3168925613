import { DEFAULT_DETREND } from '../../photometry/photometry';
import { seededRandom } from '../seeded-random';
import { measureRotation } from './measure-rotation';

/** A star seen from one site on 6-hour nights, a third of them lost: y = Σ harmonics + white noise (mag). */
function season(seed: number, periodDays: number, harmonics: { k: number; amplitude: number; phase: number }[], nights = 70) {
  const rnd = seededRandom(seed);
  const bjd: number[] = [];
  const values: number[] = [];
  for (let night = 0; night < nights; night++) {
    if (rnd.next() < 1 / 3) continue;
    for (let t = 2461000 + night + 0.05; t < 2461000 + night + 0.3; t += 15 / 1440) {
      let y = 12 + rnd.normal(0, 0.003);
      for (const h of harmonics) y += h.amplitude * Math.sin((2 * Math.PI * h.k * t) / periodDays + h.phase);
      bjd.push(t);
      values.push(y);
    }
  }
  return { bjd, values, errors: null, nodes: null, valueKind: 'mag' as const, timeSystems: ['bjd_tdb' as const] };
}

const NO_CONTEXT = { expected: null, band: null, star: null };

describe('double-period check (two spot groups)', () => {
  it.each([1, 2, 3])('seed %i: a double-dipping 9-d star peaks at 4.5 d and is flagged with 9 d', (seed) => {
    // Two unequal dips per turn: the first harmonic (k = 2) stronger than the fundamental (k = 1);
    // a synthetic case built in this test (common practice, no source: the usual double-dip shape).
    const m = measureRotation(
      season(seed, 9, [
        { k: 1, amplitude: 0.0025, phase: 0.3 },
        { k: 2, amplitude: 0.008, phase: 1.1 },
      ]),
      NO_CONTEXT,
      DEFAULT_DETREND,
    );
    expect(m.best!.periodDays).toBeCloseTo(4.5, 1);
    expect(m.doublePeriod!.flagged).toBe(true);
    // Within half a resolution element of the true frequency, |Δf| ≤ 1/(2T) (the recovery criterion of campaign-simulation.ts).
    const T = m.input.lastBjd - m.input.firstBjd;
    expect(Math.abs(1 / m.doublePeriod!.doublePeriodDays! - 1 / 9)).toBeLessThanOrEqual(1 / (2 * T));
    expect(m.doublePeriod!.message).toMatch(/may be 9\.\d{3} d, twice the best period/);
  });

  it.each([1, 2, 3, 4, 5])('seed %i: a single-dip 5-d star is not flagged', (seed) => {
    const m = measureRotation(season(seed + 10, 5, [{ k: 1, amplitude: 0.006, phase: 0 }]), NO_CONTEXT, DEFAULT_DETREND);
    expect(m.best!.periodDays).toBeCloseTo(5, 1);
    expect(m.doublePeriod!.flagged).toBe(false);
    // Noise alone: the likelihood ratio follows χ² with 2 degrees of freedom, far below 13.8 here.
    expect(m.doublePeriod!.likelihoodRatio!).toBeLessThan(13.8);
  });

  it('is not checked when twice the period is longer than the time covered', () => {
    const expected = { periodDays: 9, lowDays: 7, highDays: 12, from: 'a plan' };
    const m = measureRotation(season(7, 9, [{ k: 1, amplitude: 0.006, phase: 0 }], 16), { ...NO_CONTEXT, expected }, DEFAULT_DETREND);
    expect(m.best!.periodDays).toBeCloseTo(9, 0);
    expect(m.input.lastBjd - m.input.firstBjd).toBeLessThan(2 * m.best!.periodDays);
    expect(m.doublePeriod).toEqual(expect.objectContaining({ flagged: false, doublePeriodDays: null, likelihoodRatio: null }));
  });
});
