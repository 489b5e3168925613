/**
 * Sky windows: when each target can be observed from one site over a whole campaign.
 *
 * Cost: per site and night, one hour-angle search and two altitude searches for the Sun plus
 * two Moon positions (astronomy-engine), shared by all targets; per target and night, a
 * handful of arithmetic operations and ~6 trigonometric calls (target-visibility.ts), with no
 * time sampling. See docs/command-line.md for the policies (night windows, refraction, Moon).
 */
import { buildNightTable } from './night-ephemeris';
import { validateSkyWindowsInput } from './sky-input-validation';
import {
  MAX_INTERVALS_PER_NIGHT,
  type SkyWindowsInput,
  type SkyWindowsResult,
  type TargetNight,
  type TargetWindows,
  type UsableInterval,
} from './sky-types';
import {
  allocateTargetNightStorage,
  classifyVisibility,
  computeTargetNights,
  cosHalfWidth,
  prepareTarget,
  targetOfDate,
} from './target-visibility';
import { formatDayNumber } from './local-nights';
import { DEG } from './astro-time';

/**
 * Computes, for one site, the darkness of every night of the campaign and every target's
 * usable intervals, hours, altitude at mid-darkness and Moon geometry, plus per-target totals.
 *
 * @throws SkyInputError naming the field when the input is invalid.
 */
export function computeSkyWindows(input: SkyWindowsInput): SkyWindowsResult {
  const { site, limits, firstDay, lastDay, targets } = validateSkyWindowsInput(input);
  const table = buildNightTable(site, firstDay, lastDay, limits.sunAltitudeLimitDeg);
  const nightDates = table.nights.map((night) => night.nightDate);
  const middleNight = Math.floor(table.count / 2);
  const sinLimit = Math.sin(limits.geometricAltitudeLimitDeg * DEG);
  const scratch = new Float64Array(3);

  const storage = allocateTargetNightStorage(targets.length, table.count);
  const windows = targets.map((target, index) => {
    const w = computeTargetNights(target, index, table, limits, nightDates, storage, index);
    targetOfDate(prepareTarget(target), table, middleNight, scratch);
    const cosH0 = cosHalfWidth(scratch[2], Math.hypot(scratch[0], scratch[1]), table.sinLat, table.cosLat, sinLimit);
    summarizeTargetWindows(w, limits.minUsableHours);
    w.summary.visibility = classifyVisibility(cosH0);
    return w;
  });

  return {
    site,
    limits,
    campaign: { firstNight: formatDayNumber(firstDay), lastNight: formatDayNumber(lastDay) },
    nights: table.nights,
    targets: windows,
  };
}

/** True when night `n` counts as usable for the summary (usable time > 0 and ≥ the minimum). */
export function isUsableNight(windows: TargetWindows, n: number, minUsableHours: number): boolean {
  const hours = windows.usableHoursByNight[n];
  return hours > 0 && hours >= minUsableHours;
}

/** Fills `windows.summary` (first/last usable night, counts, hours, longest gap). */
export function summarizeTargetWindows(windows: TargetWindows, minUsableHours: number): void {
  const s = windows.summary;
  let previous = -1;
  let longestGap: number | null = null;
  let total = 0;
  let max = 0;
  let count = 0;
  for (let n = 0; n < windows.usableHoursByNight.length; n++) {
    const hours = windows.usableHoursByNight[n];
    total += hours;
    if (hours > max) max = hours;
    if (!isUsableNight(windows, n, minUsableHours)) continue;
    count++;
    if (previous < 0) s.firstUsableNight = windows.nightDates[n];
    else longestGap = Math.max(longestGap ?? 0, n - previous - 1);
    s.lastUsableNight = windows.nightDates[n];
    previous = n;
  }
  s.usableNights = count;
  s.totalUsableHours = total;
  s.maxNightlyUsableHours = max;
  s.longestGapNights = longestGap;
}

/** The usable intervals of one target on night `n`, UTC ms. */
export function usableIntervals(windows: TargetWindows, n: number): UsableInterval[] {
  const out: UsableInterval[] = [];
  const base = n * MAX_INTERVALS_PER_NIGHT * 2;
  for (let k = 0; k < windows.intervalCountByNight[n]; k++) {
    out.push({ startUtcMs: windows.intervalsUtcMs[base + 2 * k], endUtcMs: windows.intervalsUtcMs[base + 2 * k + 1] });
  }
  return out;
}

/** One target's nights as plain objects (for JSON, tables and tests). */
export function listTargetNights(result: SkyWindowsResult, targetIndex: number): TargetNight[] {
  const w = result.targets[targetIndex];
  return result.nights.map((night, n) => ({
    nightDate: night.nightDate,
    darkStartUtcMs: night.darkStartUtcMs,
    darkEndUtcMs: night.darkEndUtcMs,
    intervals: usableIntervals(w, n),
    usableHours: w.usableHoursByNight[n],
    altitudeAtMidDarkDeg: w.altitudeAtMidDarkDegByNight[n],
    moonIllumination: w.moonIlluminationByNight[n],
    moonSeparationDeg: w.moonSeparationDegByNight[n],
    moonAltitudeDeg: w.moonAltitudeDegByNight[n],
    moonExcluded: w.moonExcludedByNight[n] === 1,
  }));
}

/** Usable hours of all targets × nights in one compact array, for charts. */
export interface UsableHoursGrid {
  nightDates: readonly string[];
  targetCount: number;
  nightCount: number;
  /** Row-major, one row per target: `hours[target * nightCount + night]`. */
  hours: Float32Array;
  /** Dark hours per night (the upper bound of every row). */
  darkHoursByNight: Float32Array;
}

/** Packs the per-night usable hours of every target into one Float32Array. */
export function toUsableHoursGrid(result: SkyWindowsResult): UsableHoursGrid {
  const nightCount = result.nights.length;
  const targetCount = result.targets.length;
  const hours = new Float32Array(targetCount * nightCount);
  result.targets.forEach((w, t) => hours.set(w.usableHoursByNight, t * nightCount));
  return {
    nightDates: result.nights.map((n) => n.nightDate),
    targetCount,
    nightCount,
    hours,
    darkHoursByNight: Float32Array.from(result.nights, (n) => n.darkHours),
  };
}
