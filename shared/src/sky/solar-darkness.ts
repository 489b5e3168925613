/**
 * Darkness of one night at one site, from astronomy-engine (shared by every target).
 *
 * The dark interval of a night is the one that contains the Sun's lower culmination
 * (`SearchHourAngle(Sun, …, 12, …)`, the darkest moment), bounded by the descending and ascending
 * crossings of the Sun's centre through the limit and clipped to the night's 24-h window
 * (local-nights.ts). If the Sun at its lower culmination is above the limit, the night has no
 * darkness (midnight sun or bright summer twilight); if no crossing exists inside the window on
 * either side, the whole window is dark (polar night).
 *
 * The crossings are roots of the same function `SearchAltitude(Sun, …)` solves (topocentric
 * `Equator(Sun, ofdate, aberration)` + `Horizon` without refraction: the geometric altitude of
 * the Sun's centre). For speed they are found by a secant iteration started from the
 * hour-angle estimate (cos H0 = (sin h − sin φ sin δ☉)/(cos φ cos δ☉) with δ☉ at the lower
 * culmination; SCIENCE.md §7, Meeus, Astronomical Algorithms 1991, eq. 15.1 [memory]), which
 * needs ~4 Sun positions per edge instead of SearchAltitude's ~25; where that estimate is
 * unreliable (the Sun grazing the limit, |cos H0| > 0.95, i.e. near the polar day/night
 * boundaries) or the iteration does not settle inside the expected half-night,
 * `SearchAltitude` itself is used. Tests check both agree within 1 s.
 */
import { Body, Equator, Horizon, Observer, SearchAltitude, SearchHourAngle } from 'astronomy-engine';
import type { Darkness } from './sky-types';

/** Darkness of one night in astronomy-engine UT days (see astro-time.ts). */
export interface DarknessUt {
  darkness: Darkness;
  /** Null when never dark. */
  darkStartUt: number | null;
  darkEndUt: number | null;
  /** Middle of the dark time, or the Sun's lower culmination when never dark. */
  midDarkUt: number;
  /** Sun's geometric altitude at its lower culmination, degrees. */
  sunMinAltitudeDeg: number;
}

/** Geometric (unrefracted) topocentric altitude of the Sun's centre, degrees. */
export function sunGeometricAltitudeDeg(observer: Observer, ut: number): number {
  const eq = Equator(Body.Sun, ut, observer, true, true);
  return Horizon(ut, observer, eq.ra, eq.dec).altitude;
}

const DEG = Math.PI / 180;
/** Mean rate of the Sun's hour angle, degrees per day (one solar day per 360°). */
const SUN_HOUR_ANGLE_DEG_PER_DAY = 360;

/**
 * Secant iteration for the Sun's altitude crossing `limitDeg` near `estimateUt`; returns null
 * unless it settles (|step| < 0.01 s) inside [lowUt, highUt].
 */
function secantSunCrossing(observer: Observer, estimateUt: number, limitDeg: number, lowUt: number, highUt: number): number | null {
  let t0 = estimateUt - 1 / 1440;
  let t1 = estimateUt + 1 / 1440;
  let f0 = sunGeometricAltitudeDeg(observer, t0) - limitDeg;
  let f1 = sunGeometricAltitudeDeg(observer, t1) - limitDeg;
  for (let i = 0; i < 8; i++) {
    if (f1 === f0) return null;
    const t2 = t1 - (f1 * (t1 - t0)) / (f1 - f0);
    if (!(t2 >= lowUt && t2 <= highUt)) return null;
    if (Math.abs(t2 - t1) * 86_400 < 0.01) return t2;
    t0 = t1;
    f0 = f1;
    t1 = t2;
    f1 = sunGeometricAltitudeDeg(observer, t1) - limitDeg;
  }
  return null;
}

/**
 * The Sun's crossing of the limit before (`direction` −1, dusk) or after (+1, dawn) its lower
 * culmination, within the window; null when there is none (dark up to the window edge).
 */
function sunCrossing(
  observer: Observer,
  direction: -1 | 1,
  culminationUt: number,
  boundUt: number,
  sunDecDeg: number,
  limitDeg: number,
): number | null {
  const phi = observer.latitude * DEG;
  const dec = sunDecDeg * DEG;
  const cosH0 = (Math.sin(limitDeg * DEG) - Math.sin(phi) * Math.sin(dec)) / (Math.cos(phi) * Math.cos(dec));
  if (Math.abs(cosH0) <= 0.95) {
    const fromCulminationDays = (180 - Math.acos(cosH0) / DEG) / SUN_HOUR_ANGLE_DEG_PER_DAY;
    const low = direction < 0 ? boundUt : culminationUt;
    const high = direction < 0 ? culminationUt : boundUt;
    const root = secantSunCrossing(observer, culminationUt + direction * fromCulminationDays, limitDeg, low, high);
    if (root !== null) return root;
  }
  // `direction` −1 searches backward for a descending crossing, +1 forward for an ascending one.
  const found = SearchAltitude(Body.Sun, observer, direction, culminationUt, boundUt - culminationUt, limitDeg);
  return found ? found.ut : null;
}

/**
 * Finds the dark interval of the night whose window is [windowStartUt, windowEndUt].
 * Costs one hour-angle search and two crossing searches of a few Sun positions each.
 */
export function findNightDarkness(observer: Observer, windowStartUt: number, windowEndUt: number, sunAltitudeLimitDeg: number): DarknessUt {
  const lower = SearchHourAngle(Body.Sun, observer, 12, windowStartUt, +1);
  // The lower culmination lies within ±17 min of the window's middle; keep it inside regardless.
  const culminationUt = Math.min(Math.max(lower.time.ut, windowStartUt), windowEndUt);
  const sun = Equator(Body.Sun, culminationUt, observer, true, true);
  const sunMinAltitudeDeg = Horizon(culminationUt, observer, sun.ra, sun.dec).altitude;
  if (sunMinAltitudeDeg > sunAltitudeLimitDeg) {
    return { darkness: 'none', darkStartUt: null, darkEndUt: null, midDarkUt: culminationUt, sunMinAltitudeDeg };
  }
  const dusk = sunCrossing(observer, -1, culminationUt, windowStartUt, sun.dec, sunAltitudeLimitDeg);
  const dawn = sunCrossing(observer, +1, culminationUt, windowEndUt, sun.dec, sunAltitudeLimitDeg);
  const darkStartUt = dusk === null ? windowStartUt : Math.max(dusk, windowStartUt);
  const darkEndUt = dawn === null ? windowEndUt : Math.min(dawn, windowEndUt);
  return {
    darkness: dusk === null && dawn === null ? 'all' : 'partial',
    darkStartUt,
    darkEndUt,
    midDarkUt: (darkStartUt + darkEndUt) / 2,
    sunMinAltitudeDeg,
  };
}
