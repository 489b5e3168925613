/**
 * Shapes of the sky-window computation: what goes in, what comes out.
 *
 * Instants are UTC, carried as Unix epoch milliseconds (`…UtcMs`) so that a whole campaign
 * (thousands of targets × hundreds of nights) stays in typed arrays; `toIsoUtc()` turns one
 * into ISO 8601 for display. Local dates are `YYYY-MM-DD` strings.
 */
import type { SiteSpec } from '../facility/facility-types';

/**
 * Atmospheric refraction applied to target altitudes.
 * - `normal`: astronomy-engine's `Refraction('normal', h)` (Saemundsson's formula as given by
 *   Meeus, Astronomical Algorithms 1991, ch. 16 [memory], for 1010 hPa and 10 °C) is added to the geometric
 *   altitude, exactly as `Horizon(…, 'normal')` does. The altitude limit is then an apparent
 *   (pointing) altitude, which is what a telescope's safety configuration limits.
 * - `none`: geometric altitudes throughout (what astropy's AltAz gives without pressure).
 * The Sun's darkness limit is always the geometric altitude of the Sun's centre, as
 * `SearchAltitude` computes it and as twilight is conventionally defined.
 */
export type RefractionMode = 'normal' | 'none';

/** The part of a site the sky windows need (a `SiteSpec` fits). Longitude is east-positive. */
export type SkySite = Pick<SiteSpec, 'latitudeDeg' | 'longitudeDeg' | 'elevationM' | 'timeZone'>;

/** Observing limits. Give `altitudeLimitDeg` or `airmassLimit`, not both. */
export interface SkyLimits {
  /** Lowest usable altitude of a target, degrees (apparent when refraction is `normal`). */
  altitudeLimitDeg?: number;
  /** Highest usable airmass, ≥ 1; converted to an altitude with Kasten & Young (1989). */
  airmassLimit?: number;
  /** Sun altitude at or below which it is dark, degrees; default −18 (astronomical), −12 nautical. */
  sunAltitudeLimitDeg?: number;
  /**
   * Minimum Moon–target separation, degrees. When given, a night whose usable time has the Moon
   * above the horizon and closer than this at the middle of its (longest) usable interval is
   * excluded as a whole (`moonExcluded`); a planning simplification, documented in docs/command-line.md.
   */
  moonSeparationMinDeg?: number;
  /** A night counts as usable when its usable time is > 0 and ≥ this, hours; default 0. */
  minUsableHours?: number;
  /** Refraction for target altitudes; default `normal`. */
  refraction?: RefractionMode;
}

/** The campaign: first and last local night. The night of D begins on the evening of local date D. */
export interface SkyCampaign {
  firstNight: string;
  lastNight: string;
}

/** One target: J2000 (ICRS) position and optional proper motion. */
export interface SkyTarget {
  /** Free label echoed in the output. */
  name?: string;
  /** Right ascension, J2000, degrees in [0, 360). */
  raDeg: number;
  /** Declination, J2000, degrees in [−90, +90]. */
  decDeg: number;
  /** Proper motion in RA including the cos δ factor (μα*), mas/yr; applied only if given. */
  pmRaCosDecMasPerYr?: number;
  /** Proper motion in Dec, mas/yr; applied only if given. */
  pmDecMasPerYr?: number;
  /** Epoch of the position as a Julian year (e.g. 2016.0 for a Gaia DR3 position); default 2000.0. */
  epochYear?: number;
}

/** Everything `computeSkyWindows` needs for one site. */
export interface SkyWindowsInput {
  site: SkySite;
  limits: SkyLimits;
  campaign: SkyCampaign;
  targets: readonly SkyTarget[];
}

/** The limits after defaults and conversions, as actually used. */
export interface ResolvedSkyLimits {
  /** Altitude limit as given or from the airmass limit, degrees (apparent if refraction is `normal`). */
  altitudeLimitDeg: number;
  /** The same limit as a geometric altitude, degrees (equal to `altitudeLimitDeg` without refraction). */
  geometricAltitudeLimitDeg: number;
  sunAltitudeLimitDeg: number;
  moonSeparationMinDeg: number | null;
  minUsableHours: number;
  refraction: RefractionMode;
}

/**
 * How dark a night gets: `none` (the Sun never goes below the limit: midnight sun or bright
 * summer twilight), `partial` (an evening and a morning edge), `all` (dark for the whole 24-h
 * window: polar night; the night is clipped to the window).
 */
export type Darkness = 'none' | 'partial' | 'all';

