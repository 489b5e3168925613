import { resolveColour } from './colour-sequence';
import { BAND_ZERO_POINTS, bandMinusV, convertMagnitude } from './photometric-bands';

describe('BAND_ZERO_POINTS', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('gives ≈ 8.8e9 photons s⁻¹ m⁻² for V = 0 (Bessell et al. 1998 f_λ with an 88 nm band; ≈ 1000 photons s⁻¹ cm⁻² Å⁻¹)', () => {
    expect(BAND_ZERO_POINTS.V.photonsPerSecondPerM2).toBeGreaterThan(8.5e9);
    expect(BAND_ZERO_POINTS.V.photonsPerSecondPerM2).toBeLessThan(9.1e9);
  });

  it('has a positive zero point and a source for every band', () => {
    for (const zp of Object.values(BAND_ZERO_POINTS)) {
      expect(zp.photonsPerSecondPerM2).toBeGreaterThan(1e9);
      expect(zp.source).toMatch(/\(\d{4}\)/);
    }
  });
});

describe('convertMagnitude', () => {
  it('leaves a magnitude alone when the bands agree', () => {
    const c = convertMagnitude({ value: 10, band: 'V' }, 'V', resolveColour({ value: 0.65, system: 'BV' }, 0));
    expect(c.magnitude).toBe(10);
    expect(c.offsetMag).toBe(0);
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('moves V to B by the observed B−V, and G to V with the Riello et al. (2021) polynomial', () => {
    const colour = resolveColour({ value: 0.65, system: 'BV' }, 0);
    expect(convertMagnitude({ value: 10, band: 'V' }, 'B', colour).magnitude).toBeCloseTo(10.65, 12);
    // Sun-like star: G − V = −0.1534 at BP−RP 0.823 [derived from the polynomial].
    expect(convertMagnitude({ value: 10, band: 'G' }, 'V', colour).magnitude).toBeCloseTo(10 + 0.1534, 4);
  });

  it('uses the reddened colours of the star for the colour terms', () => {
    const red = resolveColour({ value: 0.95, system: 'BV' }, 0.3);
    const c = convertMagnitude({ value: 12, band: 'V' }, 'G', red);
    expect(c.observedBvMag).toBeCloseTo(0.95, 12);
    expect(c.observedBpRpMag).toBeCloseTo(0.823 + 1.339 * 0.3, 9);
  });

  it('is consistent in both directions', () => {
    const colour = resolveColour({ value: 1.3, system: 'BPRP' }, 0);
    const there = convertMagnitude({ value: 11, band: 'R' }, 'I', colour);
    const back = convertMagnitude({ value: there.magnitude, band: 'I' }, 'R', colour);
    expect(back.magnitude).toBeCloseTo(11, 12);
    expect(bandMinusV('V', 0.5, 0.7)).toBe(0);
  });

  it('rejects an unknown band or a NaN magnitude with the field name', () => {
    const colour = resolveColour({ value: 0.65, system: 'BV' }, 0);
    expect(() => convertMagnitude({ value: 10, band: 'K' as never }, 'V', colour)).toThrow(/magnitude.band: must be one of/);
    expect(() => convertMagnitude({ value: Number.NaN, band: 'V' }, 'V', colour)).toThrow(/magnitude.value/);
  });
});
