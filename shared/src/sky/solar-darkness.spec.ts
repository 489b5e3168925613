/**
 * The darkness edges against astronomy-engine's own `SearchAltitude` (the function SCIENCE.md §7
 * names), on seeded random sites and dates including the polar day/night boundaries.
 */
import { Body, Observer, SearchAltitude } from 'astronomy-engine';
import fc from 'fast-check';
import { utDaysFromMs } from './astro-time';
import { nightWindow, parseNightDate } from './local-nights';
import { findNightDarkness, sunGeometricAltitudeDeg } from './solar-darkness';

// Property checks against the slow engine reference can take seconds on a busy machine.
jest.setTimeout(120_000);

describe('findNightDarkness', () => {
  it('agrees with SearchAltitude within 1 s at random sites (±89°), dates and Sun limits', () => {
    let compared = 0;
    fc.assert(
      fc.property(
        fc.double({ min: -89, max: 89, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.integer({ min: parseNightDate('2020-01-01', 'd'), max: parseNightDate('2030-12-31', 'd') }),
        fc.constantFrom(-18, -15, -12, -6),
        (lat, lon, day, limit) => {
          const observer = new Observer(lat, lon, 0);
          const w = nightWindow(day, lon, 'UTC');
          const w0 = utDaysFromMs(w.startUtcMs);
          const w1 = utDaysFromMs(w.endUtcMs);
          const dark = findNightDarkness(observer, w0, w1, limit);
          if (dark.darkness === 'none') {
            expect(dark.sunMinAltitudeDeg).toBeGreaterThan(limit);
            return;
          }
          const dusk = SearchAltitude(Body.Sun, observer, -1, dark.midDarkUt, w0 - dark.midDarkUt, limit);
          const dawn = SearchAltitude(Body.Sun, observer, +1, dark.midDarkUt, w1 - dark.midDarkUt, limit);
          expect(Math.abs((dusk ? dusk.ut : w0) - dark.darkStartUt!) * 86_400).toBeLessThan(1);
          expect(Math.abs((dawn ? dawn.ut : w1) - dark.darkEndUt!) * 86_400).toBeLessThan(1);
          if (dusk) expect(Math.abs(sunGeometricAltitudeDeg(observer, dark.darkStartUt!) - limit)).toBeLessThan(0.001);
          compared++;
        },
      ),
      { seed: 1801, numRuns: 400 },
    );
    expect(compared).toBeGreaterThan(250);
  });

  it('at the edge of polar night (78.2°N, 2024-11-06, limit −12°) the darkness is long and clipped correctly', () => {
    const observer = new Observer(78.2, 15.6, 0);
    for (let d = parseNightDate('2024-11-01', 'd'); d <= parseNightDate('2024-11-20', 'd'); d++) {
      const w = nightWindow(d, 15.6, 'Arctic/Longyearbyen');
      const dark = findNightDarkness(observer, utDaysFromMs(w.startUtcMs), utDaysFromMs(w.endUtcMs), -12);
      expect(dark.darkness).not.toBe('none');
      expect(dark.darkEndUt! - dark.darkStartUt!).toBeGreaterThan(0.5);
    }
  });
});