/** Darkness of one local night at the site, shared by all targets. */
export interface NightDark {
  /** Local date `YYYY-MM-DD` on whose evening the night begins. */
  nightDate: string;
  /** Start of the night's 24-h window: local mean noon (see local-nights.ts), UTC ms. */
  windowStartUtcMs: number;
  /** End of the window: the next local mean noon, UTC ms. */
  windowEndUtcMs: number;
  darkness: Darkness;
  /** Start of darkness (Sun ≤ limit), UTC ms; the window start in polar night; null when never dark. */
  darkStartUtcMs: number | null;
  /** End of darkness, UTC ms; the window end in polar night; null when never dark. */
  darkEndUtcMs: number | null;
  darkHours: number;
  /** Middle of the dark time, or the Sun's lower culmination when it never gets dark, UTC ms. */
  midDarkUtcMs: number;
  /** Sun's geometric altitude at its lower culmination (the darkest moment), degrees. */
  sunMinAltitudeDeg: number;
  /** Illuminated fraction of the Moon at `midDarkUtcMs`, 0–1. */
  moonIlluminationAtMidDark: number;
}

/** Whether a target, over the campaign, can reach the altitude limit at the site at all. */
export type TargetVisibility = 'circumpolar' | 'rises-and-sets' | 'never-rises';

/** Per-target totals over the campaign. */
export interface TargetWindowSummary {
  /** First night with usable time (≥ `minUsableHours`), or null. */
  firstUsableNight: string | null;
  lastUsableNight: string | null;
  /** Nights with usable time > 0 and ≥ `minUsableHours`. */
  usableNights: number;
  totalNights: number;
  totalUsableHours: number;
  /** Most usable hours in one night. */
  maxNightlyUsableHours: number;
  /**
   * Longest gap: the most nights in a row without a usable night between two usable nights
   * (0 = usable on consecutive nights); null with fewer than two usable nights.
   */
  longestGapNights: number | null;
  /** With respect to the altitude limit, ignoring the Sun (at the campaign's middle). */
  visibility: TargetVisibility;
}

/** Most usable intervals one target can have in one night (see target-visibility.ts). */
export const MAX_INTERVALS_PER_NIGHT = 3;

/**
 * One target's windows over the campaign, as typed arrays indexed by night (same order as
 * `SkyWindowsResult.nights`); they are views into buffers shared by all targets of one result.
 * Use `listTargetNights()` for plain objects and `toSkyWindowsReport()` for JSON.
 */
export interface TargetWindows {
  targetIndex: number;
  name: string | null;
  raDeg: number;
  decDeg: number;
  /** Local night dates, shared with the result (not a copy). */
  nightDates: readonly string[];
  /** Usable hours per night (dark, at or above the altitude limit, not excluded by the Moon). */
  usableHoursByNight: Float64Array;
  /** Target altitude at the middle of the dark time (or the darkest moment if never dark), degrees. */
  altitudeAtMidDarkDegByNight: Float64Array;
  /** Moon–target separation at the middle of the longest usable interval (else mid-dark), degrees. */
  moonSeparationDegByNight: Float64Array;
  /** Moon's geometric altitude at that same instant, degrees. */
  moonAltitudeDegByNight: Float64Array;
  /** Moon illuminated fraction at that same instant, 0–1. */
  moonIlluminationByNight: Float64Array;
  /** 1 when the night was excluded by the Moon-separation minimum (its intervals are kept). */
  moonExcludedByNight: Uint8Array;
  /** Number of usable intervals per night, 0…MAX_INTERVALS_PER_NIGHT. */
  intervalCountByNight: Uint8Array;
  /**
   * Interval edges, UTC ms: night i, interval k starts at
   * `[(i * MAX_INTERVALS_PER_NIGHT + k) * 2]` and ends at the next element; unused slots are 0.
   */
  intervalsUtcMs: Float64Array;
  summary: TargetWindowSummary;
}

/** The answer of `computeSkyWindows`. */
export interface SkyWindowsResult {
  site: SkySite;
  limits: ResolvedSkyLimits;
  campaign: SkyCampaign;
  nights: NightDark[];
  targets: TargetWindows[];
}

/** One usable interval, UTC ms. */
export interface UsableInterval {
  startUtcMs: number;
  endUtcMs: number;
}

/** One target on one night, as a plain object (see `listTargetNights`). */
export interface TargetNight {
  nightDate: string;
  darkStartUtcMs: number | null;
  darkEndUtcMs: number | null;
  intervals: UsableInterval[];
  usableHours: number;
  altitudeAtMidDarkDeg: number;
  moonIllumination: number;
  moonSeparationDeg: number;
  moonAltitudeDeg: number;
  moonExcluded: boolean;
}
