/**
 * Moonlit sky brightness: the model of Krisciunas & Schaefer (1991), PASP 103, 1033. Its four
 * formulas and the nanolambert conversion (Garstang 1986, PASP 98, 364) were checked against a
 * reference implementation that cites the paper's equation numbers (docs/science.md,
 * "Checked values"); the extinction k = 0.172 of their site and the remark on the sky near the
 * Moon were not.
 *
 * The model is in the V band, with brightness in nanolamberts (nL). Brightnesses add in nL;
 * magnitudes per square arcsecond are for input and output only.
 *
 * Validation: bad input throws `ScienceInputError` naming the field (science-input-error.ts).
 */
import { between, displayNumber } from '../http/range-text';
import type { TargetWindows } from './sky-types';
import { ScienceInputError, requireFinite, requireInRange, requirePositive } from '../science/science-input-error';

const DEG = Math.PI / 180;

/**
 * Range accepted for a dark-sky brightness at the zenith, mag/arcsec²: the same bounds as
 * `validateSiteSpec` puts on `site.skyBrightnessMagPerArcsec2` (visit-precision.ts).
 */
const DARK_SKY_RANGE_MAG: readonly [number, number] = [10, 25];

/**
 * Range accepted for the extinction coefficient, mag/airmass. KS91 used k = 0.172 in V at their
 * site; typical values are 0.1–0.3 (docs/science.md#sky-brightness, equations checked there); 1 leaves room for blue
 * bands at poor sites (Spincycle's bound, not a physical limit).
 */
const EXTINCTION_RANGE: readonly [number, number] = [0, 1];

/**
 * Conversion constants between V surface brightness and nanolamberts, Krisciunas & Schaefer
 * (1991), PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there): B[nL] = 34.08·exp(20.7233 − 0.92104·V).
 * Note 0.92104 ≈ 0.4·ln 10 and 20.7233 ≈ 9·ln 10, so B ≈ 34.08·10⁹·10^(−0.4·V) [derived here].
 */
const NL_SCALE = 34.08;
const NL_OFFSET = 20.7233;
const NL_SLOPE = 0.92104;

/** 0.4·ln 10: turns 10^(−0.4·m) into exp(−LN_MAG·m) in the hot loop [derived, exact identity]. */
const LN_MAG = 0.4 * Math.LN10;

/** Rayleigh coefficient 10^5.36 of f(ρ), KS91 (docs/science.md#sky-brightness, equations checked there), computed once. */
const RAYLEIGH_SCALE = 10 ** 5.36;

/** The geometry and atmosphere of one moonlit pointing (all angles in degrees). */
export interface MoonSkyGeometry {
  /**
   * Lunar phase angle α, degrees in [0, 180]: 0 at full Moon, 90 at quarter, 180 at new Moon
   * (see {@link moonPhaseAngleDegFromIlluminatedFraction}).
   */
  moonPhaseAngleDeg: number;
  /** Moon–target angular separation ρ, degrees in [0, 180]. */
  moonTargetSeparationDeg: number;
  /** Zenith distance of the Moon Z_m, degrees in [0, 180]; above 90 the Moon is down and adds nothing. */
  moonZenithDeg: number;
  /** Zenith distance of the target Z, degrees in [0, 90]. */
  targetZenithDeg: number;
  /** Extinction coefficient k, mag per airmass, in [0, 1] (V band in the model). */
  extinctionMagPerAirmass: number;
}

/** {@link MoonSkyGeometry} plus the dark sky at the zenith. */
export interface SkyBrightnessInput extends MoonSkyGeometry {
  /**
   * Dark (moonless) sky at the zenith, mag/arcsec², in [10, 25]. In V for the model proper; a
   * node in another band passes its band's value (see {@link skyBrightnessMagPerArcsec2}).
   */
  darkSkyZenithMagPerArcsec2: number;
}

// ---------------------------------------------------------------------------------------
// The pieces of the model.

/**
 * Airmass of the KS91 model, X(Z) = (1 − 0.96·sin²Z)^(−1/2), Krisciunas & Schaefer (1991),
 * PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there). X(0) = 1; X(90°) = 1/√0.04 = 5 (finite at
 * the horizon, unlike sec Z). Used only inside the sky-brightness model; the rest of Spincycle
 * uses Kasten & Young (1989) (airmass-limit.ts).
 */
