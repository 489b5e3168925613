import fc from 'fast-check';
import {
  DEFAULT_AMPLITUDE_MODEL,
  PPM_PER_MMAG,
  RPER_PER_SEMI_AMPLITUDE,
  amplitudeExponent,
  convertAmplitude,
  mmagToPpm,
  ppmToMmag,
  spotAmplitude,
} from './spot-amplitude';

describe('spotAmplitude (SCIENCE.md §3 two-part model)', () => {
  it('derives the exponent 1.163 by joining 22 700 ppm at Ro 0.1 to 630 ppm at Ro 2.18 [derived]', () => {
    expect(amplitudeExponent(DEFAULT_AMPLITUDE_MODEL)).toBeCloseTo(1.163, 3);
  });

  it('is saturated at 22 700 ppm for Ro ≤ 0.1 (McQuillan, Mazeh & Aigrain 2014)', () => {
    expect(spotAmplitude(0.05)).toMatchObject({ rperPpm: 22700, regime: 'saturated' });
    expect(spotAmplitude(0.1).rperPpm).toBe(22700);
  });

  it('passes through the solar 630 ppm at Ro 2.18 (Nèmec et al. 2020) and is continuous at Ro 0.1', () => {
    expect(spotAmplitude(2.18).rperPpm).toBeCloseTo(630, 9);
    expect(spotAmplitude(0.1 * (1 + 1e-12)).rperPpm).toBeCloseTo(22700, 4);
  });

  it('takes configurable coefficients and re-derives the exponent', () => {
    const m = { saturationRossby: 0.13, saturatedRperPpm: 20000, anchorRperPpm: 600, anchorRossby: 2 };
    expect(spotAmplitude(2, m).rperPpm).toBeCloseTo(600, 9);
    expect(spotAmplitude(0.13 * 1.0000001, m).rperPpm).toBeCloseTo(20000, 0);
  });

  it('never increases with Ro (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 10, noNaN: true }), fc.double({ min: 1e-3, max: 10, noNaN: true }), (a, b) => {
        const [lo, hi] = a < b ? [a, b] : [b, a];
        expect(spotAmplitude(hi).rperPpm).toBeLessThanOrEqual(spotAmplitude(lo).rperPpm);
      }),
    );
  });

  it('rejects bad Ro and inconsistent coefficients with the field name', () => {
    expect(() => spotAmplitude(Number.NaN)).toThrow(/rossby: must be a finite number/);
    expect(() => spotAmplitude(-1)).toThrow(/rossby: must be positive/);
    expect(() => spotAmplitude(1, { anchorRossby: 0.05 })).toThrow(/amplitudeModel.anchorRossby/);
    expect(() => spotAmplitude(1, { anchorRperPpm: 30000 })).toThrow(/amplitudeModel.anchorRperPpm/);
  });
});

describe('amplitude conversions', () => {
  it('1 mmag = 920.6 ppm (SCIENCE.md §3 [derived])', () => {
    expect(PPM_PER_MMAG).toBeCloseTo(920.6, 1);
    expect(mmagToPpm(0.68)).toBeCloseTo(626, 0);
    expect(ppmToMmag(mmagToPpm(1.7))).toBeCloseTo(1.7, 12);
  });

  it('R_per = 1.975·A, peak-to-peak = 2A, rms = A/√2 (SCIENCE.md §3 [derived])', () => {
    expect(RPER_PER_SEMI_AMPLITUDE).toBeCloseTo(1.975, 3);
    const a = { measure: 'semiAmplitude', unit: 'ppm' } as const;
    expect(convertAmplitude(1000, a, { measure: 'rper', unit: 'ppm' })).toBeCloseTo(1975.4, 1);
    expect(convertAmplitude(1000, a, { measure: 'peakToPeak', unit: 'ppm' })).toBe(2000);
    expect(convertAmplitude(1000, a, { measure: 'rms', unit: 'ppm' })).toBeCloseTo(707.107, 3);
    expect(convertAmplitude(2, { measure: 'peakToPeak', unit: 'mmag' }, { measure: 'semiAmplitude', unit: 'ppm' })).toBeCloseTo(920.6, 1);
    expect(convertAmplitude(0.001, { measure: 'rms', unit: 'fraction' }, { measure: 'rms', unit: 'ppm' })).toBeCloseTo(1000, 9);
  });

  it('round-trips any measure and unit (property)', () => {
    const measure = fc.constantFrom('semiAmplitude', 'peakToPeak', 'rper', 'rms' as const);
    const unit = fc.constantFrom('ppm', 'mmag', 'fraction' as const);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1e5, noNaN: true }), measure, unit, measure, unit, (v, m1, u1, m2, u2) => {
        const there = convertAmplitude(v, { measure: m1, unit: u1 }, { measure: m2, unit: u2 });
        expect(convertAmplitude(there, { measure: m2, unit: u2 }, { measure: m1, unit: u1 })).toBeCloseTo(v, 6);
      }),
    );
  });

  it('rejects negative amplitudes and unknown measures', () => {
    expect(() => convertAmplitude(-1, { measure: 'rms', unit: 'ppm' }, { measure: 'rms', unit: 'mmag' })).toThrow(/amplitude: must not be negative/);
    expect(() => convertAmplitude(1, { measure: 'p2p' as never, unit: 'ppm' }, { measure: 'rms', unit: 'mmag' })).toThrow(/from.measure/);
  });
});
