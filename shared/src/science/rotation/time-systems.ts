/**
 * Time systems of returned photometry: ISO 8601 UTC instants, JD and MJD (UTC), and their
 * conversion to BJD (TDB), the time the analysis runs on.
 *
 * BJD(TDB) = JD(UTC) + (TAI − UTC) + 32.184 s + (TDB − TT) + n̂·r⊕/c, Eastman, Siverd & Gaudi
 * (2010), PASP 122, 935, §2 (from memory):
 * - TAI − UTC: the leap-second table of IERS Bulletin C ({@link LEAP_SECONDS}); 37 s since
 *   2017-01-01. Leap seconds announced after this table was written are not in it: after the
 *   next one, times after it come out 1 s early until the table is extended. A JD(UTC) counts
 *   every day as 86 400 s; ERFA (and so astropy) count the last day before a leap second as
 *   86 401 s, so a JD(UTC) of that day means up to 1 s later to them (ISO instants agree).
 * - TT = TAI + 32.184 s (by definition of TT).
 * - TDB − TT: the periodic term 0.001657 s·sin g + 0.000014 s·sin 2g, g = 357.53° +
 *   0.98560028°·(JD − 2451545.0), Kaplan (2005), USNO Circular 179, eq. 2.6 (from memory),
 *   good to ≈ 30 µs.
 * - Rømer delay n̂·r⊕/c: the geocentre's barycentric position from astronomy-engine's
 *   `BaryState(Body.Earth, …)` (J2000 equatorial, AU), projected on the target's direction.
 *   The observatory's offset from the geocentre (up to 21 ms: the Earth's radius over c) and
 *   the Shapiro delay (≤ 0.1 ms) are neglected: both are far below what a rotation period of
 *   hours to weeks can notice.
 * The Earth's position is evaluated at nodes every {@link NODE_STEP_DAYS} days and
 * interpolated by cubic Hermite polynomials from the positions and velocities at the two
 * nodes around each time (error below 1 µs of light time: h⁴/384 times the fourth derivative of the
 * Earth's motion, below 2e-7 AU/d⁴ with the lunar wobble, is 5e-10 AU). Nodes are computed only
 * where there are data, so a long or sparse series costs no more than its nights.
 */
import { AstroTime, BaryState, Body } from 'astronomy-engine';

/** MJD = JD − 2400000.5. */
export const MJD_OFFSET = 2400000.5;
/** JD of the Unix epoch, 1970-01-01T00:00Z. */
const UNIX_EPOCH_JD = 2440587.5;
const MS_PER_DAY = 86_400_000;
const SECONDS_PER_DAY = 86_400;
/** TT − TAI, seconds (the definition of TT). */
export const TT_MINUS_TAI_SECONDS = 32.184;
/** Light time for one astronomical unit, seconds (IAU 2012 au = 149 597 870 700 m; c = 299 792 458 m/s). */
export const AU_LIGHT_SECONDS = 149_597_870_700 / 299_792_458;
export const BJD_SOURCE =
  'Eastman, Siverd & Gaudi (2010), PASP 122, 935 (BJD(TDB)); TAI − UTC from IERS Bulletin C; TDB − TT: Kaplan (2005), USNO Circular 179, eq. 2.6; Earth position: astronomy-engine BaryState';

/**
 * TAI − UTC in seconds from each UTC date on (IERS Bulletin C; the dates of the leap seconds
 * since 1972, when UTC took its present form). Earlier dates use the first entry.
 */
export const LEAP_SECONDS: readonly { fromUtc: string; taiMinusUtcSeconds: number }[] = [
  ['1972-01-01', 10],
  ['1972-07-01', 11],
  ['1973-01-01', 12],
  ['1974-01-01', 13],
  ['1975-01-01', 14],
  ['1976-01-01', 15],
  ['1977-01-01', 16],
  ['1978-01-01', 17],
  ['1979-01-01', 18],
  ['1980-01-01', 19],
  ['1981-07-01', 20],
  ['1982-07-01', 21],
  ['1983-07-01', 22],
  ['1985-07-01', 23],
  ['1988-01-01', 24],
  ['1990-01-01', 25],
  ['1991-01-01', 26],
  ['1992-07-01', 27],
  ['1993-07-01', 28],
  ['1994-07-01', 29],
  ['1996-01-01', 30],
  ['1997-07-01', 31],
  ['1999-01-01', 32],
  ['2006-01-01', 33],
  ['2009-01-01', 34],
  ['2012-07-01', 35],
  ['2015-07-01', 36],
  ['2017-01-01', 37],
].map(([fromUtc, s]) => ({ fromUtc: fromUtc as string, taiMinusUtcSeconds: s as number }));

const LEAP_JD = LEAP_SECONDS.map((l) => Date.parse(`${l.fromUtc}T00:00:00Z`) / MS_PER_DAY + UNIX_EPOCH_JD);

/** TAI − UTC (seconds) at a JD(UTC). */
export function taiMinusUtcSeconds(jdUtc: number): number {
  let lo = 0;
  let hi = LEAP_JD.length - 1;
  if (jdUtc < LEAP_JD[0]) return LEAP_SECONDS[0].taiMinusUtcSeconds;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (LEAP_JD[mid] <= jdUtc) lo = mid;
    else hi = mid - 1;
  }
  return LEAP_SECONDS[lo].taiMinusUtcSeconds;
}

