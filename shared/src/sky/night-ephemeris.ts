/**
 * Everything about a night at a site that does not depend on the target, computed once per
 * site and night with astronomy-engine and stored as flat typed arrays for the fast per-target
 * loop (target-visibility.ts):
 * - darkness edges (solar-darkness.ts);
 * - the EQJ → equator-of-date rotation (precession + nutation, `Rotation_EQJ_EQD`) and the
 *   annual-aberration vector v⊕/c (`HelioState(Earth)`, as astronomy-engine's own star
 *   aberration uses), both at the middle of the night's window; within one night they change by
 *   under 0.1″;
 * - local apparent sidereal time at the window start (`SiderealTime`) for hour angles;
 * - the geocentric Moon (`GeoMoon`, of date) and its illuminated fraction (`Illumination`) at
 *   the window's start, middle and end, for quadratic interpolation (error < 0.01° over 24 h);
 * - the local zenith (geodetic, as `Horizon` uses) at mid-darkness.
 */
import { Body, C_AUDAY, GeoMoon, HelioState, Illumination, KM_PER_AU, Observer, Rotation_EQJ_EQD, SiderealTime } from 'astronomy-engine';
import { DEG, SIDEREAL_DEG_PER_UT_DAY, julianYearsSinceJ2000, msFromUtDays, utDaysFromMs } from './astro-time';
import { nightWindows } from './local-nights';
import { findNightDarkness } from './solar-darkness';
import type { NightDark, SkySite } from './sky-types';

/** Earth's figure as astronomy-engine's `terra()` uses it (for the Moon's topocentric parallax). */
const EARTH_EQUATORIAL_RADIUS_KM = 6378.1366;
const EARTH_FLATTENING = 0.996647180302104;

/** Per-night, target-independent data for one site, in struct-of-arrays form. */
export interface NightTable {
  count: number;
  latitudeDeg: number;
  sinLat: number;
  cosLat: number;
  longitudeDeg: number;
  /** Observer's geocentric position factors (AU): x,y = rho·cos φ'·(cos θ, sin θ), z = zFactor. */
  observerRhoCosAu: number;
  observerZAu: number;
  windowStartUt: Float64Array;
  windowEndUt: Float64Array;
  /** NaN when the night has no darkness (internal sentinel only; never reaches the API). */
  darkStartUt: Float64Array;
  darkEndUt: Float64Array;
  midDarkUt: Float64Array;
  /** Local apparent sidereal time at the window start, degrees. */
  lstAtWindowStartDeg: Float64Array;
  /** Julian years since J2000.0 at the window middle (for proper motion). */
  yearsSinceJ2000: Float64Array;
  /** Row-major EQJ → EQD matrix per night, 9 numbers: q_r = Σ_c m[9n + 3r + c]·p_c. */
  rotation: Float64Array;
  /** Aberration vector v⊕/c in EQJ, 3 per night. */
  aberration: Float64Array;
  /** Unit zenith vector (of date) at mid-darkness, 3 per night. */
  zenithAtMidDark: Float64Array;
  /** Geocentric Moon of date, AU, at window start/middle/end: 9 per night. */
  moonOfDateAu: Float64Array;
  /** Moon illuminated fraction at window start/middle/end: 3 per night. */
  moonIllumination: Float64Array;
  /** The public per-night records. */
  nights: NightDark[];
}

/** Local sidereal time, degrees (not reduced), at `ut` for night `n`. */
export function localSiderealDeg(table: NightTable, n: number, ut: number): number {
  return table.lstAtWindowStartDeg[n] + SIDEREAL_DEG_PER_UT_DAY * (ut - table.windowStartUt[n]);
}

