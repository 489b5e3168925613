/**
 * The fast path: one target over all nights of a site, with no time sampling.
 *
 * Per night, the target's J2000 unit vector (moved by proper motion, if given) gets annual
 * aberration (u + v⊕/c, as astronomy-engine does for stars) and is rotated to the equator of
 * date with the night's precession–nutation matrix. The hour-angle half-width H0 where its
 * geometric altitude equals the (geometric) limit h follows from spherical trigonometry
 * (SCIENCE.md §7; Meeus, Astronomical Algorithms 1991, eq. 15.1 [memory]):
 *
 *     cos H0 = (sin h − sin φ · sin δ) / (cos φ · cos δ)
 *
 * cos H0 ≤ −1: always above the limit (circumpolar); ≥ 1: never reaches it. Transit times follow
 * from the local sidereal time (θ(t) = θ0 + 360.9856…°/day · (t − t0)), and the intervals
 * [transit − H0, transit + H0] are intersected with the night's dark interval. A dark interval
 * of up to 24 h can hold at most three such pieces (one sidereal day is 23.93 h), hence
 * MAX_INTERVALS_PER_NIGHT = 3; two is the usual maximum (sets, then rises again).
 *
 * The limit h is geometric: with refraction `normal` it is the altitude whose refracted value
 * equals the apparent limit (astronomy-engine `InverseRefraction`), so the edges match
 * `Horizon(…, 'normal')` crossing the apparent limit.
 */
import { DEG, J2000_UTC_MS, SIDEREAL_DEG_PER_UT_DAY } from './astro-time';
import { type NightTable, localSiderealDeg } from './night-ephemeris';
import { MAX_INTERVALS_PER_NIGHT, type ResolvedSkyLimits, type SkyTarget, type TargetVisibility, type TargetWindows } from './sky-types';

const RAD = 180 / Math.PI;
const MAS_TO_RAD = Math.PI / (180 * 3600 * 1000);
/** One sidereal day in UT days. */
const SIDEREAL_DAY_UT = 360 / SIDEREAL_DEG_PER_UT_DAY;

/** A target reduced to vectors once per campaign. */
export interface PreparedTarget {
  /** J2000 unit vector at the position's epoch. */
  ux: number;
  uy: number;
  uz: number;
  /** Proper-motion velocity of the unit vector, rad/yr (zeros when not given). */
  vx: number;
  vy: number;
  vz: number;
  /** Epoch of the position, Julian years since J2000.0. */
  epochYearsSinceJ2000: number;
}

/** Turns RA/Dec (J2000, degrees) and optional proper motion into vectors. */
export function prepareTarget(target: SkyTarget): PreparedTarget {
  const a = target.raDeg * DEG;
  const d = target.decDeg * DEG;
  const ca = Math.cos(a);
  const sa = Math.sin(a);
  const cd = Math.cos(d);
  const sd = Math.sin(d);
  const muA = (target.pmRaCosDecMasPerYr ?? 0) * MAS_TO_RAD;
  const muD = (target.pmDecMasPerYr ?? 0) * MAS_TO_RAD;
  return {
    ux: cd * ca,
    uy: cd * sa,
    uz: sd,
    // μα*·ê_α + μδ·ê_δ with ê_α = (−sin α, cos α, 0), ê_δ = (−sin δ cos α, −sin δ sin α, cos δ).
    vx: -muA * sa - muD * sd * ca,
    vy: muA * ca - muD * sd * sa,
    vz: muD * cd,
    epochYearsSinceJ2000: (target.epochYear ?? 2000) - 2000,
  };
}

/** Apparent place of date of a prepared target for night `n`: unit vector written into `out`. */
export function targetOfDate(p: PreparedTarget, table: NightTable, n: number, out: Float64Array): void {
  const dt = table.yearsSinceJ2000[n] - p.epochYearsSinceJ2000;
  const b = table.aberration;
  const px = p.ux + p.vx * dt + b[n * 3];
  const py = p.uy + p.vy * dt + b[n * 3 + 1];
  const pz = p.uz + p.vz * dt + b[n * 3 + 2];
  const m = table.rotation;
  const o = n * 9;
  const qx = m[o] * px + m[o + 1] * py + m[o + 2] * pz;
  const qy = m[o + 3] * px + m[o + 4] * py + m[o + 5] * pz;
  const qz = m[o + 6] * px + m[o + 7] * py + m[o + 8] * pz;
  const inv = 1 / Math.sqrt(qx * qx + qy * qy + qz * qz);
  out[0] = qx * inv;
  out[1] = qy * inv;
  out[2] = qz * inv;
}

