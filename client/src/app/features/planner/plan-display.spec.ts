import type { NodeSpec, SiteSpec } from '@spincycle/shared/facility/facility-types';
import { computeTargetPlan } from '@spincycle/shared/science/target-plan';
import {
  allQuantityRows,
  completenessPrices,
  formatValue,
  keyRows,
  ppmToMmag,
  QUANTITY_LABELS,
  quantityRow,
  searchBandSentence,
} from './plan-display';

const NODE: NodeSpec = {
  apertureM: 0.5,
  obstructionFraction: 0.4,
  throughput: 0.55,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.3,
  saturationE: 80000,
  pixelScaleArcsec: 0.8,
  seeingFwhmArcsec: 1.6,
  systematicFloorMmag: 1,
  scintillationModel: 'young1967',
  overheadSeconds: 45,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -18,
  weatherLossFraction: 0.3,
  rateMinorPerHour: 4500,
  currency: 'eur',
};
const SITE: SiteSpec = { latitudeDeg: 30, longitudeDeg: -100, elevationM: 2000, timeZone: 'UTC', skyBrightnessMagPerArcsec2: 21.5 };
const K_DWARF = {
  colour: { value: 1.1, system: 'BPRP' as const },
  ageMyr: 800,
  ageUncertaintyMyr: 100,
  magnitude: { value: 11.5, band: 'G' as const },
};

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
    const plan = computeTargetPlan(K_DWARF, NODE, SITE);
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
      'completeness',
      'visitsPerNight',
      'visitNights',
      'sampleIntervalDays',
      'baselineDays',
      'skyBrightnessMagPerArcsec2',
      'worstSkyBrightnessMagPerArcsec2',
      'nodeHours',
      'feeMinor',
    ]);
    expect(key[1].label).toBe('Rossby number, Noyes et al. (1984) τ scale');
    expect(key[2].alternative).toMatch(/mmag$/);
    // The visit counts are whole numbers.
    for (const k of ['visitsForCompleteness50', 'visitsForCompleteness90', 'visitsForCompleteness99', 'visitNights'] as const) {
      expect(all.find((r) => r.key === k)!.value).toBe(formatValue(plan.quantities[k].value, 'en-US', { integer: true }));
    }
  });

  it('completeness: shown as a percentage with its why line, beside the visits, with what was asked for', () => {
    const plan = computeTargetPlan(K_DWARF, NODE, SITE, { completeness: 0.9 });
    const rows = keyRows(plan, 'en-US');
    const i = rows.findIndex((r) => r.key === 'completeness');
    expect(rows[i - 1].key).toBe('visits');
    expect(rows[i]).toEqual(
      expect.objectContaining({
        label: 'Completeness',
        value: `${Math.round(plan.quantities.completeness.value * 100)} %`,
        unit: '',
        alternative: 'asked for 90 %',
      }),
    );
    expect(rows[i].why).toBe(plan.quantities.completeness.why);
    expect(quantityRow(plan, 'requestedCompleteness', 'en-US')).toEqual(expect.objectContaining({ value: '90 %', unit: '' }));
  });

  it('no expected period: the period row says so with the reason instead of a number, and no search band is given', () => {
    const plan = computeTargetPlan({ ...K_DWARF, ageMyr: 14000 }, NODE, SITE);
    expect(plan.flags.some((f) => f.code === 'noExpectedPeriod' && f.severity === 'blocking')).toBe(true);
    const period = keyRows(plan, 'en-US')[0];
    expect(period.value).toBe('No expected period');
    expect(period.unit).toBe('');
    expect(period.alternative).toBeNull();
    expect(period.why).toMatch(/^The given age 14000 Myr exceeds the age of the universe/);
    expect(period.why).not.toMatch(/no expected period/i);
    expect(searchBandSentence(plan, 'en-US')).toBeNull();
    expect(allQuantityRows(plan, 'en-US').find((r) => r.key === 'periodDays')!.value).toBe('No expected period');
    // The proposer's period replaces it.
    const given = computeTargetPlan({ ...K_DWARF, ageMyr: 14000, periodDays: 30 }, NODE, SITE);
    expect(keyRows(given, 'en-US')[0].value).toBe('30');
  });

  it('the price of certainty: visits for 50, 90 and 99 %, node-hours in proportion, the plan’s own level marked', () => {
    const plan = computeTargetPlan(K_DWARF, NODE, SITE, { completeness: 0.9 });
    const q = plan.quantities;
    const prices = completenessPrices(plan, 'en-US');
    expect(prices.map((p) => p.completeness)).toEqual(['50 %', '90 %', '99 %']);
    expect(prices.map((p) => p.current)).toEqual([false, true, false]);
    expect(prices[1].visits).toBe(formatValue(q.visitsForCompleteness90.value, 'en-US', { integer: true }));
    expect(prices[2].nodeHours).toBe(formatValue((q.nodeHours.value * q.visitsForCompleteness99.value!) / q.visits.value, 'en-US'));
    expect(q.visitsForCompleteness50.value).toBeLessThanOrEqual(q.visitsForCompleteness99.value!);
  });

  it('the search band: periods from 1/fmax to 1/fmin at the plan’s false-alarm probability', () => {
    const plan = computeTargetPlan(K_DWARF, NODE, SITE, { falseAlarmProbability: 0.01 });
    const a = plan.analysis;
    expect(searchBandSentence(plan, 'en-US')).toContain(
      `Search the light curve for periods between ${formatValue(1 / a.maxFrequencyPerDay, 'en-US')} and ${formatValue(1 / a.minFrequencyPerDay, 'en-US')} d at false-alarm probability 0.01`,
    );
  });
});
