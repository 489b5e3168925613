/**
 * Synthetic `TargetWindows` for specs: per-night values set by hand instead of computed from
 * a site and a target. Not a spec itself (jest runs only `*.spec.ts`).
 */
import { MS_PER_DAY } from '../local-nights';
import { MAX_INTERVALS_PER_NIGHT, type TargetWindows } from '../sky-types';
import { summarizeTargetWindows } from '../sky-windows';
import { allocateTargetNightStorage, targetWindowsOver } from '../target-visibility';

/** First night of synthetic windows: 2025-01-01 (0h UTC). */
export const SYNTHETIC_FIRST_NIGHT_UTC_MS = Date.UTC(2025, 0, 1);

/** What to set; anything not given stays 0 (no intervals, not Moon-excluded). */
export interface SyntheticWindowsSpec {
  /** Usable hours per night; its length is the number of nights. */
  usableHours: readonly number[];
  altitudeDeg?: readonly number[];
  moonSeparationDeg?: readonly number[];
  moonAltitudeDeg?: readonly number[];
  moonIllumination?: readonly number[];
  /** Usable intervals per night, [start, end] UTC ms, at most MAX_INTERVALS_PER_NIGHT each. */
  intervalsUtcMs?: ReadonlyArray<ReadonlyArray<readonly [number, number]>>;
  /** Nights excluded by the Moon: flagged, and their usable hours set to 0 (intervals kept). */
  moonExcludedNights?: readonly number[];
  /** Default `synthetic`. */
  name?: string;
  /** Default consecutive ISO dates from 2025-01-01. */
  nightDates?: readonly string[];
  /** Fill in the summary with `summarizeTargetWindows(…, 0)`; default: leave it empty. */
  summarize?: boolean;
}

/** Builds one synthetic target's windows (target index 0 at RA 0°, Dec 0°). */
export function syntheticWindows(spec: SyntheticWindowsSpec): TargetWindows {
  const count = spec.usableHours.length;
  const arrays = allocateTargetNightStorage(1, count);
  arrays.usableHours.set(spec.usableHours);
  if (spec.altitudeDeg) arrays.altitudeDeg.set(spec.altitudeDeg);
  if (spec.moonSeparationDeg) arrays.moonSeparationDeg.set(spec.moonSeparationDeg);
  if (spec.moonAltitudeDeg) arrays.moonAltitudeDeg.set(spec.moonAltitudeDeg);
  if (spec.moonIllumination) arrays.moonIllumination.set(spec.moonIllumination);
  spec.intervalsUtcMs?.forEach((list, n) => {
    list.forEach(([start, end], k) => {
      arrays.intervalsUtcMs[(n * MAX_INTERVALS_PER_NIGHT + k) * 2] = start;
      arrays.intervalsUtcMs[(n * MAX_INTERVALS_PER_NIGHT + k) * 2 + 1] = end;
    });
    arrays.intervalCount[n] = list.length;
  });
  for (const n of spec.moonExcludedNights ?? []) {
    arrays.moonExcluded[n] = 1;
    arrays.usableHours[n] = 0;
  }
  const nightDates =
    spec.nightDates ?? spec.usableHours.map((_, n) => new Date(SYNTHETIC_FIRST_NIGHT_UTC_MS + n * MS_PER_DAY).toISOString().slice(0, 10));
  const w = targetWindowsOver({ name: spec.name ?? 'synthetic', raDeg: 0, decDeg: 0 }, 0, nightDates, arrays);
  if (spec.summarize) summarizeTargetWindows(w, 0);
  return w;
}

/** One night as the sky-brightness specs give it. */
export interface SyntheticMoonNight {
  hours: number;
  /** Target altitude at mid-dark, degrees. */
  alt: number;
  /** Moon altitude, degrees. */
  moonAlt: number;
  /** Moon–target separation, degrees. */
  sep: number;
  /** Moon illuminated fraction, 0–1. */
  light: number;
}

/** Synthetic windows from per-night hours, altitudes and Moon geometry (no intervals). */
export function syntheticMoonWindows(
  nights: readonly SyntheticMoonNight[],
  options: Pick<SyntheticWindowsSpec, 'name' | 'nightDates'> = {},
): TargetWindows {
  return syntheticWindows({
    ...options,
    usableHours: nights.map((x) => x.hours),
    altitudeDeg: nights.map((x) => x.alt),
    moonSeparationDeg: nights.map((x) => x.sep),
    moonAltitudeDeg: nights.map((x) => x.moonAlt),
    moonIllumination: nights.map((x) => x.light),
  });
}
