/**
 * The night scheduler: one node's visits, night by night, for the awarded targets on it.
 *
 * Inputs are the node's nights (dark time, lost or not) and, per target, its usable intervals on
 * each night (dark, above the node's altitude limit, Moon separation kept: the sky windows give
 * them), its visit length (exposure and overheads), visits per visit night, the nights between
 * visit nights with a tolerance, how many visit nights it needs, its value per visit night (from
 * the standing) and the node time its award allows.
 *
 * Algorithm: a greedy pass over the nights in order, with look-ahead.
 * 1. On each night that is not lost, the targets that may be visited are those with visit nights
 *    still needed, time left in their award, usable time that night, and a last visit night at
 *    least `stepNights − toleranceNights` nights back (or none yet).
 *    A target not yet due (its step not reached) is a candidate only when no night from its due
 *    night to the end of its tolerance can take the visit (the look-ahead): otherwise it waits,
 *    so that cadences keep their step when nothing stands in the way.
 * 2. They are ranked: first those for which this night is the last chance to keep the cadence
 *    (no other usable night before the last visit night + step + tolerance, or already late),
 *    then the others that are due; within a rank, by value per hour of the night (the value of
 *    a visit night over the time its visits take: a knapsack's density order), then by how few
 *    other usable nights they have, then by the earliest end of their usable time (earliest
 *    deadline first).
 * 3. In that order each target's visits of the night are placed in the free time of its usable
 *    intervals, spread over its usable time when it has several visits a night. When they do not
 *    fit, the night is packed again from scratch with the new target: every visit of the night
 *    in order of its deadline, each at its earliest free time (fixed visits stay). A target
 *    whose visits still do not all fit gets none that night.
 * Visits fixed beforehand (done, or kept by a re-plan) stay exactly where they are and count for
 * their target's cadence and award; re-planning from a night plans only that night onwards.
 *
 * Guarantees (property tests in night-scheduler.spec.ts): every visit lies inside one usable
 * interval of its target on its night; visits of a night never overlap, so a night never holds
 * more than its dark time; no visit on a lost night; a target's visit nights are never closer
 * than `stepNights − toleranceNights`; a target never gets more visit nights than it needs nor
 * more time than its award; fixed visits are returned unchanged.
 * What it can miss: it never moves a visit placed on an earlier night to make room later, so a
 * packing that a global optimiser would find (e.g. giving up one visit of a low-value target to
 * keep two high-value cadences) can be missed; a target that cannot keep its cadence is visited
 * at the next usable night instead (the gap is reported, not refused). The benchmark compares
 * its value with an upper bound from a linear relaxation (night-plan-bound.ts).
 */

/** One night of the node, by campaign night index. */
export interface SchedulerNight {
  /** Start and end of darkness, UTC ms; null when it never gets dark. */
  darkStartMs: number | null;
  darkEndMs: number | null;
  /** Marked lost (weather, fault): nothing is planned on it. */
  lost: boolean;
}

/** One awarded target on the node. */
export interface SchedulerTarget {
  id: number;
  /** Value of one visit night (from the standing: higher is more important); > 0. */
  weight: number;
  /** Length of one visit, ms (exposures and overheads). */
  visitMs: number;
  /** Visits in one visit night (≥ 1). */
  visitsPerNight: number;
  /** Nights from one visit night to the next (≥ 1). */
  stepNights: number;
  /** Allowed deviation from the step, nights (0 ≤ tolerance < step). */
  toleranceNights: number;
  /** Visit nights the plan needs over the campaign. */
  visitNights: number;
  /**
   * Usable intervals of night `n` as flat [start, end, start, end, …] pairs in UTC ms, sorted
   * and not overlapping (empty when the target cannot be observed that night).
   */
  intervals(n: number): ArrayLike<number>;
  /** Node time the award allows for all this target's visits, ms (Infinity: no limit). */
  budgetMs: number;
}

/** One visit of a target. */
export interface PlannedVisit {
  targetId: number;
  night: number;
  startMs: number;
  endMs: number;
  /** True for a visit fixed before planning (done, or kept by a re-plan). */
  fixed?: boolean;
}

export interface ScheduleInput {
  nights: readonly SchedulerNight[];
  targets: readonly SchedulerTarget[];
  /** Visits that stay where they are (visits done, and everything before `fromNight`). */
  fixed?: readonly PlannedVisit[];
  /** First night planned (default 0); fixed visits may lie before or after it. */
  fromNight?: number;
  /** Called after each night with the nights done and the total (for a progress bar). */
  onProgress?: (done: number, total: number) => void;
}