/**
 * cos H0 for a declination (given as sin δ, cos δ) at the site; at a pole (cos φ = 0) the
 * altitude does not change with hour angle, so the answer is ±2 (always / never above).
 */
export function cosHalfWidth(sinDec: number, cosDec: number, sinLat: number, cosLat: number, sinLimit: number): number {
  const denominator = cosLat * cosDec;
  const numerator = sinLimit - sinLat * sinDec;
  if (Math.abs(denominator) < 1e-12) return numerator <= 0 ? -2 : 2;
  return numerator / denominator;
}

/** Visibility class of an of-date declination at the site with respect to the altitude limit. */
export function classifyVisibility(cosH0: number): TargetVisibility {
  if (cosH0 <= -1) return 'circumpolar';
  if (cosH0 >= 1) return 'never-rises';
  return 'rises-and-sets';
}

/**
 * Refraction added to a geometric altitude, degrees: the same formula as astronomy-engine's
 * `Refraction('normal', h)` (Saemundsson 1986 as given by Meeus, Astronomical Algorithms 1991,
 * eq. 16.4 [memory], for 1010 hPa and 10 °C; clamped at −1° and tapered linearly to 0 at the nadir),
 * repeated here so that the nightly loop makes no call across modules. Tests compare it with
 * `Horizon(…, 'normal')`.
 */
export function normalRefractionDeg(geometricAltitudeDeg: number): number {
  const hd = geometricAltitudeDeg < -1 ? -1 : geometricAltitudeDeg;
  let refraction = 1.02 / Math.tan((hd + 10.3 / (hd + 5.11)) * (Math.PI / 180)) / 60;
  if (geometricAltitudeDeg < -1) refraction *= (geometricAltitudeDeg + 90) / 89;
  return refraction;
}

/** Scratch buffer reused across calls (the loop allocates nothing per night). */
const q = new Float64Array(3);
/** Local copies of constants: imported bindings cost a getter call per use in a hot loop. */
const K_DEG = Math.PI / 180;
const K_RAD = 180 / Math.PI;
const K_SIDEREAL = SIDEREAL_DEG_PER_UT_DAY;
const K_MS_PER_DAY = 86_400_000;
const K_J2000_MS = J2000_UTC_MS;

/**
 * Backing arrays for many targets' windows: one allocation per field for a whole call instead
 * of eight per target (thousands of small typed arrays cost more in allocation and garbage
 * collection than the arithmetic). Each target's arrays are views into these.
 */
export interface TargetNightStorage {
  usableHours: Float64Array;
  altitudeDeg: Float64Array;
  moonSeparationDeg: Float64Array;
  moonAltitudeDeg: Float64Array;
  moonIllumination: Float64Array;
  moonExcluded: Uint8Array;
  intervalCount: Uint8Array;
  intervalsUtcMs: Float64Array;
}

/** Allocates storage for `targetCount` targets × `nightCount` nights (zero-filled). */
export function allocateTargetNightStorage(targetCount: number, nightCount: number): TargetNightStorage {
  const cells = targetCount * nightCount;
  return {
    usableHours: new Float64Array(cells),
    altitudeDeg: new Float64Array(cells),
    moonSeparationDeg: new Float64Array(cells),
    moonAltitudeDeg: new Float64Array(cells),
    moonIllumination: new Float64Array(cells),
    moonExcluded: new Uint8Array(cells),
    intervalCount: new Uint8Array(cells),
    intervalsUtcMs: new Float64Array(cells * MAX_INTERVALS_PER_NIGHT * 2),
  };
}

/**
 * Computes one target's windows over all nights of the table, into slot `slot` of `storage`. The summary is filled in by
 * `summarizeTargetWindows` (sky-windows.ts) afterwards.
 */
