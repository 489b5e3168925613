import { altitudeForAirmassDeg, kastenYoungAirmass } from './airmass-limit';
import { SkyInputError } from './sky-input-error';

describe('Kasten & Young airmass', () => {
  // SCIENCE.md §8 check value 9 [derived]: Kasten–Young airmass at 30° / 90° = 1.9943 / 0.9997.
  it('gives 1.9943 at 30° and 0.9997 at 90° (SCIENCE.md §8 #9)', () => {
    expect(kastenYoungAirmass(30)).toBeCloseTo(1.9943, 4);
    expect(kastenYoungAirmass(90)).toBeCloseTo(0.9997, 4);
  });

  it('altitudeForAirmassDeg inverts it (airmass 2 → 29.905°, 1.9943 → 30°)', () => {
    expect(altitudeForAirmassDeg(1.9943)).toBeCloseTo(30, 3);
    expect(altitudeForAirmassDeg(2)).toBeCloseTo(29.905, 3);
    for (const alt of [5, 15, 45, 70, 85]) expect(altitudeForAirmassDeg(kastenYoungAirmass(alt))).toBeCloseTo(alt, 8);
  });

  it('refuses airmass below 1, above the horizon value, or NaN, naming the field', () => {
    for (const x of [0.99, 40, Number.NaN]) {
      expect(() => altitudeForAirmassDeg(x)).toThrow(SkyInputError);
    }
    expect(() => altitudeForAirmassDeg(0.5, 'limits.airmassLimit')).toThrow('limits.airmassLimit');
  });
});
