/**
 * The fast path checked against astronomy-engine evaluated instant by instant, and against the
 * check values of SCIENCE.md §8 (11 and 12).
 */
import { AngleBetween, Body, Equator, Horizon, Illumination, Observer } from 'astronomy-engine';
import fc from 'fast-check';
import { msFromUtDays, utDaysFromMs } from './astro-time';
import { bruteForceIntervals, engineHorizontal } from './engine-brute-force';
import { parseNightDate, toIsoUtc } from './local-nights';
import { buildNightTable } from './night-ephemeris';
import { computeSkyWindows, listTargetNights, toUsableHoursGrid } from './sky-windows';
import { skyLimitsForNode, toSkyWindowsReport } from './sky-windows-report';
import type { RefractionMode, SkySite, SkyTarget } from './sky-types';
import { fastHorizontal } from './target-visibility';

// Property checks against the slow engine reference can take seconds on a busy machine.
jest.setTimeout(120_000);

/** SCIENCE.md §8 check value 11/12 site (coordinates only; the name is not needed). */
const CHECK_SITE: SkySite = { latitudeDeg: 31.9583, longitudeDeg: -111.5967, elevationM: 2096, timeZone: 'America/Phoenix' };
/** SCIENCE.md §8 check value 11 star (Vega, J2000). */
const VEGA: SkyTarget = { name: 'Vega', raDeg: 279.23473479, decDeg: 38.78368896 };

function observerOf(site: SkySite): Observer {
  return new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
}

/** Etc/GMT zone nearest to a longitude (its sign is inverted by the IANA convention). */
function etcZone(longitudeDeg: number): string {
  const hours = Math.round(longitudeDeg / 15);
  if (hours === 0) return 'Etc/GMT';
  return hours > 0 ? `Etc/GMT-${hours}` : `Etc/GMT+${-hours}`;
}

describe('sky windows, check values of SCIENCE.md §8', () => {
  // Check value 11: derived here from astronomy-engine (no refraction); the same value against
  // astropy 5.2.1, run in the test, is in test/reference/sky-windows-astropy.spec.ts.
  it('Vega at the check site on 2024-06-21 07:00 UTC has alt 75.246°, az 57.908° (§8 #11; source: derived from astronomy-engine Horizon without refraction; astropy 5.2.1 agrees within 0.001° in test/reference)', () => {
    const ut = utDaysFromMs(Date.parse('2024-06-21T07:00:00Z'));
    const engine = engineHorizontal(observerOf(CHECK_SITE), VEGA, ut, 'none');
    expect(Math.abs(engine.altitudeDeg - 75.246)).toBeLessThan(0.001);
    expect(Math.abs(engine.azimuthDeg - 57.908)).toBeLessThan(0.001);

    const day = parseNightDate('2024-06-20', 'night');
    const table = buildNightTable(CHECK_SITE, day, day, -18);
    const fast = fastHorizontal(VEGA, table, 0, ut, 'none');
    expect(Math.abs(fast.altitudeDeg - 75.246)).toBeLessThan(0.002);
    expect(Math.abs(fast.azimuthDeg - 57.908)).toBeLessThan(0.002);
  });

  // Check value 12: derived here from astronomy-engine; the Sun's altitude at that instant
  // (−18.000°) is astropy 5.2.1's, run in test/reference/sky-windows-astropy.spec.ts.
  it('astronomical dusk of the night of 2024-06-21 at the check site is 2024-06-22 04:15:53 UTC (§8 #12; source: derived from astronomy-engine SearchAltitude(Sun, −18°); astropy 5.2.1 puts the Sun at −18.000° then, in test/reference)', () => {
    const result = computeSkyWindows({
      site: CHECK_SITE,
      limits: { altitudeLimitDeg: 30 },
      campaign: { firstNight: '2024-06-21', lastNight: '2024-06-21' },
      targets: [],
    });
    const night = result.nights[0];
    expect(night.darkness).toBe('partial');
    expect(Math.abs(night.darkStartUtcMs! - Date.parse('2024-06-22T04:15:53Z'))).toBeLessThan(3000);
  });
});

