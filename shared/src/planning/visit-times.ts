/**
 * Visit times of a campaign on one site, as a robotic scheduler would place them: the input
 * of campaign simulations (injection–recovery) and of phase-coverage checks (phase-coverage.ts).
 *
 * Policy (Spincycle's choice; a simulation of the plan, not the night scheduler itself):
 * - A night can take visits when its usable intervals hold at least one whole visit
 *   (`nightVisitCapacity` ≥ 1; Moon-excluded nights hold none) and `clearNight(n)` is true.
 * - The first visit night is the first such night at or after `startNightIndex`. Visit nights
 *   then follow a fixed grid: night `first + round(j · nightStepDays)`, j = 0, 1, 2…; a grid
 *   night that cannot take visits (no room, Moon, clouds) is skipped without a make-up night,
 *   so the mean interval between visit nights stays the requested step. The grid stops after
 *   `baselineDays` from the first visit night.
 * - On a visit night the visits (at most what the night holds back to back) are shared among
 *   its usable intervals in proportion to their length (largest remainder), and spread evenly
 *   inside each interval: with n visits of length d in an interval of length L, the free time
 *   L − n·d is split into n equal gaps, half a gap before the first visit and after the last.
 *   With one interval this puts visit k at the fraction (k + ½)/n of the usable time.
 * - A visit's time is its middle.
 *
 * Times are days since an epoch, by default 0h UTC of the windows' first night date
 * (`nightDates[0]`): that instant does not depend on the site, so visit times of two sites with
 * the same campaign share the epoch and can be merged directly.
 */
import { nightVisitCapacity } from '../sky/cadence-assessment';
import { SkyInputError, requireFiniteInRange } from '../sky/sky-input-error';
import { MS_PER_DAY, MS_PER_HOUR } from '../sky/local-nights';
import { MAX_INTERVALS_PER_NIGHT, type TargetWindows } from '../sky/sky-types';

/** What a campaign asks of one site. */
export interface VisitRequest {
  /** First night (index into the windows' nights) on which a visit may be placed; default 0. */
  startNightIndex?: number;
  /** Time from the first visit night to the last, days (nights after it get no visits). */
  baselineDays: number;
  /** Visits on each visit night (whole, ≥ 1). */
  visitsPerNight: number;
  /** Interval between visit nights, days (1 = every night; may be fractional, see file comment). */
  nightStepDays: number;
  /** Length of one visit (exposures + overheads), hours. */
  visitHours: number;
}

export interface VisitTimeOptions {
  /** Weather: false when night `nightIndex` is clouded out; default every night is clear. */
  clearNight?: (nightIndex: number) => boolean;
  /** Epoch of the returned times, UTC ms; default 0h UTC of `nightDates[0]`. */
  epochUtcMs?: number;
}

/** The simulated visits. */
export interface VisitPlan {
  /** Visit middles, days since `epochUtcMs`, increasing. */
  timesDays: Float64Array;
  /** Night index of each visit (same order as `timesDays`). */
  nightIndexByVisit: Int32Array;
  /** Epoch of `timesDays`, UTC ms. */
  epochUtcMs: number;
  /** First visit night, or null when no night can take a visit. */
  firstVisitNightIndex: number | null;
  /** Nights that received at least one visit. */
  visitNights: number;
}

/** 0h UTC of the windows' first night date, UTC ms (the default epoch). */
export function defaultVisitEpochUtcMs(windows: TargetWindows): number {
  const first = windows.nightDates[0];
  return first === undefined ? 0 : Date.parse(`${first}T00:00:00Z`);
}

/** Validates a visit request; errors name `request.<field>`. */
export function validateVisitRequest(req: VisitRequest, nightCount: number): Required<VisitRequest> {
  const start = req.startNightIndex ?? 0;
  if (!Number.isInteger(start) || start < 0) {
    throw new SkyInputError('request.startNightIndex', `must be a whole number ≥ 0, got ${start}`);
  }
  const visitsPerNight = requireFiniteInRange(req.visitsPerNight, 'request.visitsPerNight', 1, 1000);
  if (!Number.isInteger(visitsPerNight)) {
    throw new SkyInputError('request.visitsPerNight', `must be a whole number, got ${visitsPerNight}`);
  }
  return {
    startNightIndex: Math.min(start, nightCount),
    baselineDays: requireFiniteInRange(req.baselineDays, 'request.baselineDays', 0, 100_000),
    visitsPerNight,
    nightStepDays: requireFiniteInRange(req.nightStepDays, 'request.nightStepDays', 1e-6, 100_000),
    visitHours: requireFiniteInRange(req.visitHours, 'request.visitHours', 1e-6, 24),
  };
}

