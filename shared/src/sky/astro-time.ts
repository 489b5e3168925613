/**
 * Time scale used inside the sky code: astronomy-engine's UT day number (days since
 * 2000-01-01T12:00:00Z), carried as a plain float so that arithmetic needs no objects.
 */

/** Unix ms of the J2000.0 epoch, 2000-01-01T12:00:00Z. */
export const J2000_UTC_MS = Date.UTC(2000, 0, 1, 12);
const MS_PER_DAY = 86_400_000;

/** Unix ms (UTC) → astronomy-engine UT days. */
export function utDaysFromMs(utcMs: number): number {
  return (utcMs - J2000_UTC_MS) / MS_PER_DAY;
}

/** astronomy-engine UT days → Unix ms (UTC). */
export function msFromUtDays(utDays: number): number {
  return utDays * MS_PER_DAY + J2000_UTC_MS;
}

/** Julian years since J2000.0 for a UT day number (UT and TT differ by ~1 min: irrelevant here). */
export function julianYearsSinceJ2000(utDays: number): number {
  return utDays / 365.25;
}

/**
 * Rate of local apparent sidereal time, degrees per UT day: 360° × 1.00273790935
 * (Meeus, Astronomical Algorithms 1991, eq. 11.4 [memory], the GMST rate; nutation's change within
 * one night is below 0.01″ and is ignored).
 */
export const SIDEREAL_DEG_PER_UT_DAY = 360.98564736629;

export const DEG = Math.PI / 180;