describe('sky windows fast path against astronomy-engine Horizon (seeded random sites, dates, targets)', () => {
  const arbitraryCase = fc.record({
    latitudeDeg: fc.double({ min: -65, max: 65, noNaN: true }),
    longitudeDeg: fc.double({ min: -180, max: 180, noNaN: true }),
    dayNumber: fc.integer({ min: parseNightDate('2020-01-01', 'd'), max: parseNightDate('2030-12-31', 'd') }),
    raDeg: fc.double({ min: 0, max: 359.999, noNaN: true }),
    decDeg: fc.double({ min: -89, max: 89, noNaN: true }),
    altitudeLimitDeg: fc.double({ min: 10, max: 60, noNaN: true }),
    refraction: fc.constantFrom<RefractionMode>('normal', 'none'),
    instantFractions: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }),
  });

  it('altitude and azimuth at random instants agree with Horizon (same refraction) within 0.05°', () => {
    let worst = 0;
    fc.assert(
      fc.property(arbitraryCase, (c) => {
        const site: SkySite = {
          latitudeDeg: c.latitudeDeg,
          longitudeDeg: c.longitudeDeg,
          elevationM: 500,
          timeZone: etcZone(c.longitudeDeg),
        };
        const target: SkyTarget = { raDeg: c.raDeg, decDeg: c.decDeg };
        const table = buildNightTable(site, c.dayNumber, c.dayNumber, -18);
        const observer = observerOf(site);
        for (const f of c.instantFractions) {
          const ut = table.windowStartUt[0] + f * (table.windowEndUt[0] - table.windowStartUt[0]);
          const fast = fastHorizontal(target, table, 0, ut, c.refraction);
          const engine = engineHorizontal(observer, target, ut, c.refraction);
          const diff = Math.abs(fast.altitudeDeg - engine.altitudeDeg);
          worst = Math.max(worst, diff);
          expect(diff).toBeLessThan(0.05);
          if (engine.altitudeDeg < 85) {
            const dAz = Math.abs(((fast.azimuthDeg - engine.azimuthDeg + 540) % 360) - 180);
            expect(dAz).toBeLessThan(0.05);
          }
        }
      }),
      { seed: 20240621, numRuns: 300 },
    );
    // The fast path is in fact far better than the tolerance (a few arcseconds).
    expect(worst).toBeLessThan(0.005);
  });

  it('usable interval edges agree with a brute-force bisection on Horizon within 1 minute', () => {
    let worstSeconds = 0;
    let compared = 0;
    fc.assert(
      fc.property(arbitraryCase, (c) => {
        // Avoid grazing cases (culmination within 1° of the limit), where a tiny interval may
        // fall between brute-force samples.
        const upper = 90 - Math.abs(c.latitudeDeg - c.decDeg);
        const lower = Math.abs(c.latitudeDeg + c.decDeg) - 90;
        fc.pre(Math.abs(upper - c.altitudeLimitDeg) > 1 && Math.abs(lower - c.altitudeLimitDeg) > 1);
        const site: SkySite = {
          latitudeDeg: c.latitudeDeg,
          longitudeDeg: c.longitudeDeg,
          elevationM: 1200,
          timeZone: etcZone(c.longitudeDeg),
        };
        const target: SkyTarget = { raDeg: c.raDeg, decDeg: c.decDeg };
        const night = new Date(c.dayNumber * 86_400_000).toISOString().slice(0, 10);
        const result = computeSkyWindows({
          site,
          limits: { altitudeLimitDeg: c.altitudeLimitDeg, refraction: c.refraction },
          campaign: { firstNight: night, lastNight: night },
          targets: [target],
        });
        const dark = result.nights[0];
        fc.pre(dark.darkStartUtcMs !== null);
        const fast = listTargetNights(result, 0)[0].intervals;
        const brute = bruteForceIntervals(
          observerOf(site),
          target,
          utDaysFromMs(dark.darkStartUtcMs!),
          utDaysFromMs(dark.darkEndUtcMs!),
          c.altitudeLimitDeg,
          c.refraction,
        );
        expect(fast.length).toBe(brute.length);
        fast.forEach((interval, i) => {
          const ds = Math.abs(interval.startUtcMs - msFromUtDays(brute[i][0])) / 1000;
          const de = Math.abs(interval.endUtcMs - msFromUtDays(brute[i][1])) / 1000;
          worstSeconds = Math.max(worstSeconds, ds, de);
          expect(ds).toBeLessThan(60);
          expect(de).toBeLessThan(60);
        });
        compared += fast.length;
      }),
      { seed: 424242, numRuns: 200 },
    );
    expect(compared).toBeGreaterThan(50);
    expect(worstSeconds).toBeLessThan(5);
  });

  it('Moon illumination, separation and altitude agree with Equator/Illumination within 0.05°', () => {
    fc.assert(
      fc.property(arbitraryCase, (c) => {
        const site: SkySite = {
          latitudeDeg: c.latitudeDeg,
          longitudeDeg: c.longitudeDeg,
          elevationM: 800,
          timeZone: etcZone(c.longitudeDeg),
        };
        const target: SkyTarget = { raDeg: c.raDeg, decDeg: c.decDeg };
        const night = new Date(c.dayNumber * 86_400_000).toISOString().slice(0, 10);
        const result = computeSkyWindows({
          site,
          limits: { altitudeLimitDeg: c.altitudeLimitDeg, refraction: c.refraction },
          campaign: { firstNight: night, lastNight: night },
          targets: [target],
        });
        const tn = listTargetNights(result, 0)[0];
        // The Moon is evaluated at the middle of the longest usable interval, else mid-dark.
        let atMs = result.nights[0].midDarkUtcMs;
        let longest = 0;
        for (const i of tn.intervals) {
          if (i.endUtcMs - i.startUtcMs > longest) {
            longest = i.endUtcMs - i.startUtcMs;
            atMs = (i.startUtcMs + i.endUtcMs) / 2;
          }
        }
        const ut = utDaysFromMs(atMs);
        const observer = observerOf(site);
        const moon = Equator(Body.Moon, ut, observer, true, true);
        engineHorizontal(observer, target, ut, 'none'); // defines Star1 at this instant
        const star = Equator(Body.Star1, ut, observer, true, true);
        expect(Math.abs(AngleBetween(moon.vec, star.vec) - tn.moonSeparationDeg)).toBeLessThan(0.05);
        expect(Math.abs(Illumination(Body.Moon, ut).phase_fraction - tn.moonIllumination)).toBeLessThan(0.005);
        expect(Math.abs(Horizon(ut, observer, moon.ra, moon.dec).altitude - tn.moonAltitudeDeg)).toBeLessThan(0.05);
      }),
      { seed: 777, numRuns: 150 },
    );
  });
});