/** True when night `n` can take at least one visit of `visitHours` and is clear. */
export function canVisitNight(windows: TargetWindows, n: number, visitHours: number, clearNight?: (n: number) => boolean): boolean {
  return nightVisitCapacity(windows, n, visitHours) >= 1 && (clearNight === undefined || clearNight(n));
}

/**
 * Writes the visit middles of night `n` (UTC ms) into `out` from `offset`; returns how many.
 * See the file comment for the placement rule. `out` needs room for `visits` values.
 */
export function placeNightVisits(
  windows: TargetWindows,
  n: number,
  visits: number,
  visitHours: number,
  out: Float64Array,
  offset: number,
): number {
  const count = windows.intervalCountByNight[n];
  const base = n * MAX_INTERVALS_PER_NIGHT * 2;
  const d = visitHours * MS_PER_HOUR;
  const lengths = [0, 0, 0];
  const capacities = [0, 0, 0];
  const shares = [0, 0, 0];
  let totalLength = 0;
  let totalCapacity = 0;
  for (let k = 0; k < count; k++) {
    const length = windows.intervalsUtcMs[base + 2 * k + 1] - windows.intervalsUtcMs[base + 2 * k];
    // 1e-9 as in nightVisitCapacity: an interval of exactly k visits holds k.
    capacities[k] = Math.floor(length / d + 1e-9);
    if (capacities[k] > 0) {
      lengths[k] = length;
      totalLength += length;
      totalCapacity += capacities[k];
    }
  }
  const wanted = Math.min(visits, totalCapacity);
  if (wanted === 0) return 0;
  // Proportional shares, capped by capacity, then the remainder by largest shortfall.
  let assigned = 0;
  for (let k = 0; k < count; k++) {
    shares[k] = Math.min(capacities[k], Math.floor((wanted * lengths[k]) / totalLength));
    assigned += shares[k];
  }
  while (assigned < wanted) {
    let best = -1;
    let bestShortfall = -Infinity;
    for (let k = 0; k < count; k++) {
      if (shares[k] >= capacities[k]) continue;
      const shortfall = (wanted * lengths[k]) / totalLength - shares[k];
      if (shortfall > bestShortfall) {
        bestShortfall = shortfall;
        best = k;
      }
    }
    shares[best]++;
    assigned++;
  }
  let written = 0;
  for (let k = 0; k < count; k++) {
    const m = shares[k];
    if (m === 0) continue;
    const start = windows.intervalsUtcMs[base + 2 * k];
    const gap = Math.max(0, lengths[k] - m * d) / m;
    for (let j = 0; j < m; j++) out[offset + written++] = start + j * d + (j + 0.5) * gap + d / 2;
  }
  return written;
}

/**
 * Simulates the visits of a campaign on one site from a target's windows (see the file
 * comment for the policy). Cost: O(nights + visits), no allocation per night.
 *
 * @throws SkyInputError for an invalid request.
 */
export function planVisitTimes(windows: TargetWindows, req: VisitRequest, opts: VisitTimeOptions = {}): VisitPlan {
  const nightCount = windows.usableHoursByNight.length;
  const r = validateVisitRequest(req, nightCount);
  const epochUtcMs = opts.epochUtcMs ?? defaultVisitEpochUtcMs(windows);
  let first = -1;
  for (let n = r.startNightIndex; n < nightCount; n++) {
    if (canVisitNight(windows, n, r.visitHours, opts.clearNight)) {
      first = n;
      break;
    }
  }
  if (first < 0) {
    return { timesDays: new Float64Array(0), nightIndexByVisit: new Int32Array(0), epochUtcMs, firstVisitNightIndex: null, visitNights: 0 };
  }
  const lastAllowed = Math.min(nightCount - 1, first + Math.floor(r.baselineDays + 1e-9));
  // At most one visit night per night of the span.
  const capacity = (lastAllowed - first + 1) * r.visitsPerNight;
  const utc = new Float64Array(capacity);
  const nights = new Int32Array(capacity);
  let total = 0;
  let visitNights = 0;
  let previous = -1;
  for (let j = 0; ; j++) {
    const n = first + Math.round(j * r.nightStepDays);
    if (n > lastAllowed) break;
    // A step under one night would round onto the same night twice: one visit night per night.
    if (n === previous) continue;
    previous = n;
    if (j > 0 && !canVisitNight(windows, n, r.visitHours, opts.clearNight)) continue;
    const placed = placeNightVisits(windows, n, r.visitsPerNight, r.visitHours, utc, total);
    if (placed > 0) visitNights++;
    nights.fill(n, total, total + placed);
    total += placed;
  }
  const timesDays = new Float64Array(total);
  for (let i = 0; i < total; i++) timesDays[i] = (utc[i] - epochUtcMs) / MS_PER_DAY;
  return { timesDays, nightIndexByVisit: nights.slice(0, total), epochUtcMs, firstVisitNightIndex: first, visitNights };
}