export function ks91Airmass(zenithDeg: number): number {
  const z = requireInRange(zenithDeg, 'zenithDeg', 0, 90);
  return airmassUnchecked(z);
}

/**
 * Scattering function f(ρ) = 10^5.36·(1.06 + cos²ρ) + 10^(6.15 − ρ/40), ρ in degrees:
 * Rayleigh term plus Mie (aerosol) term, Krisciunas & Schaefer (1991), PASP 103, 1033
 * (docs/science.md#sky-brightness, equations checked there). It falls from ρ = 0 to a minimum a few degrees past 90°
 * and rises again towards 180° (the Rayleigh term is symmetric about 90°) [derived here from
 * the formula]. The fit's data did not sample the Moon's immediate surroundings well, so values
 * within a few degrees of the Moon are an extrapolation (from memory).
 */
export function ks91ScatteringFunction(separationDeg: number): number {
  const rho = requireInRange(separationDeg, 'moonTargetSeparationDeg', 0, 180);
  return scatteringUnchecked(rho);
}

/**
 * Illuminance of the Moon outside the atmosphere, I* = 10^(−0.4·(3.84 + 0.026·|α| + 4·10⁻⁹·α⁴)),
 * α = phase angle in degrees, Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness,
 * checked there); in the model's own units (it multiplies f(ρ) to give nanolamberts).
 */
export function ks91MoonIlluminance(phaseAngleDeg: number): number {
  const alpha = requireInRange(phaseAngleDeg, 'moonPhaseAngleDeg', 0, 180);
  return illuminanceUnchecked(alpha);
}

/**
 * Lunar phase angle α (degrees, 0 at full Moon, 180 at new) from the illuminated fraction f:
 * α = acos(2f − 1). It inverts f = (1 + cos α)/2, the illuminated fraction of a sphere seen at
 * phase angle α (Meeus, Astronomical Algorithms 1991, ch. 46, eq. 46.1; chapter and equation
 * numbers from memory). astronomy-engine's `Illumination(Body.Moon, t).phase_fraction`, which
 * fills `TargetWindows.moonIlluminationByNight`, is this fraction. f = 1 → 0°, 0.5 → 90°, 0 → 180°.
 */
export function moonPhaseAngleDegFromIlluminatedFraction(illuminatedFraction: number): number {
  const f = requireInRange(illuminatedFraction, 'moonIlluminatedFraction', 0, 1);
  return phaseAngleUnchecked(f);
}

// ---------------------------------------------------------------------------------------
// Conversions.

/**
 * Nanolamberts → V surface brightness, V = (20.7233 − ln(B/34.08))/0.92104 mag/arcsec²,
 * Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there).
 */
export function nanolambertsToVMagPerArcsec2(nanolamberts: number): number {
  const b = requirePositive(nanolamberts, 'nanolamberts');
  return nlToMagUnchecked(b);
}

/**
 * V surface brightness → nanolamberts, B = 34.08·exp(20.7233 − 0.92104·V),
 * Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there).
 */
export function vMagPerArcsec2ToNanolamberts(vMagPerArcsec2: number): number {
  const v = requireFinite(vMagPerArcsec2, 'vMagPerArcsec2');
  return magToNlUnchecked(v);
}

// ---------------------------------------------------------------------------------------
// The model.

/**
 * Scattered moonlight at the target, nanolamberts (V):
 * B_moon = f(ρ)·I*·10^(−0.4·k·X(Z_m))·[1 − 10^(−0.4·k·X(Z))],
 * Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there). The first
 * extinction factor dims the moonlight on its way down; the bracket is the fraction of it the
 * air column towards the target scatters. 0 when the Moon is below the horizon (Z_m > 90°).
 */
export function moonSkyBrightnessNanolamberts(input: MoonSkyGeometry): number {
  const g = requireGeometry(input);
  return moonNlUnchecked(g.alpha, g.rho, g.zMoon, g.zTarget, g.k);
}

