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
 * - Cadence over the baseline: the visits need a stretch of the campaign that spans at least
 *   `baselineDays`, in which no gap between qualifying nights exceeds `cadenceDays`, and whose
 *   expected clear qualifying nights reach the nights the plan asks for: the larger of
 *   floor(baselineDays / cadenceDays) + 1 (the cadence) and the visiting nights. Weather makes
 *   some planned nights fail, so the stretch may be longer than the baseline: the shortest
 *   such stretch is chosen and, when it is longer, the assessment says by how much
 *   (`stretchDays`). A longer baseline only adds cycles, which the period search tolerates.
 */
import { countText } from '../science/explained';
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
  /** One line, e.g. `112 of 180 nights can hold the 2 visits; longest gap 9 nights; cadence fits`. */
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
  /** Nights from the first to the last night of the chosen stretch (≥ the baseline), or null. */
  stretchDays: number | null;
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
/** Counts as every plan sentence writes them (grouped from 10 000: "12,932 visits"). */
const count = countText;
const plural = (n: number, word: string): string => `${count(n)} ${word}${n === 1 ? '' : 's'}`;
/** "the visit" or "the 3 visits" of one night. */
const visitsWord = (k: number): string => (k === 1 ? 'the visit' : `the ${k} visits`);

/**
 * Checks a requirement against one target's windows after weather loss.
 *
 * @param weatherLossFraction fraction of night time lost to weather, 0 ≤ f < 1 (a node's
 *   `weatherLossFraction`).
 * @throws SkyInputError for an invalid requirement or weather fraction.
 */
export function assessCadence(windows: TargetWindows, requirement: CadenceRequirement, weatherLossFraction: number): CadenceAssessment {
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
  // Nights without a qualifying night between two qualifying ones (0 = consecutive nights).
  for (let i = 1; i < qualifying.length; i++) longestGap = Math.max(longestGap ?? 0, qualifying[i] - qualifying[i - 1] - 1);

  const clearFactor = 1 - weather;
  const expectedClear = qualifying.length * clearFactor;
  const visitingNightsNeeded = Math.ceil(req.totalVisits / req.visitsPerNight);
  const cadenceNightsNeeded = Math.floor(req.baselineDays / req.cadenceDays + 1e-9) + 1;
  const weatherNote = weather > 0 ? ` (${fmt(expectedClear)} expected clear after ${fmt(weather * 100, 0)} % weather loss)` : '';

  const neededInStretch = Math.max(cadenceNightsNeeded, visitingNightsNeeded);
  const spansBaseline = (first: number, last: number) => qualifying[last] - qualifying[first] >= req.baselineDays - 1e-9;

  // Runs of qualifying nights whose gaps stay within the cadence.
  const runs: { from: number; to: number }[] = [];
  for (let i = 0; i < qualifying.length; i++) {
    if (i === 0 || qualifying[i] - qualifying[i - 1] > req.cadenceDays) runs.push({ from: i, to: i });
    else runs[runs.length - 1].to = i;
  }
  const gapWithin = (first: number, last: number): number | null => {
    let gap: number | null = null;
    for (let k = first + 1; k <= last; k++) gap = Math.max(gap ?? 0, qualifying[k] - qualifying[k - 1]);
    return gap;
  };

  // The shortest stretch inside one run that spans the baseline and holds enough clear nights.
  let best: { first: number; last: number } | null = null;
  for (const run of runs) {
    let j = run.from;
    for (let i = run.from; i <= run.to; i++) {
      if (j < i) j = i;
      while (j <= run.to && !(spansBaseline(i, j) && (j - i + 1) * clearFactor >= neededInStretch - 1e-9)) j++;
      if (j > run.to) break;
      if (!best || qualifying[j] - qualifying[i] < qualifying[best.last] - qualifying[best.first]) best = { first: i, last: j };
    }
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
  } else if (!best) {
    if (expectedClear < visitingNightsNeeded) {
      reasons.push(
        `only ${plural(qualifying.length, 'night')} can hold ${visitsWord(req.visitsPerNight)}${weatherNote}, but ${count(req.totalVisits)} visits at ${req.visitsPerNight} a night need ${plural(visitingNightsNeeded, 'night')}`,
      );
    }
    const longRuns = runs.filter((r) => spansBaseline(r.from, r.to));
    if (longRuns.length > 0) {
      // Long enough and without gaps, but too few clear nights in it.
      const run = longRuns.reduce((a, b) => (b.to - b.from > a.to - a.from ? b : a));
      const inRun = run.to - run.from + 1;
      const where =
        inRun === qualifying.length
          ? ''
          : ` in its best stretch (${windows.nightDates[qualifying[run.from]]} to ${windows.nightDates[qualifying[run.to]]})`;
      const note = weather > 0 ? ` (${fmt(inRun * clearFactor)} expected clear after ${fmt(weather * 100, 0)} % weather loss)` : '';
      const line = `only ${plural(inRun, 'night')}${where} can hold ${visitsWord(req.visitsPerNight)}${note}, but the cadence needs ${plural(neededInStretch, 'night')}`;
      if (!reasons.includes(line)) reasons.push(line);
    } else if (spansBaseline(0, qualifying.length - 1)) {
      // The campaign spans the baseline only across a gap longer than the cadence.
      let smallest: number | null = null;
      for (let i = 0, j = 0; i < qualifying.length; i++) {
        while (j < qualifying.length && !spansBaseline(i, j)) j++;
        if (j >= qualifying.length) break;
        const gap = gapWithin(i, j) ?? 0;
        smallest = smallest === null ? gap : Math.min(smallest, gap);
      }
      // `smallest` is nights from one qualifying night to the next; the cadence allows up to cadenceDays.
      reasons.push(
        `a gap of ${plural(Math.max(0, (smallest ?? 0) - 1), 'night')} without the target is longer than the cadence allows (a visit night at least every ${plural(req.cadenceDays, 'night')})`,
      );
    } else {
      const span = qualifying[qualifying.length - 1] - qualifying[0];
      reasons.push(
        `the nights that can hold ${visitsWord(req.visitsPerNight)} span only ${plural(span, 'day')}, less than the baseline of ${plural(req.baselineDays, 'day')}`,
      );
    }
  }
  const stretchDays = best ? qualifying[best.last] - qualifying[best.first] : null;

  const fits = reasons.length === 0;
  const gapText = longestGap === null ? '' : longestGap === 0 ? '; no gap' : `; longest gap ${plural(longestGap, 'night')}`;
  const stretched = stretchDays !== null && stretchDays > req.baselineDays + 1e-9;
  const nightsText =
    qualifying.length === 0
      ? `no night of ${total} can hold ${visitsWord(req.visitsPerNight)}`
      : `${count(qualifying.length)} of ${plural(total, 'night')} can hold ${visitsWord(req.visitsPerNight)}`;
  const verdict = `${nightsText}${gapText}; ${
    fits
      ? stretched
        ? `cadence fits over ${plural(stretchDays, 'day')} to absorb the weather`
        : 'cadence fits'
      : `cadence does not fit: ${reasons[0]}`
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
          firstNight: windows.nightDates[qualifying[best.first]],
          lastNight: windows.nightDates[qualifying[best.last]],
          qualifyingNights: best.last - best.first + 1,
          longestGapNights: best.last > best.first ? (gapWithin(best.first, best.last) ?? 1) - 1 : null,
        }
      : null,
    stretchDays,
    maxNightlyUsableHours: maxHours,
  };
}
