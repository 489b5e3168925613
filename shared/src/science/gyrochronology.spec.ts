import fc from 'fast-check';
import {
  type GyroRelationId,
  GYRO_RELATIONS,
  GYRO_RELATION_INFO,
  ageFromPeriod,
  barnesAgeUncertainty,
  estimateAge,
  periodFromAge,
  predictPeriod,
} from './gyrochronology';
import { ScienceInputError } from './science-input-error';

describe('gyrochronology check values (SCIENCE.md §8)', () => {
  it('#1 Barnes 2007, B−V 0.642, 4566 Myr → 26.09 d ([derived] from Barnes 2007 coefficients; his solar calibration)', () => {
    expect(periodFromAge('barnes2007', 0.642, 4566)).toBeCloseTo(26.09, 2);
  });
  it('#2 Mamajek & Hillenbrand 2008, B−V 0.65, 4570 Myr → 26.18 d ([derived])', () => {
    expect(periodFromAge('mamajekHillenbrand2008', 0.65, 4570)).toBeCloseTo(26.18, 2);
  });
  it('#3 Angus 2015, B−V 0.65, 4570 Myr → 25.02 d ([derived])', () => {
    expect(periodFromAge('angus2015', 0.65, 4570)).toBeCloseTo(25.02, 2);
  });
  it('#4 Angus 2019, BP−RP 0.82, 4.57 Gyr → 26.02 d ([derived])', () => {
    expect(periodFromAge('angus2019', 0.82, 4570)).toBeCloseTo(26.02, 2);
  });
  it('#5 Barnes eq. 16 inverse, P 26.09 d, B−V 0.642 → 4565 Myr, δt/t ≈ 0.168 ([derived])', () => {
    const a = estimateAge({ relation: 'barnes2007', colour: { value: 0.642, system: 'BV' }, periodDays: 26.09 });
    expect(a.ageMyr).toBeCloseTo(4565, 0);
    expect(a.fractionalUncertainty).toBeCloseTo(0.168, 3);
    expect(barnesAgeUncertainty(4565, 26.09, 0.642)).toBeCloseTo(0.168, 3);
    expect(a.uncertaintySource).toMatch(/Barnes \(2007\), ApJ 669, 1167, eq. 16/);
  });
});

/** Colours and ages inside each relation's calibrated range, in its own colour system. */
const calibrated = (r: GyroRelationId) => {
  const info = GYRO_RELATION_INFO[r];
  return fc.record({
    colour: fc.double({ min: info.calibratedColour.min + 1e-6, max: info.calibratedColour.max - 1e-6, noNaN: true }),
    ageMyr: fc.double({ min: info.calibratedAgeMyr.min, max: info.calibratedAgeMyr.max, noNaN: true }),
  });
};

describe('forward ∘ inverse', () => {
  it.each(GYRO_RELATIONS)('returns the input age for %s inside its calibrated range (property)', (relation) => {
    fc.assert(
      fc.property(calibrated(relation), ({ colour, ageMyr }) => {
        const p = periodFromAge(relation, colour, ageMyr);
        expect(ageFromPeriod(relation, colour, p) / ageMyr).toBeCloseTo(1, 9);
      }),
    );
  });

  it.each(GYRO_RELATIONS)('predictPeriod and estimateAge agree for %s (property)', (relation) => {
    const system = GYRO_RELATION_INFO[relation].colourSystem;
    fc.assert(
      fc.property(calibrated(relation), ({ colour, ageMyr }) => {
        const p = predictPeriod({ relation, colour: { value: colour, system }, ageMyr });
        const a = estimateAge({ relation, colour: { value: colour, system }, periodDays: p.periodDays });
        expect(a.ageMyr / ageMyr).toBeCloseTo(1, 9);
      }),
      { numRuns: 50 },
    );
  });
});

