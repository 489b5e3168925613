/**
 * Can a target's sky windows carry an observing requirement (visits per night, cadence,
 * baseline, total visits) after the site's weather loss?
 *
 * Policy (a planning estimate, not a schedule):
 * - A night QUALIFIES when its usable intervals can hold the night's visits back to back:
 *   Σ_intervals floor(interval length / visit length) ≥ visits per night. Spacing the visits
 *   over the night is the night planner's job; a night that cannot even hold them back to back
 *   certainly cannot hold them spaced. Nights excluded by the Moon do not qualify.
 * - Weather: of N qualifying nights, N × (1 − weather loss) are expected clear.
 * - Visits: ceil(totalVisits / visitsPerNight) visiting nights are needed among the expected
 *   clear qualifying nights of the whole campaign.
 * - Cadence over the baseline: the best stretch of the campaign that starts on a qualifying
 *   night and reaches a qualifying night at least `baselineDays` later is chosen (smallest
 *   longest gap, then most qualifying nights). Its longest gap between qualifying nights must
 *   not exceed `cadenceDays`, and its expected clear qualifying nights must reach the
 *   floor(baselineDays / cadenceDays) + 1 nights the cadence asks for.
 */
import { SkyInputError, describeValue, requireFiniteInRange } from './sky-input-error';
import { MAX_INTERVALS_PER_NIGHT, type TargetWindows } from './sky-types';

/** What a target plan asks of the sky. */
export interface CadenceRequirement {
  /** Visits on each visiting night (≥ 1, whole). */
  visitsPerNight: number;
  /** Length of one visit: exposure + overhead, hours. */
  visitHours: number;
  /** Interval between visiting nights, days (1 = every night). */
  cadenceDays: number;
  /** Time from first to last visit, days. */
  baselineDays: number;
  /** Visits over the whole program (≥ 1, whole). */
  totalVisits: number;
}

/** The answer of `assessCadence`. */
export interface CadenceAssessment {
  fits: boolean;
  /** Why it does not fit, one sentence each; empty when it fits. */
  reasons: string[];
  /** One line, e.g. `observable on 112 of 180 nights; longest gap 9 nights; cadence fits`. */
  verdict: string;
  totalNights: number;
  /** Nights whose usable time can hold the night's visits. */
  qualifyingNights: number;
  /** qualifyingNights × (1 − weather loss). */
  expectedClearNights: number;
  /** ceil(totalVisits / visitsPerNight). */
  visitingNightsNeeded: number;
  /** floor(baselineDays / cadenceDays) + 1. */
  cadenceNightsNeeded: number;
  /** Longest gap between consecutive qualifying nights over the campaign; null with < 2. */
  longestGapNights: number | null;
  /** The stretch chosen for the baseline (see the file comment), or null when none reaches it. */
  baselineWindow: { firstNight: string; lastNight: string; qualifyingNights: number; longestGapNights: number | null } | null;
  /** Longest usable time in one night, hours. */
  maxNightlyUsableHours: number;
}

function requireWhole(value: unknown, field: string, min: number, max: number): number {
  const v = requireFiniteInRange(value, field, min, max);
  if (!Number.isInteger(v)) throw new SkyInputError(field, `must be a whole number, got ${v}`);
  return v;
}

/** Validates a requirement; errors name `requirement.<field>`. */
export function validateCadenceRequirement(requirement: unknown): CadenceRequirement {
  if (typeof requirement !== 'object' || requirement === null) {
    throw new SkyInputError('requirement', `must be an object, got ${describeValue(requirement)}`);
  }
  const r = requirement as Record<string, unknown>;
  return {
    visitsPerNight: requireWhole(r['visitsPerNight'], 'requirement.visitsPerNight', 1, 1000),
    visitHours: requireFiniteInRange(r['visitHours'], 'requirement.visitHours', 1e-6, 24),
    cadenceDays: requireFiniteInRange(r['cadenceDays'], 'requirement.cadenceDays', 1e-6, 10_000),
    baselineDays: requireFiniteInRange(r['baselineDays'], 'requirement.baselineDays', 0, 10_000),
    totalVisits: requireWhole(r['totalVisits'], 'requirement.totalVisits', 1, 10_000_000),
  };
}

/** Visits of `visitHours` that fit in night `n`'s usable intervals, back to back. */
export function nightVisitCapacity(windows: TargetWindows, n: number, visitHours: number): number {
  if (windows.moonExcludedByNight[n] === 1) return 0;
  const base = n * MAX_INTERVALS_PER_NIGHT * 2;
  let capacity = 0;
  for (let k = 0; k < windows.intervalCountByNight[n]; k++) {
    const hours = (windows.intervalsUtcMs[base + 2 * k + 1] - windows.intervalsUtcMs[base + 2 * k]) / 3_600_000;
    // 1e-9 keeps an interval of exactly k visits from losing one to rounding.
    capacity += Math.floor(hours / visitHours + 1e-9);
  }
  return capacity;
}

const fmt = (x: number, digits = 1): string => {
  const s = x.toFixed(digits);
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
};
const plural = (n: number, word: string): string => `${n} ${word}${n === 1 ? '' : 's'}`;