/** TDB − TT, seconds, at a JD (TT): Kaplan (2005), USNO Circular 179, eq. 2.6 (from memory). */
export function tdbMinusTtSeconds(jdTt: number): number {
  const g = ((357.53 + 0.98560028 * (jdTt - 2451545.0)) * Math.PI) / 180;
  return 0.001657 * Math.sin(g) + 0.000014 * Math.sin(2 * g);
}

const ISO_PATTERN = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d+))?)?(Z|[+-]\d{2}:\d{2})$/;

/**
 * JD (UTC) of a strict ISO 8601 instant `YYYY-MM-DDTHH:MM[:SS[.fff…]]` with `Z` or `±HH:MM`
 * (a space may replace the T); null when the text is not one, including impossible dates
 * (Feb 30, hour 24, minute 60). A leap second (:60) is not accepted.
 */
export function parseIsoUtc(text: string): number | null {
  const m = ISO_PATTERN.exec(text.trim());
  if (!m) return null;
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  const hour = Number(m[4]);
  const minute = Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const fraction = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  if (hour > 23 || minute > 59 || second > 59) return null;
  let offsetMinutes = 0;
  if (m[8] !== 'Z') {
    const oh = Number(m[8].slice(1, 3));
    const om = Number(m[8].slice(4, 6));
    if (oh > 23 || om > 59) return null;
    offsetMinutes = (m[8][0] === '-' ? -1 : 1) * (oh * 60 + om);
  }
  // Whole milliseconds through Date.UTC; the fraction of the second added separately so that
  // microseconds are not rounded away. Date.UTC maps years 0–99 to 1900–1999: set it explicitly.
  const d = new Date(Date.UTC(2000, month - 1, day, hour, minute, second));
  d.setUTCFullYear(year);
  const ms = d.getTime() - offsetMinutes * 60_000;
  return ms / MS_PER_DAY + UNIX_EPOCH_JD + fraction / SECONDS_PER_DAY;
}

function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/** JD (UTC) → ISO 8601 text to the millisecond (for messages and labels). */
export function jdToIso(jd: number): string {
  return new Date(Math.round((jd - UNIX_EPOCH_JD) * MS_PER_DAY)).toISOString();
}

/** Spacing of the Earth-position nodes, days. */
export const NODE_STEP_DAYS = 1;
/** J2000.0 as a JD: astronomy-engine counts days from it. */
const J2000_JD = 2451545.0;

/** The Earth's barycentric states at the nodes (x, y, z AU; vx, vy, vz AU/d), kept across calls: every target of an upload shares them. */
const earthStates = new Map<number, Float64Array>();
const EARTH_STATES_KEPT = 50_000;

function earthStateAt(k: number): Float64Array {
  let s = earthStates.get(k);
  if (!s) {
    const b = BaryState(Body.Earth, AstroTime.FromTerrestrialTime(k * NODE_STEP_DAYS));
    s = Float64Array.of(b.x, b.y, b.z, b.vx, b.vy, b.vz);
    if (earthStates.size >= EARTH_STATES_KEPT) earthStates.clear();
    earthStates.set(k, s);
  }
  return s;
}

/**
 * JD (UTC) → BJD (TDB) for a target at J2000 (ICRS) right ascension and declination, degrees
 * (see the module comment).
 */
export function toBjdTdb(jdUtc: Float64Array, raDeg: number, decDeg: number): Float64Array {
  const ra = (raDeg * Math.PI) / 180;
  const dec = (decDeg * Math.PI) / 180;
  const nx = Math.cos(dec) * Math.cos(ra);
  const ny = Math.cos(dec) * Math.sin(ra);
  const nz = Math.sin(dec);
  const n = jdUtc.length;
  const out = new Float64Array(n);
  // Projection of the Earth's barycentric position and velocity on n̂ at each node, AU and AU/d.
  const nodes = new Map<number, { p: number; v: number }>();
  const node = (k: number) => {
    let e = nodes.get(k);
    if (!e) {
      const s = earthStateAt(k);
      e = { p: s[0] * nx + s[1] * ny + s[2] * nz, v: s[3] * nx + s[4] * ny + s[5] * nz };
      nodes.set(k, e);
    }
    return e;
  };
  let lastK = NaN;
  let a = { p: 0, v: 0 };
  let b = a;
  for (let i = 0; i < n; i++) {
    const jd = jdUtc[i];
    const leap = taiMinusUtcSeconds(jd);
    const jdTt = jd + (leap + TT_MINUS_TAI_SECONDS) / SECONDS_PER_DAY;
    const jdTdb = jdTt + tdbMinusTtSeconds(jdTt) / SECONDS_PER_DAY;
    // Hermite interpolation in days since J2000 (TT ≈ TDB for the position: 1.7 ms × 30 km/s).
    const x = (jdTt - J2000_JD) / NODE_STEP_DAYS;
    const k = Math.floor(x);
    const u = x - k;
    if (k !== lastK) {
      lastK = k;
      a = node(k);
      b = node(k + 1);
    }
    const h = NODE_STEP_DAYS;
    const u2 = u * u;
    const u3 = u2 * u;
    const proj = (2 * u3 - 3 * u2 + 1) * a.p + (u3 - 2 * u2 + u) * h * a.v + (-2 * u3 + 3 * u2) * b.p + (u3 - u2) * h * b.v;
    out[i] = jdTdb + (proj * AU_LIGHT_SECONDS) / SECONDS_PER_DAY;
  }
  return out;
}