describe('predictPeriod', () => {
  it('brackets the period with a range that widens with the age uncertainty', () => {
    const base = { relation: 'barnes2007' as const, colour: { value: 0.65, system: 'BV' as const }, ageMyr: 2000 };
    const narrow = predictPeriod({ ...base, ageUncertaintyMyr: 100 });
    const wide = predictPeriod({ ...base, ageUncertaintyMyr: 800 });
    expect(narrow.rangeDays.low).toBeLessThan(narrow.periodDays);
    expect(narrow.rangeDays.high).toBeGreaterThan(narrow.periodDays);
    expect(wide.rangeDays.low).toBeLessThan(narrow.rangeDays.low);
    expect(wide.rangeDays.high).toBeGreaterThan(narrow.rangeDays.high);
    expect(wide.contributions.map((c) => c.parameter)).toEqual(['ageMyr', 'a', 'b', 'n']);
  });

  it('is asymmetric for Angus 2015, whose coefficients have asymmetric errors', () => {
    const p = predictPeriod({ relation: 'angus2015', colour: { value: 0.65, system: 'BV' }, ageMyr: 2000 });
    expect(p.lnPeriodSigma.upper).not.toBeCloseTo(p.lnPeriodSigma.lower, 2);
  });

  it('scales the range with rangeSigma', () => {
    const base = { relation: 'mamajekHillenbrand2008' as const, colour: { value: 0.7, system: 'BV' as const }, ageMyr: 1000 };
    const one = predictPeriod(base);
    const two = predictPeriod({ ...base, rangeSigma: 2 });
    expect(Math.log(two.rangeDays.high / two.periodDays)).toBeCloseTo(2 * Math.log(one.rangeDays.high / one.periodDays), 10);
  });

  it('is deterministic', () => {
    const input = { relation: 'angus2019' as const, colour: { value: 1.2, system: 'BPRP' as const }, ageMyr: 1500, ageUncertaintyMyr: 300 };
    expect(predictPeriod(input)).toEqual(predictPeriod(input));
  });

  it('cautions about weakened braking past Ro ≈ 2 (van Saders et al. 2016) and names the τ scale', () => {
    const sun = predictPeriod({ relation: 'barnes2007', colour: { value: 0.65, system: 'BV' }, ageMyr: 6000 });
    const f = sun.flags.find((x) => x.code === 'weakenedBraking');
    expect(f?.source).toMatch(/van Saders et al. \(2016\), Nature 529, 181/);
    expect(sun.rossby?.scale).toBe('noyes1984');
    const young = predictPeriod({ relation: 'barnes2007', colour: { value: 0.65, system: 'BV' }, ageMyr: 600 });
    expect(young.flags.some((x) => x.code === 'weakenedBraking')).toBe(false);
  });

  it('flags colours and ages outside the calibrated range instead of extrapolating silently', () => {
    const p = predictPeriod({ relation: 'mamajekHillenbrand2008', colour: { value: 1.2, system: 'BV' }, ageMyr: 50 });
    expect(p.flags.map((f) => f.code)).toEqual(expect.arrayContaining(['colourOutsideCalibration', 'ageOutsideCalibration']));
    const a19 = predictPeriod({ relation: 'angus2019', colour: { value: 1.0, system: 'BPRP' }, ageMyr: 200 });
    expect(a19.flags.map((f) => f.code)).toContain('ageOutsideCalibration');
    const m = predictPeriod({ relation: 'angus2019', colour: { value: 3.0, system: 'BPRP' }, ageMyr: 2000 });
    expect(m.flags.map((f) => f.code)).toEqual(expect.arrayContaining(['colourOutsideCalibration', 'angus2019LinearBranch']));
  });

  it('converts the colour through the dwarf sequence when the relation takes the other system', () => {
    const p = predictPeriod({ relation: 'angus2019', colour: { value: 0.65, system: 'BV' }, ageMyr: 4570 });
    expect(p.relationColour.value).toBeCloseTo(0.823, 9);
    expect(p.flags.map((f) => f.code)).toContain('colourConverted');
  });

  it('de-reddens before applying the relation', () => {
    const red = predictPeriod({ relation: 'barnes2007', colour: { value: 0.742, system: 'BV' }, reddeningEbvMag: 0.1, ageMyr: 4566 });
    expect(red.periodDays).toBeCloseTo(26.09, 2);
  });
});

describe('bad input', () => {
  const ok = { relation: 'barnes2007' as const, colour: { value: 0.65, system: 'BV' as const }, ageMyr: 1000 };
  it.each([
    [{ ...ok, ageMyr: -5 }, 'ageMyr', /must be positive/],
    [{ ...ok, ageMyr: Number.NaN }, 'ageMyr', /finite/],
    [{ ...ok, ageUncertaintyMyr: -1 }, 'ageUncertaintyMyr', /negative/],
    [{ ...ok, colour: { value: 2.5, system: 'BV' as const } }, 'colour.value', /outside all supported relations/],
    [{ ...ok, colour: { value: 0.3, system: 'BV' as const } }, 'colour.value', /outside all supported relations/],
    [{ ...ok, colour: { value: 0.2, system: 'BPRP' as const } }, 'colour.value', /outside all supported relations/],
    [{ ...ok, colour: { value: Number.NaN, system: 'BV' as const } }, 'colour.value', /finite/],
    [{ ...ok, relation: 'skumanich' as never }, 'relation', /must be one of/],
    [{ ...ok, relation: 'mamajekHillenbrand2008' as const, colour: { value: 0.45, system: 'BV' as const } }, 'colour.value', /offset c = 0.495/],
  ])('predictPeriod(%o) throws ScienceInputError on %s', (input, field, message) => {
    let err: unknown;
    try {
      predictPeriod(input);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ScienceInputError);
    expect((err as ScienceInputError).field).toBe(field);
    expect((err as Error).message).toMatch(message);
  });

  it('estimateAge rejects a zero or NaN period and a negative period error', () => {
    const c = { relation: 'angus2015' as const, colour: { value: 0.7, system: 'BV' as const } };
    expect(() => estimateAge({ ...c, periodDays: 0 })).toThrow(/periodDays: must be positive/);
    expect(() => estimateAge({ ...c, periodDays: Number.NaN })).toThrow(/periodDays/);
    expect(() => estimateAge({ ...c, periodDays: 10, periodUncertaintyDays: -1 })).toThrow(/periodUncertaintyDays/);
  });

  it('never returns NaN across the supported colour domain (property)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...GYRO_RELATIONS),
        fc.double({ min: 0.401, max: 1.83, noNaN: true }),
        fc.double({ min: 1, max: 14000, noNaN: true }),
        fc.double({ min: 0, max: 5000, noNaN: true }),
        (relation, bv, ageMyr, ageUncertaintyMyr) => {
          try {
            const p = predictPeriod({ relation, colour: { value: bv, system: 'BV' }, ageMyr, ageUncertaintyMyr });
            for (const v of [p.periodDays, p.rangeDays.low, p.rangeDays.high, p.lnPeriodSigma.lower, p.lnPeriodSigma.upper]) {
              expect(Number.isFinite(v)).toBe(true);
            }
          } catch (e) {
            expect(e).toBeInstanceOf(ScienceInputError);
          }
        },
      ),
    );
  });
});
