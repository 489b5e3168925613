import { resolveColour } from './colour-sequence';
import {
  defaultTurnoverScaleFor,
  rossbyNumber,
  solarRossby,
  turnoverTimeCranmerSaar2011,
  turnoverTimeForColour,
  turnoverTimeNoyes1984,
  turnoverTimeWright2011,
  turnoverTimeWright2018,
} from './turnover-time';

describe('turnover times', () => {
  it('Noyes τ at B−V 0.65 is 11.99 d (SCIENCE.md §8 #6, [derived] from Noyes et al. 1984)', () => {
    expect(turnoverTimeNoyes1984(0.65)).toBeCloseTo(11.99, 2);
  });

  it('Cranmer & Saar τ at 5772 K is 12.875 d (SCIENCE.md §8 #7, [derived] from Cranmer & Saar 2011 eq. 36)', () => {
    expect(turnoverTimeCranmerSaar2011(5772)).toBeCloseTo(12.875, 3);
  });

  it('Wright 2011 τ at 1 M☉ is 14.45 d (SCIENCE.md §8 #8, [derived] from Wright et al. 2011 eq. 11)', () => {
    expect(turnoverTimeWright2011(1)).toBeCloseTo(14.45, 2);
  });

  it('Wright 2018 τ at V−Ks 2 is 10^1.14 d [derived from Wright et al. 2018 eq. 5]', () => {
    expect(turnoverTimeWright2018(2)).toBeCloseTo(10 ** 1.14, 10);
  });

  it('Noyes uses its second branch for B−V ≥ 1 (x ≤ 0): log τ = 1.362 − 0.14x [derived]', () => {
    expect(turnoverTimeNoyes1984(1.2)).toBeCloseTo(10 ** (1.362 + 0.14 * 0.2), 10);
  });

  it('rejects NaN and non-positive inputs with the field name', () => {
    expect(() => turnoverTimeNoyes1984(Number.NaN)).toThrow(/bvMag: must be a finite number/);
    expect(() => turnoverTimeCranmerSaar2011(-5)).toThrow(/teffK: must be positive/);
    expect(() => turnoverTimeWright2011(0)).toThrow(/massSolar: must be positive/);
  });
});

describe('turnoverTimeForColour', () => {
  it('always names its scale and how its input was obtained', () => {
    const direct = turnoverTimeForColour(resolveColour({ value: 0.65, system: 'BV' }, 0), 'noyes1984');
    expect(direct).toMatchObject({ scale: 'noyes1984', scaleLabel: 'Noyes et al. (1984)', inputValue: 0.65 });
    expect(direct.inputOrigin).toMatch(/intrinsic B−V/);
    const viaTable = turnoverTimeForColour(resolveColour({ value: 0.823, system: 'BPRP' }, 0), 'cranmerSaar2011');
    expect(viaTable.inputValue).toBeCloseTo(5770, 6);
    expect(viaTable.inputOrigin).toMatch(/Pecaut & Mamajek/);
  });

  it("flags inputs outside a scale's calibration (Cranmer & Saar below 3300 K)", () => {
    const t = turnoverTimeForColour(resolveColour({ value: 3.35, system: 'BPRP' }, 0), 'cranmerSaar2011');
    expect(t.flags.map((f) => f.code)).toContain('turnoverOutsideCalibration');
  });

  it('throws for colours outside the dwarf sequence when the scale needs it', () => {
    expect(() => turnoverTimeForColour(resolveColour({ value: 0.42, system: 'BV' }, 0), 'wright2011')).toThrow(/colour.value/);
  });
});

describe('rossbyNumber', () => {
  it('gives the solar Noyes Ro ≈ 2.18 for P 26.09 d at B−V 0.65 (SCIENCE.md §3)', () => {
    const ro = rossbyNumber({ periodDays: 26.09, colour: { value: 0.65, system: 'BV' } });
    expect(ro.rossby).toBeCloseTo(2.18, 2);
    expect(ro.scale).toBe('noyes1984');
  });

  it('rejects a non-positive period', () => {
    expect(() => rossbyNumber({ periodDays: 0, colour: { value: 0.65, system: 'BV' } })).toThrow(/periodDays: must be positive/);
  });
});

describe('solarRossby', () => {
  it('is 26.09 d over τ☉ on each scale [derived]: Noyes 2.18 (SCIENCE.md §3), Cranmer & Saar 2.03, Wright 2011 1.81, Wright 2018 2.43', () => {
    expect(solarRossby('noyes1984')).toBeCloseTo(26.09 / turnoverTimeNoyes1984(0.65), 12);
    expect(solarRossby('noyes1984')).toBeCloseTo(2.18, 2);
    expect(solarRossby('cranmerSaar2011')).toBeCloseTo(26.09 / 12.875, 3);
    expect(solarRossby('wright2011')).toBeCloseTo(26.09 / 14.45, 2);
    expect(solarRossby('wright2018')).toBeCloseTo(26.09 / turnoverTimeWright2018(1.56), 12);
  });

  it('rejects an unknown scale', () => {
    expect(() => solarRossby('skumanich' as never)).toThrow(/turnoverScale: must be one of/);
  });
});

describe('defaultTurnoverScaleFor (Wright et al. 2018 for M dwarfs, Noyes et al. 1984 otherwise; Teff < 3900 K on Pecaut & Mamajek 2013)', () => {
  it('chooses Wright et al. (2018) for an M dwarf in BP−RP, B−V or V−Ks, and says why', () => {
    const m = defaultTurnoverScaleFor(resolveColour({ value: 2.5, system: 'BPRP' }, 0));
    expect(m.scale).toBe('wright2018');
    expect(m.why).toMatch(
      /Noyes et al. \(1984\) τ is calibrated on F–K stars; M dwarfs use Wright et al. \(2018\), calibrated to V−Ks 7.0/,
    );
    expect(defaultTurnoverScaleFor(resolveColour({ value: 1.45, system: 'BV' }, 0)).scale).toBe('wright2018');
    expect(defaultTurnoverScaleFor(resolveColour({ value: 6.5, system: 'VKs' }, 0)).scale).toBe('wright2018');
  });

  it('keeps Noyes et al. (1984) for F–K dwarfs, including a K7V just above 3900 K', () => {
    expect(defaultTurnoverScaleFor(resolveColour({ value: 1.1, system: 'BPRP' }, 0)).scale).toBe('noyes1984');
    expect(defaultTurnoverScaleFor(resolveColour({ value: 1.38, system: 'BV' }, 0)).scale).toBe('noyes1984');
    expect(defaultTurnoverScaleFor(resolveColour({ value: 0.42, system: 'BV' }, 0)).scale).toBe('noyes1984');
  });

  it('uses the de-reddened colour: observed BP−RP 1.95 with E(B−V) 0.2 is a K dwarf (1.95 − 1.339 × 0.2 = 1.68)', () => {
    expect(defaultTurnoverScaleFor(resolveColour({ value: 1.95, system: 'BPRP' }, 0)).scale).toBe('wright2018');
    expect(defaultTurnoverScaleFor(resolveColour({ value: 1.95, system: 'BPRP' }, 0.2)).scale).toBe('noyes1984');
  });
});