/** How one target fared. */
export interface TargetOutcome {
  targetId: number;
  visitNights: number;
  visits: number;
  /** Largest number of nights between two consecutive visit nights; null with fewer than two. */
  largestGapNights: number | null;
  /** Median of the gaps between consecutive visit nights; null with fewer than two. */
  medianGapNights: number | null;
  /** Gaps longer than step + tolerance. */
  gapsOverTolerance: number;
  usedMs: number;
}

export interface ScheduleResult {
  /** Every visit (fixed ones included), by night then start time. */
  visits: PlannedVisit[];
  targets: TargetOutcome[];
  /** Σ weight × visit nights (capped at what each target needs): the value the bound compares with. */
  value: number;
}

/** Validates a target's numbers, throwing a RangeError that names the target and the field. */
function checkTarget(t: SchedulerTarget): void {
  const bad = (field: string, why: string) => new RangeError(`target ${t.id}: ${field} ${why}`);
  if (!(t.weight > 0) || !Number.isFinite(t.weight)) throw bad('weight', 'must be a positive number');
  if (!(t.visitMs > 0) || !Number.isFinite(t.visitMs)) throw bad('visitMs', 'must be a positive number');
  if (!Number.isInteger(t.visitsPerNight) || t.visitsPerNight < 1) throw bad('visitsPerNight', 'must be a whole number ≥ 1');
  if (!Number.isInteger(t.stepNights) || t.stepNights < 1) throw bad('stepNights', 'must be a whole number ≥ 1');
  if (!Number.isInteger(t.toleranceNights) || t.toleranceNights < 0 || t.toleranceNights >= t.stepNights) {
    throw bad('toleranceNights', 'must be a whole number from 0 to stepNights − 1');
  }
  if (!Number.isInteger(t.visitNights) || t.visitNights < 0) throw bad('visitNights', 'must be a whole number ≥ 0');
  if (!(t.budgetMs >= 0)) throw bad('budgetMs', 'must be ≥ 0');
}

/** The busy time of one night: sorted, non-overlapping [start, end) pairs. */
class NightTimeline {
  private readonly starts: number[] = [];
  private readonly ends: number[] = [];

  /** Earliest start ≥ `from` at which `length` fits inside [lo, hi] without touching busy time; NaN if none. */
  earliestFit(from: number, lo: number, hi: number, length: number): number {
    let t = Math.max(from, lo);
    // Busy blocks are few (tens per night): a linear scan is fastest.
    for (let i = 0; i < this.starts.length; i++) {
      if (this.ends[i] <= t) continue;
      if (this.starts[i] >= t + length) break;
      t = this.ends[i];
    }
    return t + length <= hi ? t : NaN;
  }

  add(start: number, end: number): void {
    let i = this.starts.length;
    while (i > 0 && this.starts[i - 1] > start) i--;
    this.starts.splice(i, 0, start);
    this.ends.splice(i, 0, end);
  }

  remove(start: number): void {
    const i = this.starts.indexOf(start);
    if (i >= 0) {
      this.starts.splice(i, 1);
      this.ends.splice(i, 1);
    }
  }
}

/** Per-target state during the pass. */
interface TargetState {
  t: SchedulerTarget;
  nights: number[];
  visits: number;
  usedMs: number;
  /**
   * usable[m + 1] − usable[a] = nights in a…m (from the first planned night) that are not lost,
   * have dark time and can take the target's visits on their own: the look-ahead, computed once.
   */
  usable?: Int32Array;
}

/**
 * Places the visits of one target on one night in `timeline`, spread over its usable time;
 * returns them, or null (and the timeline unchanged) when they do not all fit.
 */
function placeNight(timeline: NightTimeline, t: SchedulerTarget, n: number, iv: ArrayLike<number>): PlannedVisit[] | null {
  const first = iv[0];
  const last = iv[iv.length - 1];
  const span = last - first;
  const k = t.visitsPerNight;
  const placed: PlannedVisit[] = [];
  let from = first;
  for (let j = 0; j < k; j++) {
    // Spread: visit j aims at the start of its share of the usable span, never before the previous visit ends.
    const aim = Math.max(from, first + (j * span) / k);
    let start = NaN;
    for (const origin of aim === from ? [from] : [aim, from]) {
      for (let q = 0; q + 1 < iv.length && Number.isNaN(start); q += 2) {
        if (iv[q + 1] <= origin) continue;
        start = timeline.earliestFit(origin, iv[q], iv[q + 1], t.visitMs);
      }
      if (!Number.isNaN(start)) break;
    }
    if (Number.isNaN(start)) {
      for (const v of placed) timeline.remove(v.startMs);
      return null;
    }
    const visit = { targetId: t.id, night: n, startMs: start, endMs: start + t.visitMs };
    timeline.add(visit.startMs, visit.endMs);
    placed.push(visit);
    from = visit.endMs;
  }
  return placed;
}

