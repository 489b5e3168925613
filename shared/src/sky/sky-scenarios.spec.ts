/**
 * Sky windows in the situations that break naive code: circumpolar and never-rising targets,
 * polar night and midnight sun at 78°N, a southern site, a site at +150° east, nights that
 * cross 0h UTC, a campaign across a daylight-saving change, and two intervals in one night.
 * Reference: astronomy-engine evaluated instant by instant (engine-brute-force.ts).
 */
import { Observer, SiderealTime } from 'astronomy-engine';
import { msFromUtDays, utDaysFromMs } from './astro-time';
import { bruteForceIntervals } from './engine-brute-force';
import { MS_PER_DAY, MS_PER_HOUR, timeZoneOffsetMs } from './local-nights';
import { computeSkyWindows, listTargetNights } from './sky-windows';
import type { SkySite, SkyTarget, SkyWindowsResult } from './sky-types';

// Property checks against the slow engine reference can take seconds on a busy machine.
jest.setTimeout(120_000);

const NORTH_MID: SkySite = { latitudeDeg: 50, longitudeDeg: 10, elevationM: 300, timeZone: 'Europe/Berlin' };
const ARCTIC: SkySite = { latitudeDeg: 78.2, longitudeDeg: 15.6, elevationM: 20, timeZone: 'Arctic/Longyearbyen' };
const SOUTH: SkySite = { latitudeDeg: -30.2, longitudeDeg: -70.8, elevationM: 2200, timeZone: 'America/Santiago' };
const FAR_EAST: SkySite = { latitudeDeg: -31.3, longitudeDeg: 150, elevationM: 1100, timeZone: 'Australia/Sydney' };
const ISLAND: SkySite = { latitudeDeg: 28.76, longitudeDeg: -17.88, elevationM: 2300, timeZone: 'Atlantic/Canary' };

function run(
  site: SkySite,
  first: string,
  last: string,
  targets: SkyTarget[],
  altitudeLimitDeg = 30,
  sunAltitudeLimitDeg = -18,
): SkyWindowsResult {
  return computeSkyWindows({
    site,
    limits: { altitudeLimitDeg, sunAltitudeLimitDeg },
    campaign: { firstNight: first, lastNight: last },
    targets,
  });
}

/** Compares every night's intervals of target `t` with the brute-force reference (±60 s). */
function expectMatchesBruteForce(result: SkyWindowsResult, t: number, target: SkyTarget): void {
  const observer = new Observer(result.site.latitudeDeg, result.site.longitudeDeg, result.site.elevationM);
  listTargetNights(result, t).forEach((tn, n) => {
    const night = result.nights[n];
    if (night.darkStartUtcMs === null) {
      expect(tn.intervals).toEqual([]);
      return;
    }
    const brute = bruteForceIntervals(
      observer,
      target,
      utDaysFromMs(night.darkStartUtcMs),
      utDaysFromMs(night.darkEndUtcMs!),
      result.limits.altitudeLimitDeg,
      result.limits.refraction,
    );
    expect(tn.intervals.length).toBe(brute.length);
    tn.intervals.forEach((interval, i) => {
      expect(Math.abs(interval.startUtcMs - msFromUtDays(brute[i][0]))).toBeLessThan(60_000);
      expect(Math.abs(interval.endUtcMs - msFromUtDays(brute[i][1]))).toBeLessThan(60_000);
    });
  });
}

