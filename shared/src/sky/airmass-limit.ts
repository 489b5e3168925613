/**
 * Airmass ↔ altitude with the Kasten & Young (1989) formula, Applied Optics 28, 4735, eq. 3
 * (checked, docs/science.md#airmass):
 *
 *     X(h) = 1 / (sin h + 0.50572 · (h + 6.07995°)^−1.6364)
 *
 * with h the altitude in degrees (check values X(30°) = 1.9943, X(90°) = 0.9997).
 * The formula itself lives once, in the science core's precision model
 * (`airmassKastenYoung`, science/visit-precision.ts), so an airmass limit converted here selects
 * the same altitudes the exposure times were computed for.
 */
import { airmassKastenYoung } from '../science/visit-precision';
import { SkyInputError, requireFiniteInRange } from './sky-input-error';

/**
 * Kasten & Young (1989) relative airmass at altitude `altitudeDeg` (degrees, 0–90; outside that
 * range the science core throws a ScienceInputError naming `altitudeDeg`).
 */
export function kastenYoungAirmass(altitudeDeg: number): number {
  return airmassKastenYoung(altitudeDeg);
}

/** Highest airmass the formula reaches (at the horizon), ≈ 37.9. */
export const MAX_AIRMASS_AT_HORIZON = kastenYoungAirmass(0);

/**
 * Altitude (degrees) at which the Kasten & Young airmass equals `airmass`: the inverse of
 * `kastenYoungAirmass`, by bisection (X decreases monotonically with altitude on 0–90°).
 */
export function altitudeForAirmassDeg(airmass: number, field = 'limits.airmassLimit'): number {
  requireFiniteInRange(airmass, field, 1, MAX_AIRMASS_AT_HORIZON);
  let low = 0;
  let high = 90;
  for (let i = 0; i < 60; i++) {
    const mid = (low + high) / 2;
    if (kastenYoungAirmass(mid) > airmass) low = mid;
    else high = mid;
  }
  const altitude = (low + high) / 2;
  if (!Number.isFinite(altitude)) throw new SkyInputError(field, 'cannot be converted to an altitude');
  return altitude;
}