/**
 * Packs a night again from scratch: the fixed visits stay; every visit of the given targets is
 * placed in order of its deadline (the latest start its usable intervals allow), each at the
 * earliest free time in its intervals (Jackson's earliest-deadline rule, with release times a
 * heuristic). Returns the new placement, or null when some visit does not fit.
 */
function repackNight(
  fixed: readonly PlannedVisit[],
  entries: readonly { s: TargetState; iv: ArrayLike<number>; placed: PlannedVisit[] }[],
  n: number,
): { entries: { s: TargetState; iv: ArrayLike<number>; placed: PlannedVisit[] }[]; timeline: NightTimeline } | null {
  const timeline = new NightTimeline();
  for (const v of fixed) timeline.add(v.startMs, v.endMs);
  const jobs: { e: number; deadline: number }[] = [];
  entries.forEach((entry, e) => {
    const deadline = entry.iv[entry.iv.length - 1] - entry.s.t.visitMs;
    for (let j = 0; j < entry.s.t.visitsPerNight; j++) jobs.push({ e, deadline });
  });
  jobs.sort((a, b) => a.deadline - b.deadline || a.e - b.e);
  const placed: PlannedVisit[][] = entries.map(() => []);
  for (const job of jobs) {
    const { s, iv } = entries[job.e];
    let start = NaN;
    for (let q = 0; q + 1 < iv.length && Number.isNaN(start); q += 2) start = timeline.earliestFit(iv[q], iv[q], iv[q + 1], s.t.visitMs);
    if (Number.isNaN(start)) return null;
    timeline.add(start, start + s.t.visitMs);
    placed[job.e].push({ targetId: s.t.id, night: n, startMs: start, endMs: start + s.t.visitMs });
  }
  return { entries: entries.map((entry, e) => ({ ...entry, placed: placed[e].sort((a, b) => a.startMs - b.startMs) })), timeline };
}

/** Whether the target's visits of a night fit its usable intervals `iv` with nothing else planned that night. */
export function fitsOnEmptyNight(t: SchedulerTarget, n: number, iv: ArrayLike<number>): boolean {
  if (iv.length < 2) return false;
  let room = 0;
  for (let k = 0; k + 1 < iv.length; k += 2) room += Math.floor((iv[k + 1] - iv[k]) / t.visitMs + 1e-9);
  return room >= t.visitsPerNight && placeNight(new NightTimeline(), t, n, iv) !== null;
}

function outcomeOf(s: TargetState): TargetOutcome {
  const nights = [...s.nights].sort((a, b) => a - b);
  const gaps = nights.slice(1).map((n, i) => n - nights[i]);
  const sorted = [...gaps].sort((a, b) => a - b);
  const median =
    sorted.length === 0
      ? null
      : sorted.length % 2
        ? sorted[(sorted.length - 1) / 2]
        : (sorted[sorted.length / 2 - 1] + sorted[sorted.length / 2]) / 2;
  return {
    targetId: s.t.id,
    visitNights: nights.length,
    visits: s.visits,
    largestGapNights: gaps.length ? Math.max(...gaps) : null,
    medianGapNights: median,
    gapsOverTolerance: gaps.filter((g) => g > s.t.stepNights + s.t.toleranceNights).length,
    usedMs: s.usedMs,
  };
}