/**
 * Checks a requirement against one target's windows after weather loss.
 *
 * @param weatherLossFraction fraction of night time lost to weather, 0 ≤ f < 1 (a node's
 *   `weatherLossFraction`).
 * @throws SkyInputError for an invalid requirement or weather fraction.
 */
export function assessCadence(
  windows: TargetWindows,
  requirement: CadenceRequirement,
  weatherLossFraction: number,
): CadenceAssessment {
  const req = validateCadenceRequirement(requirement);
  const weather = requireFiniteInRange(weatherLossFraction, 'weatherLossFraction', 0, 0.999);
  const total = windows.usableHoursByNight.length;
  const qualifying: number[] = [];
  let maxHours = 0;
  for (let n = 0; n < total; n++) {
    maxHours = Math.max(maxHours, windows.usableHoursByNight[n]);
    if (nightVisitCapacity(windows, n, req.visitHours) >= req.visitsPerNight) qualifying.push(n);
  }
  let longestGap: number | null = null;
  for (let i = 1; i < qualifying.length; i++) longestGap = Math.max(longestGap ?? 0, qualifying[i] - qualifying[i - 1]);

  const clearFactor = 1 - weather;
  const expectedClear = qualifying.length * clearFactor;
  const visitingNightsNeeded = Math.ceil(req.totalVisits / req.visitsPerNight);
  const cadenceNightsNeeded = Math.floor(req.baselineDays / req.cadenceDays + 1e-9) + 1;
  const weatherNote = weather > 0 ? ` (${fmt(expectedClear)} expected clear after ${fmt(weather * 100, 0)} % weather loss)` : '';

  // Best stretch reaching the baseline.
  let best: { first: number; last: number; count: number; gap: number | null } | null = null;
  for (let i = 0; i < qualifying.length; i++) {
    const start = qualifying[i];
    let j = i;
    while (j < qualifying.length && qualifying[j] - start < req.baselineDays - 1e-9) j++;
    if (j >= qualifying.length) break;
    let gap: number | null = null;
    for (let k = i + 1; k <= j; k++) gap = Math.max(gap ?? 0, qualifying[k] - qualifying[k - 1]);
    const candidate = { first: start, last: qualifying[j], count: j - i + 1, gap };
    const better =
      !best ||
      (candidate.gap ?? 0) < (best.gap ?? 0) ||
      ((candidate.gap ?? 0) === (best.gap ?? 0) && candidate.count > best.count);
    if (better) best = candidate;
  }

  const reasons: string[] = [];
  if (qualifying.length === 0) {
    if (maxHours <= 0) {
      reasons.push('the target is never observable from this site during the campaign');
    } else {
      reasons.push(
        `nightly window ${fmt(maxHours, 2)} h at most cannot hold ${plural(req.visitsPerNight, 'visit')} of ${fmt(req.visitHours, 2)} h spaced over the night`,
      );
    }
  } else {
    if (expectedClear < visitingNightsNeeded) {
      reasons.push(
        `the target is observable on only ${plural(qualifying.length, 'night')}${weatherNote} but ${plural(req.totalVisits, 'visit')} at ${req.visitsPerNight} per night need ${visitingNightsNeeded}`,
      );
    }
    if (!best) {
      const span = qualifying[qualifying.length - 1] - qualifying[0];
      reasons.push(`observable span ${plural(span, 'night')} is shorter than the baseline of ${plural(req.baselineDays, 'day')}`);
    } else {
      if (best.gap !== null && best.gap > req.cadenceDays) {
        reasons.push(`longest gap ${plural(best.gap, 'night')} exceeds the cadence of ${plural(req.cadenceDays, 'night')}`);
      }
      const clearInStretch = best.count * clearFactor;
      if (cadenceNightsNeeded > 1 && clearInStretch < cadenceNightsNeeded) {
        const where = best.count === qualifying.length ? '' : ` within the best ${plural(best.last - best.first, 'night')} stretch`;
        const note = weather > 0 ? ` (${fmt(clearInStretch)} expected clear after ${fmt(weather * 100, 0)} % weather loss)` : '';
        reasons.push(`the target is observable on only ${plural(best.count, 'night')}${where}${note} but the cadence needs ${cadenceNightsNeeded}`);
      }
    }
  }

  const fits = reasons.length === 0;
  const gapText = longestGap === null ? 'no gap' : `longest gap ${plural(longestGap, 'night')}`;
  const verdict = `observable on ${qualifying.length} of ${plural(total, 'night')}; ${gapText}; ${
    fits ? 'cadence fits' : `cadence does not fit: ${reasons[0]}`
  }`;

  return {
    fits,
    reasons,
    verdict,
    totalNights: total,
    qualifyingNights: qualifying.length,
    expectedClearNights: expectedClear,
    visitingNightsNeeded,
    cadenceNightsNeeded,
    longestGapNights: longestGap,
    baselineWindow: best
      ? {
          firstNight: windows.nightDates[best.first],
          lastNight: windows.nightDates[best.last],
          qualifyingNights: best.count,
          longestGapNights: best.gap,
        }
      : null,
    maxNightlyUsableHours: maxHours,
  };
}