export function computeTargetNights(
  target: SkyTarget,
  targetIndex: number,
  table: NightTable,
  limits: ResolvedSkyLimits,
  nightDates: readonly string[],
  storage: TargetNightStorage = allocateTargetNightStorage(1, table.count),
  slot = 0,
): TargetWindows {
  const count = table.count;
  const prepared = prepareTarget(target);
  const usable = storage.usableHours.subarray(slot * count, (slot + 1) * count);
  const altitude = storage.altitudeDeg.subarray(slot * count, (slot + 1) * count);
  const moonSeparation = storage.moonSeparationDeg.subarray(slot * count, (slot + 1) * count);
  const moonAltitude = storage.moonAltitudeDeg.subarray(slot * count, (slot + 1) * count);
  const moonIllumination = storage.moonIllumination.subarray(slot * count, (slot + 1) * count);
  const moonExcluded = storage.moonExcluded.subarray(slot * count, (slot + 1) * count);
  const intervalCount = storage.intervalCount.subarray(slot * count, (slot + 1) * count);
  const stride = count * MAX_INTERVALS_PER_NIGHT * 2;
  const intervals = storage.intervalsUtcMs.subarray(slot * stride, (slot + 1) * stride);

  const sinLimit = Math.sin(limits.geometricAltitudeLimitDeg * K_DEG);
  const { sinLat, cosLat, observerRhoCosAu, observerZAu } = table;
  const moonMin = limits.moonSeparationMinDeg ?? -1;
  const refract = limits.refraction === 'normal';
  const zenith = table.zenithAtMidDark;
  const darkStart = table.darkStartUt;
  const darkEnd = table.darkEndUt;
  const windowStart = table.windowStartUt;
  const windowEnd = table.windowEndUt;
  const lst0 = table.lstAtWindowStartDeg;
  const moonVectors = table.moonOfDateAu;
  const moonLight = table.moonIllumination;

  for (let n = 0; n < count; n++) {
    targetOfDate(prepared, table, n, q);
    const qx = q[0];
    const qy = q[1];
    const qz = q[2];

    const sinAlt = qx * zenith[n * 3] + qy * zenith[n * 3 + 1] + qz * zenith[n * 3 + 2];
    const geometricAlt = Math.asin(sinAlt > 1 ? 1 : sinAlt < -1 ? -1 : sinAlt) * K_RAD;
    altitude[n] = refract ? geometricAlt + normalRefractionDeg(geometricAlt) : geometricAlt;

    const ds = darkStart[n];
    const de = darkEnd[n];
    let moonAtUt = table.midDarkUt[n];
    let hours = 0;

    if (ds === ds) {
      // (ds === ds) is false only for the NaN sentinel of a night without darkness.
      const cosDec = Math.sqrt(qx * qx + qy * qy);
      const cosH0 = cosHalfWidth(qz, cosDec, sinLat, cosLat, sinLimit);
      let k = 0;
      const base = n * MAX_INTERVALS_PER_NIGHT * 2;
      if (cosH0 <= -1) {
        intervals[base] = ds;
        intervals[base + 1] = de;
        k = 1;
      } else if (cosH0 < 1) {
        const halfWidthDays = (Math.acos(cosH0) * K_RAD) / K_SIDEREAL;
        const raDeg = Math.atan2(qy, qx) * K_RAD;
        // Hour angle at dark start; days from dark start to the next upper transit.
        const hourAngleDeg = lst0[n] + K_SIDEREAL * (ds - windowStart[n]) - raDeg;
        let toTransitDeg = -hourAngleDeg % 360;
        if (toTransitDeg < 0) toTransitDeg += 360;
        const firstTransit = ds + toTransitDeg / K_SIDEREAL;
        for (let j = -1; j <= 1; j++) {
          const transit = firstTransit + j * SIDEREAL_DAY_UT;
          const a = transit - halfWidthDays > ds ? transit - halfWidthDays : ds;
          const b = transit + halfWidthDays < de ? transit + halfWidthDays : de;
          if (b > a) {
            intervals[base + 2 * k] = a;
            intervals[base + 2 * k + 1] = b;
            k++;
          }
        }
      }
      // Convert to hours and UTC ms; the Moon is checked at the middle of the longest interval.
      let longest = -1;
      for (let i = 0; i < k; i++) {
        const a = intervals[base + 2 * i];
        const b = intervals[base + 2 * i + 1];
        const h = (b - a) * 24;
        hours += h;
        if (h > longest) {
          longest = h;
          moonAtUt = (a + b) / 2;
        }
        intervals[base + 2 * i] = a * K_MS_PER_DAY + K_J2000_MS;
        intervals[base + 2 * i + 1] = b * K_MS_PER_DAY + K_J2000_MS;
      }
      intervalCount[n] = k;
    }

    // Moon at `moonAtUt`: quadratic (Lagrange, nodes at s = 0, ½, 1 of the window) interpolation
    // of the geocentric Moon and its illumination, minus the observer's geocentric position.
    const s = (moonAtUt - windowStart[n]) / (windowEnd[n] - windowStart[n]);
    const w0 = 2 * (s - 0.5) * (s - 1);
    const w1 = -4 * s * (s - 1);
    const w2 = 2 * s * (s - 0.5);
    const o = n * 9;
    const theta = (lst0[n] + K_SIDEREAL * (moonAtUt - windowStart[n])) * K_DEG;
    const ct = Math.cos(theta);
    const st = Math.sin(theta);
    const mx = w0 * moonVectors[o] + w1 * moonVectors[o + 3] + w2 * moonVectors[o + 6] - observerRhoCosAu * ct;
    const my = w0 * moonVectors[o + 1] + w1 * moonVectors[o + 4] + w2 * moonVectors[o + 7] - observerRhoCosAu * st;
    const mz = w0 * moonVectors[o + 2] + w1 * moonVectors[o + 5] + w2 * moonVectors[o + 8] - observerZAu;
    const inv = 1 / Math.sqrt(mx * mx + my * my + mz * mz);
    const cosSep = (mx * qx + my * qy + mz * qz) * inv;
    const separationDeg = Math.acos(cosSep > 1 ? 1 : cosSep < -1 ? -1 : cosSep) * K_RAD;
    const sinMoonAlt = (mx * cosLat * ct + my * cosLat * st + mz * sinLat) * inv;
    const moonAltDeg = Math.asin(sinMoonAlt > 1 ? 1 : sinMoonAlt < -1 ? -1 : sinMoonAlt) * K_RAD;
    const light = w0 * moonLight[n * 3] + w1 * moonLight[n * 3 + 1] + w2 * moonLight[n * 3 + 2];
    moonSeparation[n] = separationDeg;
    moonAltitude[n] = moonAltDeg;
    moonIllumination[n] = light < 0 ? 0 : light > 1 ? 1 : light;
    if (hours > 0 && moonAltDeg > 0 && separationDeg < moonMin) {
      moonExcluded[n] = 1;
      hours = 0;
    }
    usable[n] = hours;
  }

  return targetWindowsOver(target, targetIndex, nightDates, {
    usableHours: usable,
    altitudeDeg: altitude,
    moonSeparationDeg: moonSeparation,
    moonAltitudeDeg: moonAltitude,
    moonIllumination,
    moonExcluded,
    intervalCount,
    intervalsUtcMs: intervals,
  });
}