/**
 * Dark (moonless) sky at zenith distance Z, mag/arcsec²: B_dark(Z) = B_dark·10^(−0.4·k·(X−1))·X
 * with X = X(Z) of KS91, Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness,
 * checked there). In magnitudes this is V(Z) = V_zen + k·(X − 1) − 2.5·log₁₀X [derived here]:
 * the sky brightens towards the horizon (more airglow along the line of sight, factor X) and is
 * dimmed by extinction. It brightens monotonically with Z while X < 1/(0.4·ln10·k), i.e. over
 * the whole sky (X ≤ 5) for k ≤ 0.217 [derived here from d/dX of the formula].
 */
export function darkSkyAtZenithDistance(darkZenithMagPerArcsec2: number, targetZenithDeg: number, extinctionMagPerAirmass: number): number {
  const v = requireInRange(darkZenithMagPerArcsec2, 'darkSkyZenithMagPerArcsec2', DARK_SKY_RANGE_MAG[0], DARK_SKY_RANGE_MAG[1]);
  const z = requireInRange(targetZenithDeg, 'targetZenithDeg', 0, 90);
  const k = requireInRange(extinctionMagPerAirmass, 'extinctionMagPerAirmass', EXTINCTION_RANGE[0], EXTINCTION_RANGE[1]);
  return nlToMagUnchecked(darkNlUnchecked(magToNlUnchecked(v), z, k));
}

/**
 * Total sky brightness at the target, mag/arcsec²: dark sky at the target's zenith distance plus
 * scattered moonlight, added in nanolamberts and converted back (Krisciunas & Schaefer (1991),
 * PASP 103, 1033; docs/science.md#sky-brightness, equations checked there).
 *
 * Bands: the moonlight model is in V. A node observing in another band passes its band's dark
 * sky; it is converted to nL as if it were V, the Moon's V-band contribution is added, and the
 * sum converted back. That takes the Moon's contribution in other bands equal to V's: from
 * memory, moonlight is bluer than the dark sky, so this overestimates it in R and I —
 * conservative (the sky comes out brighter, the precision worse).
 */
export function skyBrightnessMagPerArcsec2(input: SkyBrightnessInput): number {
  const g = requireGeometry(input);
  const v = requireInRange(input.darkSkyZenithMagPerArcsec2, 'darkSkyZenithMagPerArcsec2', DARK_SKY_RANGE_MAG[0], DARK_SKY_RANGE_MAG[1]);
  const dark = darkNlUnchecked(magToNlUnchecked(v), g.zTarget, g.k);
  return nlToMagUnchecked(dark + moonNlUnchecked(g.alpha, g.rho, g.zMoon, g.zTarget, g.k));
}

// ---------------------------------------------------------------------------------------
// Per night, for one target's windows.

/** One target's sky brightness over a campaign (see {@link nightlySkyBrightness}). */
export interface NightlySkyBrightness {
  /** Sky brightness per night, mag/arcsec² (node band, see above); NaN for nights with no usable time. */
  byNight: Float64Array;
  /**
   * Median over usable nights, mag/arcsec² (mean of the two middle values for an even count);
   * the dark sky at the zenith when there is no usable night.
   */
  medianMagPerArcsec2: number;
  /** Brightest sky (smallest magnitude) over usable nights; the dark sky at the zenith when none. */
  worstMagPerArcsec2: number;
  /** Darkest sky (largest magnitude) over usable nights; the dark sky at the zenith when none. */
  darkestMagPerArcsec2: number;
  /** Nights with usable hours > 0 (the nights that have a value in `byNight`). */
  usableNights: number;
}

/** Options of {@link nightlySkyBrightness}. */
export interface NightlySkyBrightnessOptions {
  /**
   * Lowest target altitude used, degrees in [0, 90]; default 0 (the horizon). The target's
   * altitude is taken at mid-dark, when a target observed early or late in the night may be low
   * or set although the night has usable time; its altitude is then raised to this floor. Pass
   * the node's altitude limit: a usable night has the target at or above it at some time.
   */
  minTargetAltitudeDeg?: number;
}

/**
 * Sky brightness at one target for each night of a campaign, mag/arcsec², from the KS91 model
 * ({@link skyBrightnessMagPerArcsec2}, same band approximation) and the arrays of its
 * `TargetWindows`: target altitude at mid-dark (`altitudeAtMidDarkDegByNight`, raised to
 * `minTargetAltitudeDeg`), and the Moon's altitude, separation and illuminated fraction at the
 * middle of the longest usable interval. The two instants differ; using them together is a
 * planning simplification (one representative sky per night), not a time-resolved sky.
 * Only nights with `usableHoursByNight > 0` are evaluated.
 *
 * Runs in the planner's inner loop (targets × nodes × nights): no allocation per night; one
 * copy of the usable values is sorted for the median.
 */