describe('sky windows scenarios', () => {
  it('circumpolar target at 50°N (Dec +75°, limit 30°) is usable for the whole dark time every night', () => {
    const target = { raDeg: 120, decDeg: 75 };
    const result = run(NORTH_MID, '2025-01-10', '2025-01-16', [target]);
    const w = result.targets[0];
    expect(w.summary.visibility).toBe('circumpolar');
    result.nights.forEach((night, n) => {
      expect(w.intervalCountByNight[n]).toBe(1);
      expect(w.usableHoursByNight[n]).toBeCloseTo(night.darkHours, 9);
    });
    expect(w.summary.usableNights).toBe(7);
    expect(w.summary.longestGapNights).toBe(0); // usable every night: no gap
  });

  it('never-rising target at 50°N (Dec −60°) has no usable time and is classed never-rises', () => {
    const result = run(NORTH_MID, '2025-01-10', '2025-01-12', [{ raDeg: 80, decDeg: -60 }]);
    const w = result.targets[0];
    expect(w.summary.visibility).toBe('never-rises');
    expect(Array.from(w.usableHoursByNight)).toEqual([0, 0, 0]);
    expect(w.summary.firstUsableNight).toBeNull();
    expect(w.summary.longestGapNights).toBeNull();
    for (const alt of w.altitudeAtMidDarkDegByNight) expect(alt).toBeLessThan(0);
  });

  it('78°N in December with the Sun limit at −18°: the Sun still reaches −11.6° at noon, so 15.4 h of darkness', () => {
    const target = { raDeg: 200, decDeg: 20 };
    const result = run(ARCTIC, '2024-12-20', '2024-12-20', [target]);
    const night = result.nights[0];
    expect(night.darkness).toBe('partial');
    expect(night.darkHours).toBeGreaterThan(15.3);
    expect(night.darkHours).toBeLessThan(15.5);
    expectMatchesBruteForce(result, 0, target);
  });

  it('polar night at 78°N in December (Sun limit −10°) is dark for the whole noon-to-noon window (24 h)', () => {
    // The Sun's highest altitude on 2024-12-20 at 78.2°N is 90 − 78.2 − 23.4 = −11.6°.
    const target = { raDeg: 200, decDeg: 20 };
    const result = run(ARCTIC, '2024-12-18', '2024-12-22', [target, { raDeg: 30, decDeg: 60 }], 30, -10);
    for (const night of result.nights) {
      expect(night.darkness).toBe('all');
      expect(night.darkStartUtcMs).toBe(night.windowStartUtcMs);
      expect(night.darkEndUtcMs).toBe(night.windowEndUtcMs);
      expect(night.darkHours).toBeCloseTo(24, 9);
      // Window = local mean noon: 12:00 UTC − 15.6° × 4 min = 10:57:36 UTC.
      expect(new Date(night.windowStartUtcMs).toISOString().slice(11, 19)).toBe('10:57:36');
    }
    // Dec +60° at 78.2°N never goes below 48°: usable all 24 h.
    expect(result.targets[1].summary.visibility).toBe('circumpolar');
    for (const h of result.targets[1].usableHoursByNight) expect(h).toBeCloseTo(24, 9);
    expectMatchesBruteForce(result, 0, target);
  });

  it('polar night: a target transiting at the window start has two intervals (sets, then rises again)', () => {
    // RA equal to the local sidereal time at the window start puts the transit there; Dec +20°
    // at 78.2°N reaches only 31.8°, so it is above 30° for ~1 h around each transit.
    const probe = run(ARCTIC, '2024-12-20', '2024-12-20', [], 30, -10);
    const w0 = utDaysFromMs(probe.nights[0].windowStartUtcMs);
    const lstDeg = (SiderealTime(w0) * 15 + ARCTIC.longitudeDeg + 360) % 360;
    const target = { raDeg: (lstDeg + 0.5) % 360, decDeg: 20 };
    const result = run(ARCTIC, '2024-12-20', '2024-12-20', [target], 30, -10);
    const tn = listTargetNights(result, 0)[0];
    expect(tn.intervals).toHaveLength(2);
    expect(tn.intervals[0].startUtcMs).toBe(result.nights[0].windowStartUtcMs);
    expect(tn.intervals[1].endUtcMs).toBe(result.nights[0].windowEndUtcMs);
    expectMatchesBruteForce(result, 0, target);
  });

  it('a site at 86°N is dark all 24 h at the December solstice even with the Sun limit at −18°', () => {
    const result = run({ ...ARCTIC, latitudeDeg: 86 }, '2024-12-21', '2024-12-21', []);
    expect(result.nights[0].darkness).toBe('all');
    expect(result.nights[0].darkHours).toBeCloseTo(24, 9);
  });

  it('midnight sun at 78°N in June: no darkness, no usable time, finite altitudes', () => {
    const result = run(ARCTIC, '2024-06-18', '2024-06-24', [{ raDeg: 10, decDeg: 70 }]);
    for (const night of result.nights) {
      expect(night.darkness).toBe('none');
      expect(night.darkStartUtcMs).toBeNull();
      expect(night.darkEndUtcMs).toBeNull();
      expect(night.darkHours).toBe(0);
      expect(night.sunMinAltitudeDeg).toBeGreaterThan(0);
    }
    const w = result.targets[0];
    expect(w.summary.usableNights).toBe(0);
    for (const alt of w.altitudeAtMidDarkDegByNight) expect(Number.isFinite(alt)).toBe(true);
  });

  it('a long winter night at 60°N holds two intervals for a target that sets and rises again', () => {
    // Dec +45° at 60°N: 75° at upper, 15° at lower culmination. In late December, local sidereal
    // time at midnight is ~90°, so RA 270° is at lower culmination (below 30°) mid-night: it is
    // above the limit in the evening, sets below it, and rises above it again before dawn.
    const site: SkySite = { latitudeDeg: 60, longitudeDeg: 25, elevationM: 50, timeZone: 'Europe/Helsinki' };
    const target = { raDeg: 270, decDeg: 45 };
    const result = run(site, '2024-12-20', '2024-12-24', [target]);
    for (let n = 0; n < result.nights.length; n++) expect(result.targets[0].intervalCountByNight[n]).toBe(2);
    expectMatchesBruteForce(result, 0, target);
  });

  it('southern site (−30.2°): long nights in June, short in December; edges match the engine', () => {
    const target = { raDeg: 250, decDeg: -50 };
    const june = run(SOUTH, '2024-06-20', '2024-06-22', [target]);
    const december = run(SOUTH, '2024-12-20', '2024-12-22', [target]);
    expect(june.nights[0].darkHours).toBeGreaterThan(december.nights[0].darkHours + 3);
    expectMatchesBruteForce(june, 0, target);
    expectMatchesBruteForce(december, 0, target);
  });

  it('at −70.8° the dark time crosses 0h UTC and stays one interval for a circumpolar target', () => {
    const target = { raDeg: 90, decDeg: -80 }; // at −30.2°: lowest altitude 19.8°; limit 15°
    const result = run(SOUTH, '2024-06-20', '2024-06-20', [target], 15);
    const night = result.nights[0];
    const darkStartUtcDay = Math.floor(night.darkStartUtcMs! / MS_PER_DAY);
    const darkEndUtcDay = Math.floor(night.darkEndUtcMs! / MS_PER_DAY);
    expect(darkEndUtcDay).toBe(darkStartUtcDay + 1);
    const tn = listTargetNights(result, 0)[0];
    expect(tn.intervals).toEqual([{ startUtcMs: night.darkStartUtcMs, endUtcMs: night.darkEndUtcMs }]);
  });

  it('at +150° east the night of D is named by the local date: window from local noon (≈02:00 UTC) across 0h UTC', () => {
    const target = { raDeg: 280, decDeg: -35 };
    const result = run(FAR_EAST, '2024-06-21', '2024-06-23', [target]);
    result.nights.forEach((night) => {
      // Mean noon at +150°: 12:00 − 10 h = 02:00 UTC of the same date; the window ends after 0h UTC next day.
      expect(new Date(night.windowStartUtcMs).toISOString()).toBe(`${night.nightDate}T02:00:00.000Z`);
      // Dusk is on the evening of the local date D, dawn on the morning of D + 1 (local clock).
      const localDusk = night.darkStartUtcMs! + timeZoneOffsetMs(FAR_EAST.timeZone, night.darkStartUtcMs!);
      const localDawn = night.darkEndUtcMs! + timeZoneOffsetMs(FAR_EAST.timeZone, night.darkEndUtcMs!);
      expect(new Date(localDusk).toISOString().slice(0, 10)).toBe(night.nightDate);
      expect(new Date(localDusk).getUTCHours()).toBeGreaterThanOrEqual(17);
      expect(new Date(localDawn).getUTCHours()).toBeLessThan(7);
      expect(Math.floor(localDawn / MS_PER_DAY) - Math.floor(localDusk / MS_PER_DAY)).toBe(1);
    });
    expectMatchesBruteForce(result, 0, target);
  });

  it('a campaign across the March DST change keeps 24-h windows and smooth darkness edges', () => {
    // Atlantic/Canary moves from UTC+0 to UTC+1 on 2025-03-30.
    const target = { raDeg: 150, decDeg: 20 };
    const result = run(ISLAND, '2025-03-25', '2025-04-04', [target]);
    expect(result.nights.map((n) => n.nightDate)).toEqual([
      '2025-03-25',
      '2025-03-26',
      '2025-03-27',
      '2025-03-28',
      '2025-03-29',
      '2025-03-30',
      '2025-03-31',
      '2025-04-01',
      '2025-04-02',
      '2025-04-03',
      '2025-04-04',
    ]);
    for (let n = 0; n < result.nights.length; n++) {
      const night = result.nights[n];
      expect(night.windowEndUtcMs - night.windowStartUtcMs).toBe(MS_PER_DAY);
      if (n > 0) {
        expect(night.windowStartUtcMs).toBe(result.nights[n - 1].windowEndUtcMs);
        const step = night.darkStartUtcMs! - result.nights[n - 1].darkStartUtcMs!;
        expect(Math.abs(step - MS_PER_DAY)).toBeLessThan(3 * 60_000);
      }
    }
    expect(timeZoneOffsetMs(ISLAND.timeZone, result.nights[0].midDarkUtcMs)).toBe(0);
    expect(timeZoneOffsetMs(ISLAND.timeZone, result.nights[10].midDarkUtcMs)).toBe(MS_PER_HOUR);
    expectMatchesBruteForce(result, 0, target);
  });

  it('proper motion is applied only when given (a 10″/yr star moves its edges by seconds, not minutes)', () => {
    const still = { raDeg: 269.45, decDeg: 4.69 };
    const moving = { ...still, pmRaCosDecMasPerYr: -800, pmDecMasPerYr: 10_300 };
    const result = run(ISLAND, '2025-06-01', '2025-06-01', [still, moving]);
    const a = listTargetNights(result, 0)[0].intervals[0];
    const b = listTargetNights(result, 1)[0].intervals[0];
    expect(a.startUtcMs).not.toBe(b.startUtcMs);
    expect(Math.abs(a.startUtcMs - b.startUtcMs)).toBeLessThan(120_000);
    expectMatchesBruteForce(result, 1, moving);
  });

  it('an airmass limit of 2 behaves as an altitude limit of 29.9° (Kasten & Young 1989)', () => {
    const target = { raDeg: 150, decDeg: 20 };
    const byAirmass = computeSkyWindows({
      site: ISLAND,
      limits: { airmassLimit: 2 },
      campaign: { firstNight: '2025-03-01', lastNight: '2025-03-01' },
      targets: [target],
    });
    expect(byAirmass.limits.altitudeLimitDeg).toBeCloseTo(29.905, 3);
    expectMatchesBruteForce(byAirmass, 0, target);
  });

  it('a Moon-separation minimum excludes nights with the Moon up and close to the target', () => {
    // Full Moon of 2025-03-14 lies near RA 174°, Dec +3°: a target right there is excluded.
    const target = { raDeg: 172, decDeg: 3 };
    const base = { site: ISLAND, campaign: { firstNight: '2025-03-12', lastNight: '2025-03-16' }, targets: [target] };
    const free = computeSkyWindows({ ...base, limits: { altitudeLimitDeg: 30 } });
    const strict = computeSkyWindows({ ...base, limits: { altitudeLimitDeg: 30, moonSeparationMinDeg: 30 } });
    const excluded = Array.from(strict.targets[0].moonExcludedByNight);
    expect(excluded.some((x) => x === 1)).toBe(true);
    excluded.forEach((x, n) => {
      if (x === 1) {
        expect(strict.targets[0].usableHoursByNight[n]).toBe(0);
        expect(free.targets[0].usableHoursByNight[n]).toBeGreaterThan(0);
        expect(strict.targets[0].moonSeparationDegByNight[n]).toBeLessThan(30);
        expect(strict.targets[0].moonIlluminationByNight[n]).toBeGreaterThan(0.8);
      }
    });
  });
});