/**
 * One target's windows over per-night arrays of one target (`arrays.usableHours.length`
 * nights; the arrays are used as they are, not copied), with an empty summary for
 * `summarizeTargetWindows` (sky-windows.ts) to fill in.
 */
export function targetWindowsOver(
  target: SkyTarget,
  targetIndex: number,
  nightDates: readonly string[],
  arrays: TargetNightStorage,
): TargetWindows {
  return {
    targetIndex,
    name: target.name ?? null,
    raDeg: target.raDeg,
    decDeg: target.decDeg,
    nightDates,
    usableHoursByNight: arrays.usableHours,
    altitudeAtMidDarkDegByNight: arrays.altitudeDeg,
    moonSeparationDegByNight: arrays.moonSeparationDeg,
    moonAltitudeDegByNight: arrays.moonAltitudeDeg,
    moonIlluminationByNight: arrays.moonIllumination,
    moonExcludedByNight: arrays.moonExcluded,
    intervalCountByNight: arrays.intervalCount,
    intervalsUtcMs: arrays.intervalsUtcMs,
    summary: {
      firstUsableNight: null,
      lastUsableNight: null,
      usableNights: 0,
      totalNights: arrays.usableHours.length,
      totalUsableHours: 0,
      maxNightlyUsableHours: 0,
      longestGapNights: null,
      visibility: 'rises-and-sets',
    },
  };
}

/**
 * Fast-path horizontal coordinates of a target at any instant `ut` (UT days) of night `n`:
 * the same arithmetic as the nightly loop, exposed for cross-checks against `Horizon` and for
 * altitude curves. Azimuth is measured from north through east, degrees.
 */
export function fastHorizontal(
  target: SkyTarget,
  table: NightTable,
  n: number,
  ut: number,
  refraction: ResolvedSkyLimits['refraction'],
): { altitudeDeg: number; azimuthDeg: number } {
  const v = new Float64Array(3);
  targetOfDate(prepareTarget(target), table, n, v);
  const raDeg = Math.atan2(v[1], v[0]) * RAD;
  const sinDec = v[2];
  const cosDec = Math.hypot(v[0], v[1]);
  const h = (localSiderealDeg(table, n, ut) - raDeg) * DEG;
  const sinAlt = table.sinLat * sinDec + table.cosLat * cosDec * Math.cos(h);
  const geometric = Math.asin(Math.max(-1, Math.min(1, sinAlt))) * RAD;
  let az = Math.atan2(-cosDec * Math.sin(h), sinDec * table.cosLat - cosDec * Math.cos(h) * table.sinLat) * RAD;
  if (az < 0) az += 360;
  const altitudeDeg = refraction === 'normal' ? geometric + normalRefractionDeg(geometric) : geometric;
  return { altitudeDeg, azimuthDeg: az };
}