export function nightlySkyBrightness(
  windows: TargetWindows,
  darkSkyZenithMagPerArcsec2: number,
  extinctionMagPerAirmass: number,
  options: NightlySkyBrightnessOptions = {},
): NightlySkyBrightness {
  const darkMag = requireInRange(darkSkyZenithMagPerArcsec2, 'darkSkyZenithMagPerArcsec2', DARK_SKY_RANGE_MAG[0], DARK_SKY_RANGE_MAG[1]);
  const k = requireInRange(extinctionMagPerAirmass, 'extinctionMagPerAirmass', EXTINCTION_RANGE[0], EXTINCTION_RANGE[1]);
  const floorAlt = requireInRange(options.minTargetAltitudeDeg ?? 0, 'minTargetAltitudeDeg', 0, 90);
  if (typeof windows !== 'object' || windows === null) throw new ScienceInputError('windows', 'is missing');
  const hours = windows.usableHoursByNight;
  const targetAlt = windows.altitudeAtMidDarkDegByNight;
  const moonAlt = windows.moonAltitudeDegByNight;
  const moonSep = windows.moonSeparationDegByNight;
  const moonLight = windows.moonIlluminationByNight;
  const n = hours.length;
  for (const [name, arr] of [
    ['altitudeAtMidDarkDegByNight', targetAlt],
    ['moonAltitudeDegByNight', moonAlt],
    ['moonSeparationDegByNight', moonSep],
    ['moonIlluminationByNight', moonLight],
  ] as const) {
    if (arr.length !== n) throw new ScienceInputError(`windows.${name}`, `must have one value per night (${n}, got ${arr.length})`);
  }

  const darkZenithNl = magToNlUnchecked(darkMag);
  const byNight = new Float64Array(n);
  let usable = 0;
  let worst = Infinity;
  let darkest = -Infinity;
  for (let i = 0; i < n; i++) {
    const h = hours[i];
    if (!(h > 0)) {
      byNight[i] = Number.NaN;
      continue;
    }
    const alt = targetAlt[i];
    const mAlt = moonAlt[i];
    const sep = moonSep[i];
    const light = moonLight[i];
    // Inline range checks (no allocation); the field names the night.
    if (!(alt >= -90 && alt <= 90)) badNight('altitudeAtMidDarkDegByNight', i, alt, between(-90, 90, '°'));
    if (!(mAlt >= -90 && mAlt <= 90)) badNight('moonAltitudeDegByNight', i, mAlt, between(-90, 90, '°'));
    if (!(sep >= 0 && sep <= 180)) badNight('moonSeparationDegByNight', i, sep, between(0, 180, '°'));
    if (!(light >= 0 && light <= 1)) badNight('moonIlluminationByNight', i, light, between(0, 1));
    const zTarget = 90 - (alt > floorAlt ? alt : floorAlt);
    const zMoon = 90 - mAlt;
    const total = darkNlUnchecked(darkZenithNl, zTarget, k) + moonNlUnchecked(phaseAngleUnchecked(light), sep, zMoon, zTarget, k);
    const mag = nlToMagUnchecked(total);
    byNight[i] = mag;
    usable++;
    if (mag < worst) worst = mag;
    if (mag > darkest) darkest = mag;
  }

  if (usable === 0) {
    return { byNight, medianMagPerArcsec2: darkMag, worstMagPerArcsec2: darkMag, darkestMagPerArcsec2: darkMag, usableNights: 0 };
  }
  const sorted = new Float64Array(usable);
  for (let i = 0, j = 0; i < n; i++) if (hours[i] > 0) sorted[j++] = byNight[i];
  sorted.sort();
  const mid = usable >> 1;
  const median = usable % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
  return { byNight, medianMagPerArcsec2: median, worstMagPerArcsec2: worst, darkestMagPerArcsec2: darkest, usableNights: usable };
}

function badNight(name: string, night: number, value: number, range: string): never {
  throw new ScienceInputError(`windows.${name}[${night}]`, `must be ${range} (got ${displayNumber(value)})`);
}