describe('sky windows output', () => {
  it('reports instants that format as ISO 8601 UTC and never NaN for a normal night', () => {
    const result = computeSkyWindows({
      site: CHECK_SITE,
      limits: { altitudeLimitDeg: 30, moonSeparationMinDeg: 20 },
      campaign: { firstNight: '2024-06-21', lastNight: '2024-06-27' },
      targets: [VEGA],
    });
    expect(toIsoUtc(result.nights[0].darkStartUtcMs!)).toBe('2024-06-22T04:15:53Z');
    for (const tn of listTargetNights(result, 0)) {
      for (const v of [tn.usableHours, tn.altitudeAtMidDarkDeg, tn.moonIllumination, tn.moonSeparationDeg, tn.moonAltitudeDeg]) {
        expect(Number.isFinite(v)).toBe(true);
      }
    }
  });

  it('toSkyWindowsReport gives plain JSON (ISO instants, arrays) that survives a JSON round trip', () => {
    const result = computeSkyWindows({
      site: { ...CHECK_SITE },
      limits: skyLimitsForNode({ altitudeLimitDeg: 30, sunAltitudeLimitDeg: -18 }),
      campaign: { firstNight: '2024-06-21', lastNight: '2024-06-22' },
      targets: [VEGA],
    });
    const report = toSkyWindowsReport(result, {
      requirement: { visitsPerNight: 2, visitHours: 0.5, cadenceDays: 1, baselineDays: 1, totalVisits: 4 },
      weatherLossFraction: 0,
    });
    expect(JSON.parse(JSON.stringify(report))).toEqual(report);
    expect(report.nights[0].darkStartUtc).toBe('2024-06-22T04:15:53Z');
    expect(report.targets[0].nights![0].intervals[0].startUtc).toBe('2024-06-22T04:15:53Z');
    expect(report.targets[0].assessment!.fits).toBe(true);
  });

  it('toUsableHoursGrid packs targets × nights into one Float32Array', () => {
    const result = computeSkyWindows({
      site: CHECK_SITE,
      limits: { altitudeLimitDeg: 30 },
      campaign: { firstNight: '2024-06-21', lastNight: '2024-06-25' },
      targets: [VEGA, { raDeg: 10, decDeg: -80 }],
    });
    const grid = toUsableHoursGrid(result);
    expect(grid.hours).toBeInstanceOf(Float32Array);
    expect(grid.hours).toHaveLength(10);
    expect(grid.hours[4]).toBeCloseTo(result.targets[0].usableHoursByNight[4], 5);
    expect(Array.from(grid.hours.slice(5))).toEqual([0, 0, 0, 0, 0]);
    expect(grid.darkHoursByNight[0]).toBeCloseTo(result.nights[0].darkHours, 5);
  });
});
