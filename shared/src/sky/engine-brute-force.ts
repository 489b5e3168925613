/**
 * Slow reference for the fast path: astronomy-engine evaluated instant by instant
 * (`DefineStar` + `Equator(…, ofdate, aberration)` + `Horizon`), and interval edges found by
 * scanning and bisection on altitude − limit. For tests and benchmarks only.
 */
import { Body, DefineStar, Equator, Horizon, Observer } from 'astronomy-engine';
import { julianYearsSinceJ2000 } from './astro-time';
import type { RefractionMode, SkyTarget } from './sky-types';
import { prepareTarget } from './target-visibility';

/** J2000 RA (hours) and Dec (degrees) of a target at `ut`, with proper motion if given. */
function starPositionAt(target: SkyTarget, ut: number): { raHours: number; decDeg: number } {
  const p = prepareTarget(target);
  const dt = julianYearsSinceJ2000(ut) - p.epochYearsSinceJ2000;
  const x = p.ux + p.vx * dt;
  const y = p.uy + p.vy * dt;
  const z = p.uz + p.vz * dt;
  let raHours = (Math.atan2(y, x) * 12) / Math.PI;
  if (raHours < 0) raHours += 24;
  if (raHours >= 24) raHours -= 24;
  return { raHours, decDeg: (Math.atan2(z, Math.hypot(x, y)) * 180) / Math.PI };
}

/** astronomy-engine's altitude and azimuth of a target at `ut` (UT days), degrees. */
export function engineHorizontal(
  observer: Observer,
  target: SkyTarget,
  ut: number,
  refraction: RefractionMode,
): { altitudeDeg: number; azimuthDeg: number } {
  const star = starPositionAt(target, ut);
  DefineStar(Body.Star1, star.raHours, star.decDeg, 1000);
  const eq = Equator(Body.Star1, ut, observer, true, true);
  const hor = Horizon(ut, observer, eq.ra, eq.dec, refraction === 'normal' ? 'normal' : undefined);
  return { altitudeDeg: hor.altitude, azimuthDeg: hor.azimuth };
}

/**
 * Intervals within [startUt, endUt] where the engine altitude is ≥ `limitDeg`, found by
 * scanning every `stepMinutes` and bisecting each sign change to 0.1 s. Intervals shorter than
 * the step that start and end between two samples can be missed; callers avoid grazing targets.
 */
export function bruteForceIntervals(
  observer: Observer,
  target: SkyTarget,
  startUt: number,
  endUt: number,
  limitDeg: number,
  refraction: RefractionMode,
  stepMinutes = 5,
): Array<[number, number]> {
  const f = (ut: number): number => engineHorizontal(observer, target, ut, refraction).altitudeDeg - limitDeg;
  const bisect = (a: number, b: number, fa: number): number => {
    let lo = a;
    let hi = b;
    let flo = fa;
    while ((hi - lo) * 86400 > 0.1) {
      const mid = (lo + hi) / 2;
      const fm = f(mid);
      if (fm >= 0 === flo >= 0) {
        lo = mid;
        flo = fm;
      } else {
        hi = mid;
      }
    }
    return (lo + hi) / 2;
  };
  const step = stepMinutes / 1440;
  const out: Array<[number, number]> = [];
  let t = startUt;
  let ft = f(t);
  let openedAt: number | null = ft >= 0 ? startUt : null;
  while (t < endUt) {
    const next = Math.min(endUt, t + step);
    const fn = f(next);
    if (ft >= 0 !== fn >= 0) {
      const edge = bisect(t, next, ft);
      if (fn >= 0) openedAt = edge;
      else if (openedAt !== null) {
        out.push([openedAt, edge]);
        openedAt = null;
      }
    }
    t = next;
    ft = fn;
  }
  if (openedAt !== null && endUt > openedAt) out.push([openedAt, endUt]);
  return out;
}