// ---------------------------------------------------------------------------------------
// Unchecked kernels (inputs already validated). Formulas as documented on the exported
// functions above: Krisciunas & Schaefer (1991), PASP 103, 1033 (docs/science.md#sky-brightness, equations checked there).

function requireGeometry(input: MoonSkyGeometry) {
  if (typeof input !== 'object' || input === null) throw new ScienceInputError('input', 'is missing');
  return {
    alpha: requireInRange(input.moonPhaseAngleDeg, 'moonPhaseAngleDeg', 0, 180),
    rho: requireInRange(input.moonTargetSeparationDeg, 'moonTargetSeparationDeg', 0, 180),
    zMoon: requireInRange(input.moonZenithDeg, 'moonZenithDeg', 0, 180),
    zTarget: requireInRange(input.targetZenithDeg, 'targetZenithDeg', 0, 90),
    k: requireInRange(input.extinctionMagPerAirmass, 'extinctionMagPerAirmass', EXTINCTION_RANGE[0], EXTINCTION_RANGE[1]),
  };
}

/** X(Z) = (1 − 0.96·sin²Z)^(−1/2), KS91. */
function airmassUnchecked(zenithDeg: number): number {
  const s = Math.sin(zenithDeg * DEG);
  return 1 / Math.sqrt(1 - 0.96 * s * s);
}

/** f(ρ) = 10^5.36·(1.06 + cos²ρ) + 10^(6.15 − ρ/40), KS91; 10^x evaluated as exp(x·ln10). */
function scatteringUnchecked(rhoDeg: number): number {
  const c = Math.cos(rhoDeg * DEG);
  return RAYLEIGH_SCALE * (1.06 + c * c) + Math.exp(Math.LN10 * (6.15 - rhoDeg / 40));
}

/** I* = 10^(−0.4·(3.84 + 0.026·|α| + 4·10⁻⁹·α⁴)), KS91; 10^(−0.4·m) evaluated as exp(−0.4·ln10·m). */
function illuminanceUnchecked(alphaDeg: number): number {
  const a = Math.abs(alphaDeg);
  const a2 = a * a;
  return Math.exp(-LN_MAG * (3.84 + 0.026 * a + 4e-9 * a2 * a2));
}

/** α = acos(2f − 1) in degrees (see moonPhaseAngleDegFromIlluminatedFraction). */
function phaseAngleUnchecked(f: number): number {
  const c = 2 * f - 1;
  return Math.acos(c > 1 ? 1 : c < -1 ? -1 : c) / DEG;
}

/** B_moon = f(ρ)·I*·10^(−0.4·k·X(Zm))·[1 − 10^(−0.4·k·X(Z))], KS91; 0 with the Moon down. */
function moonNlUnchecked(alphaDeg: number, rhoDeg: number, zMoonDeg: number, zTargetDeg: number, k: number): number {
  if (zMoonDeg > 90) return 0;
  const xMoon = airmassUnchecked(zMoonDeg);
  const xTarget = airmassUnchecked(zTargetDeg);
  // 10^(−0.4·k·X) = exp(−0.4·ln10·k·X); −expm1 keeps 1 − 10^(…) accurate for small k·X.
  return scatteringUnchecked(rhoDeg) * illuminanceUnchecked(alphaDeg) * Math.exp(-LN_MAG * k * xMoon) * -Math.expm1(-LN_MAG * k * xTarget);
}

/** B_dark(Z) = B_dark,zen·10^(−0.4·k·(X − 1))·X, KS91. */
function darkNlUnchecked(darkZenithNl: number, zTargetDeg: number, k: number): number {
  const x = airmassUnchecked(zTargetDeg);
  return darkZenithNl * Math.exp(-LN_MAG * k * (x - 1)) * x;
}

/** B = 34.08·exp(20.7233 − 0.92104·V), KS91. */
function magToNlUnchecked(v: number): number {
  return NL_SCALE * Math.exp(NL_OFFSET - NL_SLOPE * v);
}

/** V = (20.7233 − ln(B/34.08))/0.92104, KS91. */
function nlToMagUnchecked(b: number): number {
  return (NL_OFFSET - Math.log(b / NL_SCALE)) / NL_SLOPE;
}
