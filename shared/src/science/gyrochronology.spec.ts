import fc from 'fast-check';
import {
  type GyroRelationId,
  AGE_OF_UNIVERSE_MYR,
  GYRO_RELATIONS,
  GYRO_RELATION_INFO,
  INTRINSIC_SCATTER,
  ageFromPeriod,
  barnesAgeUncertainty,
  convergenceAgeMyr,
  estimateAge,
  periodFromAge,
  predictPeriod,
  weakenedBrakingRossby,
} from './gyrochronology';
import { fmt } from './explained';
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
    expect(wide.contributions.map((c) => c.parameter)).toEqual(['ageMyr', 'a', 'b', 'n', 'intrinsicScatter']);
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

  it('cautions about weakened braking past Ro ≈ Ro☉ (van Saders et al. 2016) and names the τ scale', () => {
    const sun = predictPeriod({ relation: 'barnes2007', colour: { value: 0.65, system: 'BV' }, ageMyr: 6000 });
    const f = sun.flags.find((x) => x.code === 'weakenedBraking');
    expect(f?.source).toMatch(/van Saders et al. \(2016\), Nature 529, 181/);
    expect(sun.rossby?.scale).toBe('noyes1984');
    const young = predictPeriod({ relation: 'barnes2007', colour: { value: 0.65, system: 'BV' }, ageMyr: 600 });
    expect(young.flags.some((x) => x.code === 'weakenedBraking')).toBe(false);
  });

  it('cautions (and still gives a number) for ages below the calibrated range (Angus et al. 2019: scatter large below 250 Myr)', () => {
    const young = predictPeriod({ relation: 'angus2019', colour: { value: 1.0, system: 'BPRP' }, ageMyr: 200 });
    expect(young.flags.find((f) => f.code === 'ageOutsideCalibration')?.severity).toBe('caution');
    expect(young.noResult).toBeNull();
    const inside = predictPeriod({ relation: 'angus2019', colour: { value: 1.0, system: 'BPRP' }, ageMyr: 300 });
    expect(inside.flags.map((f) => f.code)).not.toContain('ageOutsideCalibration');
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
    [
      { ...ok, relation: 'mamajekHillenbrand2008' as const, colour: { value: 0.45, system: 'BV' as const } },
      'colour.value',
      /offset c = 0.495/,
    ],
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

/** The blocking flags of a result with a given code. */
const blocking = (r: { flags: { code: string; severity: string; message: string }[] }, code: string) =>
  r.flags.filter((f) => f.code === code && f.severity === 'blocking');

describe('no number where the relation has none (calibration ranges)', () => {
  const sun = { relation: 'barnes2007' as const, colour: { value: 0.65, system: 'BV' as const } };

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('predictPeriod: an age above the age of the universe, 13 787 Myr (Planck Collaboration 2020, A&A 641, A6), gives no period', () => {
    const old = predictPeriod({ ...sun, ageMyr: 14000 });
    expect(old.noResult?.code).toBe('ageBeyondUniverse');
    expect(old.noResult?.reason).toMatch(/14000 Myr exceeds the age of the universe, 13787 Myr/);
    expect(blocking(old, 'noExpectedPeriod')).toHaveLength(1);
    expect(blocking(old, 'noExpectedPeriod')[0].message).toMatch(/14000/);
    const ok = predictPeriod({ ...sun, ageMyr: 13000 });
    expect(ok.noResult).toBeNull();
    expect(ok.flags.some((f) => f.severity === 'blocking')).toBe(false);
    expect(ok.flags.find((f) => f.code === 'ageOutsideCalibration')?.severity).toBe('caution');
    expect(AGE_OF_UNIVERSE_MYR).toBe(13787);
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('estimateAge: a period whose Barnes (2007) age exceeds the age of the universe (Planck Collaboration 2020) gives no age', () => {
    const slow = estimateAge({ ...sun, periodDays: 50 });
    expect(slow.ageMyr).toBeGreaterThan(AGE_OF_UNIVERSE_MYR);
    expect(slow.noResult?.code).toBe('ageBeyondUniverse');
    expect(blocking(slow, 'noGyroAge')[0].message).toContain(`${fmt(slow.ageMyr, 4)} Myr exceeds the age of the universe`);
    const ok = estimateAge({ ...sun, periodDays: 40 });
    expect(ok.ageMyr).toBeLessThan(AGE_OF_UNIVERSE_MYR);
    expect(ok.noResult).toBeNull();
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('estimateAge: a period below the slow sequence (Ro ≤ 0.1 on the Noyes scale, Wright et al. 2011 saturation) gives no age, on any τ scale', () => {
    const k2 = { relation: 'barnes2007' as const, colour: { value: 0.884, system: 'BV' as const } };
    const fast = estimateAge({ ...k2, periodDays: 1.5 });
    expect(fast.rossby?.rossby).toBeLessThan(0.1);
    expect(fast.noResult?.code).toBe('belowSlowSequence');
    expect(blocking(fast, 'noGyroAge')[0].message).toMatch(/period 1.5 d gives Ro 0.069/);
    // Ro 0.101 on the Wright et al. (2018) scale is 0.090 on the Noyes scale: still saturated.
    const fastW18 = estimateAge({ ...k2, periodDays: 1.5, turnoverScale: 'wright2018' });
    expect(fastW18.rossby?.rossby).toBeGreaterThan(0.1);
    expect(fastW18.noResult?.code).toBe('belowSlowSequence');
    const slowEnough = estimateAge({ ...k2, periodDays: 5 });
    expect(slowEnough.noResult).toBeNull();
  });

  it("colours outside a relation's calibrated range give no result (Mamajek & Hillenbrand 2008: 0.5 < (B−V)0 < 0.9)", () => {
    const red = predictPeriod({ relation: 'mamajekHillenbrand2008', colour: { value: 1.2, system: 'BV' }, ageMyr: 1000 });
    expect(red.noResult?.code).toBe('colourOutsideCalibration');
    expect(red.noResult?.reason).toMatch(/B−V 1.2 is outside the calibrated range of Mamajek & Hillenbrand \(2008\)/);
    expect(blocking(red, 'noExpectedPeriod')).not.toHaveLength(0);
    expect(estimateAge({ relation: 'mamajekHillenbrand2008', colour: { value: 1.2, system: 'BV' }, periodDays: 20 }).noResult?.code).toBe(
      'colourOutsideCalibration',
    );
    const inside = predictPeriod({ relation: 'mamajekHillenbrand2008', colour: { value: 0.7, system: 'BV' }, ageMyr: 1000 });
    expect(inside.noResult).toBeNull();
  });

  it('the M-dwarf linear branch of Angus et al. (2019), BP−RP ≥ 2.7, outside its calibrated 0.56–2.7, gives no result', () => {
    const m = predictPeriod({ relation: 'angus2019', colour: { value: 3.0, system: 'BPRP' }, ageMyr: 2000 });
    expect(m.noResult?.code).toBe('angus2019LinearBranch');
    expect(m.noResult?.reason).toMatch(/BP−RP 3 falls on the M-dwarf linear branch/);
    const inside = predictPeriod({ relation: 'angus2019', colour: { value: 2.6, system: 'BPRP' }, ageMyr: 2000 });
    expect(inside.noResult).toBeNull();
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('F stars above the Kraft break ≈ 6200 K (Kraft 1967, ApJ 150, 551; Teff from Pecaut & Mamajek 2013) give no result', () => {
    const hot = predictPeriod({ relation: 'angus2019', colour: { value: 0.6, system: 'BPRP' }, ageMyr: 2000 });
    expect(hot.noResult?.code).toBe('aboveKraftBreak');
    expect(hot.noResult?.reason).toMatch(/Teff ≈ 6505 K on the dwarf sequence, above the Kraft break ≈ 6200 K/);
    const hotAge = estimateAge({ relation: 'barnes2007', colour: { value: 0.47, system: 'BV' }, periodDays: 5 });
    expect(hotAge.noResult).not.toBeNull();
    expect(
      hotAge.flags
        .filter((f) => f.code === 'noGyroAge')
        .map((f) => f.message)
        .join(),
    ).toMatch(/Kraft break/);
    const cool = predictPeriod({ relation: 'angus2019', colour: { value: 0.75, system: 'BPRP' }, ageMyr: 2000 });
    expect(cool.noResult).toBeNull();
    expect(estimateAge({ relation: 'barnes2007', colour: { value: 0.55, system: 'BV' }, periodDays: 5 }).noResult).toBeNull();
  });

  it('B−V relations give no result from (B−V)0 1.42 (M0V, Pecaut & Mamajek 2013 Table 5: B−V nearly flat from M0V to M3V)', () => {
    const m1 = predictPeriod({ relation: 'barnes2007', colour: { value: 1.45, system: 'BV' }, ageMyr: 2000 });
    expect(m1.noResult?.code).toBe('bvDoesNotTrackMass');
    expect(m1.noResult?.reason).toMatch(/\(B−V\)0 1.45 is at or above 1.42/);
    const k7 = predictPeriod({ relation: 'barnes2007', colour: { value: 1.38, system: 'BV' }, ageMyr: 2000 });
    expect(k7.noResult).toBeNull();
    // The BP−RP relation keeps working there.
    expect(predictPeriod({ relation: 'angus2019', colour: { value: 1.45, system: 'BV' }, ageMyr: 2000 }).noResult).toBeNull();
  });
});

// The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
describe('convergence onto the slow sequence (Barnes 2003, ApJ 586, 464; Curtis et al. 2020)', () => {
  it('cautions mayNotHaveConverged for a K5 dwarf younger than its convergence age, and not when older', () => {
    const k5 = { relation: 'barnes2007' as const, colour: { value: 1.15, system: 'BV' as const } };
    expect(convergenceAgeMyr(4440)).toBeCloseTo(583, 0);
    const young = predictPeriod({ ...k5, ageMyr: 500 });
    const f = young.flags.find((x) => x.code === 'mayNotHaveConverged');
    expect(f?.severity).toBe('caution');
    expect(f?.message).toMatch(/age 500 Myr is below ≈ 580 Myr/);
    expect(young.noResult).toBeNull();
    expect(predictPeriod({ ...k5, ageMyr: 800 }).flags.map((x) => x.code)).not.toContain('mayNotHaveConverged');
    const youngAge = estimateAge({ ...k5, periodDays: predictPeriod({ ...k5, ageMyr: 400 }).periodDays });
    expect(youngAge.flags.map((x) => x.code)).toContain('mayNotHaveConverged');
  });

  it('applies to K and M dwarfs only: a G2V dwarf at 120 Myr gets no convergence caution', () => {
    expect(convergenceAgeMyr(5770)).toBeNull();
    const g = predictPeriod({ relation: 'barnes2007', colour: { value: 0.65, system: 'BV' }, ageMyr: 120 });
    expect(g.flags.map((x) => x.code)).not.toContain('mayNotHaveConverged');
  });

  it('converges later for cooler stars, and no later than 2 Gyr', () => {
    const ages = [5200, 4800, 4400, 4000, 3600, 3200].map((t) => convergenceAgeMyr(t) as number);
    for (let i = 1; i < ages.length; i++) expect(ages[i]).toBeGreaterThanOrEqual(ages[i - 1]);
    expect(ages[ages.length - 1]).toBe(2000);
  });
});

// The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
describe('weakened braking on the τ scale in use (van Saders et al. 2016, Nature 529, 181: Ro_crit ≈ Ro☉)', () => {
  const g2 = { relation: 'barnes2007' as const, colour: { value: 0.65, system: 'BV' as const } };

  it('states the threshold as ≈ the solar Ro of each scale: 2.18 Noyes, 1.80 Wright 2011, 2.43 Wright 2018 [derived]', () => {
    expect(weakenedBrakingRossby('noyes1984')).toBeCloseTo(26.09 / 11.99, 2);
    expect(weakenedBrakingRossby('wright2011')).toBeCloseTo(26.09 / 14.45, 2);
    expect(weakenedBrakingRossby('wright2018')).toBeCloseTo(26.09 / 10 ** (0.64 + 0.25 * 1.56), 6);
  });

  it('fires on the Wright et al. (2011) scale at Ro 1.93 > 1.80 (a fixed 2 would not) and names the scale and threshold', () => {
    const p = predictPeriod({ ...g2, ageMyr: 5000, turnoverScale: 'wright2011' });
    expect(p.rossby?.rossby).toBeGreaterThan(1.8);
    expect(p.rossby?.rossby).toBeLessThan(2);
    expect(p.flags.find((f) => f.code === 'weakenedBraking')?.message).toMatch(
      /^Ro 1.9\d? exceeds ≈ 1.8 on the Wright et al. \(2011\) τ scale \(≈ the solar value\)/,
    );
  });

  it('does not fire on the Wright et al. (2018) scale at Ro 2.16 < 2.43 (a fixed 2 would)', () => {
    const p = predictPeriod({ ...g2, ageMyr: 3500, turnoverScale: 'wright2018' });
    expect(p.rossby?.rossby).toBeGreaterThan(2);
    expect(p.flags.map((f) => f.code)).not.toContain('weakenedBraking');
  });

  it('honours an explicit weakenedBrakingRossby and says it was given', () => {
    const high = predictPeriod({ ...g2, ageMyr: 6000, weakenedBrakingRossby: 3 });
    expect(high.flags.map((f) => f.code)).not.toContain('weakenedBraking');
    const low = predictPeriod({ ...g2, ageMyr: 3000, weakenedBrakingRossby: 1.5 });
    expect(low.flags.find((f) => f.code === 'weakenedBraking')?.message).toMatch(
      /exceeds the given 1.5 on the Noyes et al. \(1984\) τ scale/,
    );
  });
});

describe('intrinsic scatter in every range', () => {
  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('Angus et al. (2019) at the solar colour and age, with no age error, has a non-zero range (scatter 5 %)', () => {
    const p = predictPeriod({ relation: 'angus2019', colour: { value: 0.82, system: 'BPRP' }, ageMyr: 4570 });
    expect(p.periodDays).toBeCloseTo(26.02, 2); // SCIENCE.md §8 #4: the scatter leaves the central value alone
    expect(p.contributions.find((c) => c.parameter === 'cA')?.upperLn).toBeCloseTo(0, 9);
    expect(p.contributions.find((c) => c.parameter === 'intrinsicScatter')).toEqual({
      parameter: 'intrinsicScatter',
      lowerLn: 0.05,
      upperLn: 0.05,
    });
    expect(Math.log(p.rangeDays.high / p.periodDays)).toBeCloseTo(0.05, 9);
    expect(Math.log(p.periodDays / p.rangeDays.low)).toBeCloseTo(0.05, 9);
  });

  it.each(GYRO_RELATIONS)('%s: the period range is at least the published/adopted scatter wide (INTRINSIC_SCATTER source)', (relation) => {
    const system = GYRO_RELATION_INFO[relation].colourSystem;
    const colour = { value: system === 'BV' ? 0.7 : 0.9, system };
    const p = predictPeriod({ relation, colour, ageMyr: 2000 });
    const s = INTRINSIC_SCATTER[relation].lnPeriod;
    expect(s).toBeGreaterThan(0);
    expect(Math.log(p.rangeDays.high / p.periodDays)).toBeGreaterThanOrEqual(s - 1e-12);
    expect(Math.log(p.periodDays / p.rangeDays.low)).toBeGreaterThanOrEqual(s - 1e-12);
    const a = estimateAge({ relation, colour, periodDays: p.periodDays });
    expect(a.contributions.map((c) => c.parameter)).toContain('intrinsicScatter');
    expect(a.rangeMyr.high).toBeGreaterThan(a.ageMyr);
    expect(a.rangeMyr.low).toBeLessThan(a.ageMyr);
  });

  // The value or formula under test is recalled, not re-read (docs/science.md "Checked values").
  it('Mamajek & Hillenbrand (2008): 0.05 dex in age is 0.05·ln 10 in ln age and n times that in ln P', () => {
    const a = estimateAge({ relation: 'mamajekHillenbrand2008', colour: { value: 0.7, system: 'BV' }, periodDays: 15 });
    expect(a.contributions.find((c) => c.parameter === 'intrinsicScatter')?.upperLn).toBeCloseTo(0.05 * Math.LN10, 12);
    expect(INTRINSIC_SCATTER.mamajekHillenbrand2008.lnPeriod).toBeCloseTo(0.566 * 0.05 * Math.LN10, 12);
  });

  it('Barnes (2007): fractionalUncertainty stays eq. 16 (SCIENCE.md §8 #5) while the range adds the scatter on top', () => {
    const a = estimateAge({ relation: 'barnes2007', colour: { value: 0.642, system: 'BV' }, periodDays: 26.09 });
    expect(a.fractionalUncertainty).toBeCloseTo(0.168, 3);
    expect(a.fractionalUncertainty).toBe(barnesAgeUncertainty(a.ageMyr, 26.09, 0.642));
    const eq16Only = Math.log(1 + a.fractionalUncertainty);
    const scatter = 0.05 / 0.5189;
    expect(Math.log(a.rangeMyr.high / a.ageMyr)).toBeCloseTo(Math.hypot(eq16Only, scatter), 12);
    expect(a.rangeMyr.high).toBeGreaterThan(a.ageMyr * (1 + a.fractionalUncertainty));
  });
});
