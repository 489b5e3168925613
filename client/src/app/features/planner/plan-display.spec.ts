import type { NodeSpec, SiteSpec } from '@spincycle/shared/facility/facility-types';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import { allQuantityRows, formatValue, keyRows, ppmToMmag, QUANTITY_LABELS } from './plan-display';

const NODE: NodeSpec = {
  apertureM: 0.5, obstructionFraction: 0.4, throughput: 0.55, band: 'V', readNoiseE: 9, darkCurrentEPerS: 0.02, gainEPerAdu: 1.3,
  saturationE: 80000, pixelScaleArcsec: 0.8, seeingFwhmArcsec: 1.6, systematicFloorMmag: 1, scintillationModel: 'young1967',
  overheadSeconds: 45, minExposureSeconds: 2, maxExposureSeconds: 300, altitudeLimitDeg: 30, sunAltitudeLimitDeg: -18,
  weatherLossFraction: 0.3, rateMinorPerHour: 4500, currency: 'eur',
};
const SITE: SiteSpec = { latitudeDeg: 30, longitudeDeg: -100, elevationM: 2000, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.5 };

describe('plan-display', () => {
  it('formatValue: three significant figures, counts whole, tiny values as powers of ten, never NaN', () => {
    expect(formatValue(11.6789, 'en-US')).toBe('11.7');
    expect(formatValue(4.6000000000000005, 'en-US')).toBe('4.6');
    expect(formatValue(12345.6, 'en-US')).toBe('12,346');
    expect(formatValue(186.4, 'en-US', { integer: true })).toBe('186');
    expect(formatValue(0.0000123, 'en-US')).toBe('1.2 × 10⁻⁵');
    expect(formatValue(Number.NaN, 'en-US')).toBe('—');
    expect(formatValue(Number.POSITIVE_INFINITY, 'en-US')).toBe('—');
    expect(formatValue(null, 'en-US')).toBe('—');
  });

  it('ppmToMmag: the solar 630 ppm is about 0.68 mmag (SCIENCE.md §3)', () => {
    expect(ppmToMmag(630)).toBeCloseTo(0.684, 3);
  });

  it('rows: a label for each of the plan’s quantities, the fee as money, the key rows in order', () => {
    const plan = computeTargetPlan({ colour: { value: 1.1, system: 'BPRP' }, ageMyr: 800, ageUncertaintyMyr: 100, magnitude: { value: 11.5, band: 'G' } }, NODE, SITE);
    const all = allQuantityRows(plan, 'en-US');
    expect(all.map((r) => r.key)).toEqual(Object.keys(QUANTITY_LABELS));
    expect(all).toHaveLength(Object.keys(plan.quantities).length);
    expect(all.every((r) => !/NaN/.test(r.value))).toBe(true);
    const fee = all.find((r) => r.key === 'feeMinor')!;
    expect(fee.value).toMatch(/^€/);
    const key = keyRows(plan, 'en-US');
    expect(key.map((r) => r.key)).toEqual([
      'periodDays',
      'rossbyNumber',
      'amplitudeRperPpm',
      'perVisitPrecisionPpm',
      'exposureSeconds',
      'visits',
      'visitsPerNight',
      'sampleIntervalDays',
      'baselineDays',
      'nodeHours',
      'feeMinor',
    ]);
    expect(key[1].label).toBe('Rossby number, Noyes et al. (1984) τ scale');
    expect(key[2].alternative).toMatch(/mmag$/);
  });
});