/** Builds the night table for a site over consecutive local dates `firstDay…lastDay` (day numbers). */
export function buildNightTable(site: SkySite, firstDayNumber: number, lastDayNumber: number, sunAltitudeLimitDeg: number): NightTable {
  const count = lastDayNumber - firstDayNumber + 1;
  const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.elevationM);
  const phi = site.latitudeDeg * DEG;
  const sinLat = Math.sin(phi);
  const cosLat = Math.cos(phi);
  const c = 1 / Math.hypot(cosLat, EARTH_FLATTENING * sinLat);
  const heightKm = site.elevationM / 1000;
  const table: NightTable = {
    count,
    latitudeDeg: site.latitudeDeg,
    sinLat,
    cosLat,
    longitudeDeg: site.longitudeDeg,
    observerRhoCosAu: ((EARTH_EQUATORIAL_RADIUS_KM * c + heightKm) * cosLat) / KM_PER_AU,
    observerZAu: ((EARTH_EQUATORIAL_RADIUS_KM * EARTH_FLATTENING * EARTH_FLATTENING * c + heightKm) * sinLat) / KM_PER_AU,
    windowStartUt: new Float64Array(count),
    windowEndUt: new Float64Array(count),
    darkStartUt: new Float64Array(count),
    darkEndUt: new Float64Array(count),
    midDarkUt: new Float64Array(count),
    lstAtWindowStartDeg: new Float64Array(count),
    yearsSinceJ2000: new Float64Array(count),
    rotation: new Float64Array(count * 9),
    aberration: new Float64Array(count * 3),
    zenithAtMidDark: new Float64Array(count * 3),
    moonOfDateAu: new Float64Array(count * 9),
    moonIllumination: new Float64Array(count * 3),
    nights: [],
  };
  // Consecutive windows share an edge: keep the Moon sample of the previous window's end.
  let previousEnd: { ut: number; moon: [number, number, number]; illumination: number } | null = null;

  const windows = nightWindows(firstDayNumber, lastDayNumber, site.longitudeDeg, site.timeZone);
  for (let n = 0; n < count; n++) {
    const window = windows[n];
    const w0 = utDaysFromMs(window.startUtcMs);
    const w1 = utDaysFromMs(window.endUtcMs);
    const wMid = (w0 + w1) / 2;
    table.windowStartUt[n] = w0;
    table.windowEndUt[n] = w1;

    const dark = findNightDarkness(observer, w0, w1, sunAltitudeLimitDeg);
    table.darkStartUt[n] = dark.darkStartUt ?? Number.NaN;
    table.darkEndUt[n] = dark.darkEndUt ?? Number.NaN;
    table.midDarkUt[n] = dark.midDarkUt;

    const lst0 = SiderealTime(w0) * 15 + site.longitudeDeg;
    table.lstAtWindowStartDeg[n] = lst0;
    table.yearsSinceJ2000[n] = julianYearsSinceJ2000(wMid);

    const rot = Rotation_EQJ_EQD(wMid).rot;
    // astronomy-engine applies rot as v'_j = Σ_i rot[i][j]·v_i; store it row-major for v' = M·v.
    for (let r = 0; r < 3; r++) for (let col = 0; col < 3; col++) table.rotation[n * 9 + r * 3 + col] = rot[col][r];

    const earth = HelioState(Body.Earth, wMid);
    table.aberration[n * 3] = earth.vx / C_AUDAY;
    table.aberration[n * 3 + 1] = earth.vy / C_AUDAY;
    table.aberration[n * 3 + 2] = earth.vz / C_AUDAY;

    const lstMid = (lst0 + SIDEREAL_DEG_PER_UT_DAY * (dark.midDarkUt - w0)) * DEG;
    table.zenithAtMidDark[n * 3] = cosLat * Math.cos(lstMid);
    table.zenithAtMidDark[n * 3 + 1] = cosLat * Math.sin(lstMid);
    table.zenithAtMidDark[n * 3 + 2] = sinLat;

    const samples = [w0, wMid, w1];
    for (let k = 0; k < 3; k++) {
      let moonJ2000: [number, number, number];
      let illumination: number;
      if (k === 0 && previousEnd && previousEnd.ut === w0) {
        moonJ2000 = previousEnd.moon;
        illumination = previousEnd.illumination;
      } else {
        const v = GeoMoon(samples[k]);
        moonJ2000 = [v.x, v.y, v.z];
        illumination = Illumination(Body.Moon, samples[k]).phase_fraction;
      }
      if (k === 2) previousEnd = { ut: w1, moon: moonJ2000, illumination };
      const m = table.rotation;
      const o = n * 9;
      for (let r = 0; r < 3; r++) {
        table.moonOfDateAu[o + k * 3 + r] = m[o + r * 3] * moonJ2000[0] + m[o + r * 3 + 1] * moonJ2000[1] + m[o + r * 3 + 2] * moonJ2000[2];
      }
      table.moonIllumination[n * 3 + k] = illumination;
    }

    table.nights.push({
      nightDate: window.nightDate,
      windowStartUtcMs: window.startUtcMs,
      windowEndUtcMs: window.endUtcMs,
      darkness: dark.darkness,
      darkStartUtcMs: dark.darkStartUt === null ? null : msFromUtDays(dark.darkStartUt),
      darkEndUtcMs: dark.darkEndUt === null ? null : msFromUtDays(dark.darkEndUt),
      darkHours: dark.darkStartUt === null || dark.darkEndUt === null ? 0 : (dark.darkEndUt - dark.darkStartUt) * 24,
      midDarkUtcMs: msFromUtDays(dark.midDarkUt),
      sunMinAltitudeDeg: dark.sunMinAltitudeDeg,
      moonIlluminationAtMidDark: interpolateIllumination(table, n, dark.midDarkUt),
    });
  }
  return table;
}

/** Quadratic Lagrange weights for nodes at s = 0, ½, 1. */
export function lagrangeWeights(s: number): [number, number, number] {
  return [2 * (s - 0.5) * (s - 1), -4 * s * (s - 1), 2 * s * (s - 0.5)];
}

/** Moon illuminated fraction at `ut` within night `n`, 0–1. */
export function interpolateIllumination(table: NightTable, n: number, ut: number): number {
  const s = (ut - table.windowStartUt[n]) / (table.windowEndUt[n] - table.windowStartUt[n]);
  const [a, b, c] = lagrangeWeights(s);
  const i = table.moonIllumination;
  const value = a * i[n * 3] + b * i[n * 3 + 1] + c * i[n * 3 + 2];
  return Math.min(1, Math.max(0, value));
}