/** Plans the node's nights (see the file comment for the algorithm and its guarantees). */
export function scheduleNights(input: ScheduleInput): ScheduleResult {
  const { nights, targets } = input;
  const fromNight = Math.max(0, input.fromNight ?? 0);
  for (const t of targets) checkTarget(t);
  const states = new Map<number, TargetState>();
  for (const t of targets) {
    if (states.has(t.id)) throw new RangeError(`target ${t.id} is listed twice`);
    states.set(t.id, { t, nights: [], visits: 0, usedMs: 0 });
  }

  // Fixed visits: counted for cadence, award time and visit nights; kept on their nights' timelines.
  const visits: PlannedVisit[] = [];
  const fixedByNight = new Map<number, PlannedVisit[]>();
  for (const v of input.fixed ?? []) {
    const s = states.get(v.targetId);
    const kept = { ...v, fixed: true };
    visits.push(kept);
    const list = fixedByNight.get(v.night) ?? [];
    list.push(kept);
    fixedByNight.set(v.night, list);
    if (!s) continue;
    if (!s.nights.includes(v.night)) s.nights.push(v.night);
    s.visits++;
    s.usedMs += v.endMs - v.startMs;
  }
  const lastNight = (s: TargetState, before: number): number | undefined => {
    let last: number | undefined;
    for (const n of s.nights) if (n < before && (last === undefined || n > last)) last = n;
    return last;
  };
  const nextFixed = (s: TargetState, after: number): number | undefined => {
    let next: number | undefined;
    for (const n of s.nights) if (n > after && (next === undefined || n < next)) next = n;
    return next;
  };
  const usableNights = (s: TargetState): Int32Array => {
    if (s.usable) return s.usable;
    const prefix = new Int32Array(nights.length + 1);
    for (let m = 0; m < nights.length; m++) {
      const night = nights[m];
      const ok = m >= fromNight && !night.lost && night.darkStartMs !== null && fitsOnEmptyNight(s.t, m, s.t.intervals(m));
      prefix[m + 1] = prefix[m] + (ok ? 1 : 0);
    }
    s.usable = prefix;
    return prefix;
  };
  const total = nights.length - fromNight;
  let done = 0;

  for (let n = fromNight; n < nights.length; n++) {
    const night = nights[n];
    if (night.lost || night.darkStartMs === null || night.darkEndMs === null) {
      input.onProgress?.(++done, total);
      continue;
    }
    let timeline = new NightTimeline();
    for (const v of fixedByNight.get(n) ?? []) timeline.add(v.startMs, v.endMs);

    const candidates: { s: TargetState; iv: ArrayLike<number>; tier: number; alternatives: number; end: number; density: number }[] = [];
    for (const s of states.values()) {
      const t = s.t;
      if (s.nights.length >= t.visitNights || s.nights.includes(n)) continue;
      const nightMs = t.visitMs * t.visitsPerNight;
      if (s.usedMs + nightMs > t.budgetMs + 1e-6) continue;
      const usable = usableNights(s);
      if (usable[n + 1] === usable[n]) continue;
      const iv = t.intervals(n);
      const last = lastNight(s, n);
      if (last !== undefined && n - last < t.stepNights - t.toleranceNights) continue;
      // A fixed visit night ahead (a done visit after a re-plan start) must not come too close either.
      const next = nextFixed(s, n);
      if (next !== undefined && next - n < t.stepNights - t.toleranceNights) continue;
      const due = last === undefined ? n : last + t.stepNights;
      // A target not started yet looks one step ahead: a start on any of those nights keeps its cadence.
      const latest = last === undefined ? n + t.stepNights - 1 : last + t.stepNights + t.toleranceNights;
      // Usable nights for this target from `a` to `b` after tonight (the look-ahead).
      const usableBetween = (a: number, b: number) => {
        const lo = Math.max(a, n + 1);
        const hi = Math.min(b, nights.length - 1);
        return hi < lo ? 0 : usable[hi + 1] - usable[lo];
      };
      let tier: number;
      let alternatives: number;
      if (n < due) {
        // Early: only when no night from the due night to the tolerance's end can take the visit.
        if (usableBetween(due, latest) > 0) continue;
        tier = 0;
        alternatives = 0;
      } else {
        alternatives = n >= latest ? 0 : usableBetween(n + 1, latest);
        tier = alternatives === 0 ? 0 : 1;
      }
      candidates.push({ s, iv, tier, alternatives, end: iv[iv.length - 1], density: t.weight / nightMs });
    }
    candidates.sort(
      (a, b) => a.tier - b.tier || b.density - a.density || a.alternatives - b.alternatives || a.end - b.end || a.s.t.id - b.s.t.id,
    );
    let tonight: { s: TargetState; iv: ArrayLike<number>; placed: PlannedVisit[] }[] = [];
    const fixedTonight = fixedByNight.get(n) ?? [];
    for (const c of candidates) {
      let placed = placeNight(timeline, c.s.t, n, c.iv);
      if (placed) {
        tonight.push({ s: c.s, iv: c.iv, placed });
      } else {
        // The night as placed has no room: try all of tonight's visits again, packed by deadline.
        const repacked = repackNight(fixedTonight, [...tonight, { s: c.s, iv: c.iv, placed: [] }], n);
        if (!repacked) continue;
        tonight = repacked.entries;
        timeline = repacked.timeline;
        placed = tonight[tonight.length - 1].placed;
      }
      c.s.nights.push(n);
      c.s.visits += placed.length;
      c.s.usedMs += placed.length * c.s.t.visitMs;
    }
    for (const e of tonight) visits.push(...e.placed);
    input.onProgress?.(++done, total);
  }

  visits.sort((a, b) => a.night - b.night || a.startMs - b.startMs);
  const outcomes = [...states.values()].map(outcomeOf);
  let value = 0;
  for (const o of outcomes) value += states.get(o.targetId)!.t.weight * Math.min(o.visitNights, states.get(o.targetId)!.t.visitNights);
  return { visits, targets: outcomes, value };
}
