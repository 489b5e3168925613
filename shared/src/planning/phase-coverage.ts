/**
 * Phase coverage: do a campaign's visit times sample every phase of the plausible rotation
 * periods? A single site observes a target at nearly the same time every night, so a period
 * close to 1 d, ½ d or ⅓ d is seen at nearly the same phase night after night; its phase
 * drifts by one cycle only once per beat period 1/|1/P − n| (common practice, no source).
 * Nodes at other longitudes observe at other times of the day and break that lock.
 *
 * Policy (Spincycle's choice):
 * - Coverage is the fraction of equal phase bins (default 10) holding at least one visit;
 *   a period is a problem below 0.8 of the bins (`DEFAULT_PHASE_COVERAGE_THRESHOLD`).
 * - The plausible range is scanned at `DEFAULT_PERIOD_SCAN_COUNT` log-spaced periods plus the
 *   day-locked ones inside it: 1/n solar days and 1/n sidereal days, n = 1, 2, 3.
 * - Visits come from `planVisitTimes` (visit-times.ts) on the node's windows. To see whether a
 *   longer baseline helps, the visits are simulated once up to the end of the windows'
 *   campaign; the baseline that first reaches the threshold at every scanned period is the
 *   required baseline.
 */
import { fmt } from '../science/explained';
import { SkyInputError, requireFiniteInRange } from '../sky/sky-input-error';
import type { TargetWindows } from '../sky/sky-types';
import { planVisitTimes, validateVisitRequest, type VisitRequest, type VisitTimeOptions } from './visit-times';

/** Phase bins per period (Spincycle's choice). */
export const DEFAULT_PHASE_BINS = 10;
/** Fraction of phase bins that must hold a visit (Spincycle's choice: 8 of 10 bins). */
export const DEFAULT_PHASE_COVERAGE_THRESHOLD = 0.8;
/** Log-spaced periods scanned across the plausible range (Spincycle's choice). */
export const DEFAULT_PERIOD_SCAN_COUNT = 40;
/** Harmonics of the day checked for commensurability: periods near 1, ½ and ⅓ d. */
export const DAY_HARMONICS = [1, 2, 3] as const;
/**
 * Sidereal days per solar day, 1.00273790935 (IAU 1982 definition of GMST as given in the
 * Explanatory Supplement to the Astronomical Almanac 1992, ch. 2) [from memory].
 */
export const SIDEREAL_PER_SOLAR_DAY = 1.00273790935;

/** A period close to a harmonic of the day (see `commensurateHarmonic`). */
export interface CommensurateHarmonic {
  /** Harmonic: the period is near 1/n days. */
  n: number;
  /** 1/|1/P − n|, days: the time over which the phase at a fixed time of night drifts by one cycle; Infinity at exactly 1/n d. */
  beatPeriodDays: number;
}

let scratchBins = new Uint8Array(64);

function binsScratch(bins: number): Uint8Array {
  if (scratchBins.length < bins) scratchBins = new Uint8Array(bins);
  scratchBins.fill(0, 0, bins);
  return scratchBins;
}

function requireBins(bins: number): number {
  if (!Number.isInteger(bins) || bins < 1 || bins > 10_000)
    throw new SkyInputError('bins', `must be a whole number between 1 and 10,000, got ${bins}`);
  return bins;
}

/** Phase bin of time `t` for period `p` (0…bins − 1). */
function phaseBin(t: number, p: number, bins: number): number {
  const x = t / p;
  const b = Math.floor((x - Math.floor(x)) * bins);
  return b >= bins ? bins - 1 : b;
}

/**
 * Fraction of `bins` equal phase bins of `periodDays` that hold at least one of `timesDays`.
 * 0 with no times. Cost O(N) with an early exit once every bin is filled.
 */
export function phaseCoverage(timesDays: ArrayLike<number>, periodDays: number, bins = DEFAULT_PHASE_BINS): number {
  requireFiniteInRange(periodDays, 'periodDays', 1e-9, 1e9);
  requireBins(bins);
  const seen = binsScratch(bins);
  let covered = 0;
  for (let i = 0; i < timesDays.length && covered < bins; i++) {
    const b = phaseBin(timesDays[i], periodDays, bins);
    if (seen[b] === 0) {
      seen[b] = 1;
      covered++;
    }
  }
  return covered / bins;
}

/**
 * Whether `periodDays` is commensurate with the day over a baseline of `baselineDays`:
 * |1/P − n| < 1/T for n = 1, 2 or 3, i.e. over the baseline the phase seen at a fixed time of
 * night drifts by less than one cycle (common practice, no source). Returns the nearest such
 * harmonic and its beat period 1/|1/P − n|, or null. The band covers the sidereal day as well
 * (1/P − n = 0.0027·n d⁻¹) for baselines under a year.
 */
export function commensurateHarmonic(periodDays: number, baselineDays: number): CommensurateHarmonic | null {
  requireFiniteInRange(periodDays, 'periodDays', 1e-9, 1e9);
  requireFiniteInRange(baselineDays, 'baselineDays', 0, 1e9);
  if (baselineDays <= 0) return null;
  const f = 1 / periodDays;
  let best: CommensurateHarmonic | null = null;
  let bestOffset = Infinity;
  for (const n of DAY_HARMONICS) {
    const offset = Math.abs(f - n);
    if (offset < 1 / baselineDays && offset < bestOffset) {
      bestOffset = offset;
      best = { n, beatPeriodDays: offset === 0 ? Infinity : 1 / offset };
    }
  }
  return best;
}

export interface PhaseCoverageOptions extends VisitTimeOptions {
  /** Phase bins; default `DEFAULT_PHASE_BINS`. */
  bins?: number;
  /** Coverage below this is a problem; default `DEFAULT_PHASE_COVERAGE_THRESHOLD`. */
  threshold?: number;
  /** Log-spaced periods scanned; default `DEFAULT_PERIOD_SCAN_COUNT`. */
  periodCount?: number;
}

/**
 * What to do about the phase coverage:
 * - `ok`: every scanned period reaches the threshold within the baseline;
 * - `lengthenBaseline`: a longer baseline (`requiredBaselineDays`) reaches it;
 * - `otherLongitude`: a period commensurate with the day stays below the threshold even over
 *   the whole campaign: nodes at other longitudes are needed (also when the site cannot visit
 *   the target at all);
 * - `changeSampling`: a period not tied to the day stays below the threshold over the whole
 *   campaign although the campaign is long enough: the night step or the visits per night
 *   lock onto it (e.g. visits every 7 nights for a 7-d period).
 */
export type PhaseCoverageAction = 'ok' | 'lengthenBaseline' | 'otherLongitude' | 'changeSampling';

/** The answer of `assessPhaseCoverage`. */
export interface PhaseCoverageAssessment {
  /** Lowest coverage over the scanned periods with the requested baseline, 0–1. */
  minCoverage: number;
  /** The period with the lowest coverage; for `otherLongitude`, the day-locked period that forces it. */
  worstPeriodDays: number;
  /** Commensurability of `worstPeriodDays` over the requested baseline. */
  commensurate: CommensurateHarmonic | null;
  action: PhaseCoverageAction;
  /**
   * For `lengthenBaseline`: days from the first visit night at which every scanned period
   * reaches the threshold (within the campaign), or an estimate (threshold × P of the longest
   * such period) when the periods are too long for the campaign. Null otherwise.
   */
  requiredBaselineDays: number | null;
  /** Plain-language explanation when the action is not `ok`. */
  reason: string | null;
  /** Number of periods scanned (see `scanPeriods`). */
  periodsScanned: number;
  /** Visits within the requested baseline. */
  visits: number;
}

/** Log-spaced periods across the range plus the day-locked periods inside it, increasing. */
export function scanPeriods(low: number, high: number, count = DEFAULT_PERIOD_SCAN_COUNT): number[] {
  const out: number[] = [];
  if (high <= low || count < 2) out.push(low);
  else for (let i = 0; i < count; i++) out.push(low * Math.pow(high / low, i / (count - 1)));
  for (const n of DAY_HARMONICS) {
    for (const p of [1 / n, 1 / (n * SIDEREAL_PER_SOLAR_DAY)]) if (p >= low && p <= high) out.push(p);
  }
  return out.sort((a, b) => a - b);
}

const fmtPeriod = (p: number): string => String(Number(p.toPrecision(4)));
const fmtPercent = (x: number): string => `${Math.round(x * 100)} %`;
const fmtDays = (d: number): string => `${Math.round(d)} d`;

/**
 * Scans the plausible period range for phase coverage of the visits a single site would
 * make (see the file comment) and says what would fix a gap. Cost: one visit simulation over
 * the campaign and O(periods × visits) arithmetic, no astronomy; measured ≈ 0.1 ms per call for
 * 90 nights × 1 visit per night and ≈ 0.8 ms for 365 nights × 4 visits per night, 40–46 periods.
 *
 * @throws SkyInputError for an invalid request, range or option.
 */
export function assessPhaseCoverage(
  windows: TargetWindows,
  req: VisitRequest,
  periodRange: { low: number; high: number },
  opts: PhaseCoverageOptions = {},
): PhaseCoverageAssessment {
  const nightCount = windows.usableHoursByNight.length;
  const r = validateVisitRequest(req, nightCount);
  const low = requireFiniteInRange(periodRange.low, 'periodRange.low', 1e-3, 1e6);
  const high = requireFiniteInRange(periodRange.high, 'periodRange.high', low, 1e6);
  const bins = requireBins(opts.bins ?? DEFAULT_PHASE_BINS);
  const threshold = requireFiniteInRange(opts.threshold ?? DEFAULT_PHASE_COVERAGE_THRESHOLD, 'threshold', 0, 1);
  const periodCount = requireFiniteInRange(opts.periodCount ?? DEFAULT_PERIOD_SCAN_COUNT, 'periodCount', 1, 10_000);
  const requiredBins = Math.ceil(threshold * bins - 1e-9);
  const periods = scanPeriods(low, high, Math.round(periodCount));

  // One simulation to the end of the campaign; the requested baseline is a prefix of it.
  const plan = planVisitTimes(windows, { ...r, baselineDays: Math.max(r.baselineDays, nightCount) }, opts);
  const first = plan.firstVisitNightIndex;
  const times = plan.timesDays;
  const nightOf = plan.nightIndexByVisit;
  const visitCount = times.length;
  if (first === null) {
    return {
      minCoverage: 0,
      worstPeriodDays: periods[0],
      commensurate: commensurateHarmonic(periods[0], r.baselineDays),
      action: 'otherLongitude',
      requiredBaselineDays: null,
      reason: `no night of the campaign can take a ${fmt(r.visitHours * 60)}-minute visit of this target from this site, so no phase of any period is covered: another node must observe it`,
      periodsScanned: periods.length,
      visits: 0,
    };
  }
  let inBaseline = 0;
  while (inBaseline < visitCount && nightOf[inBaseline] - first <= r.baselineDays + 1e-9) inBaseline++;
  // The longest baseline the campaign allows from the first visit night.
  const spanDays = nightCount - 1 - first;

  const coverage = new Float64Array(periods.length);
  const fullCoverage = new Float64Array(periods.length);
  // Days from the first visit night at which the threshold is first reached; NaN if never.
  const reachDays = new Float64Array(periods.length).fill(NaN);
  for (let k = 0; k < periods.length; k++) {
    const p = periods[k];
    const seen = binsScratch(bins);
    let covered = 0;
    let recorded = false;
    for (let i = 0; i < visitCount; i++) {
      if (i === inBaseline) {
        coverage[k] = covered / bins;
        recorded = true;
      }
      const b = phaseBin(times[i], p, bins);
      if (seen[b] === 0) {
        seen[b] = 1;
        covered++;
        if (covered === requiredBins) reachDays[k] = nightOf[i] - first;
        if (covered === bins && recorded) break;
      }
    }
    if (!recorded) coverage[k] = covered / bins;
    fullCoverage[k] = covered / bins;
  }

  let worst = 0;
  for (let k = 1; k < periods.length; k++) if (coverage[k] < coverage[worst]) worst = k;
  const minCoverage = coverage[worst];
  const base = {
    minCoverage,
    periodsScanned: periods.length,
    visits: inBaseline,
  };
  const failing: number[] = [];
  for (let k = 0; k < periods.length; k++) if (coverage[k] * bins < requiredBins - 1e-9) failing.push(k);
  if (failing.length === 0) {
    return {
      ...base,
      worstPeriodDays: periods[worst],
      commensurate: commensurateHarmonic(periods[worst], r.baselineDays),
      action: 'ok',
      requiredBaselineDays: null,
      reason: null,
    };
  }

  const unreachable = failing.filter((k) => Number.isNaN(reachDays[k]));
  const thresholdText = `${fmtPercent(threshold)} (${requiredBins} of ${bins} phase bins)`;
  const describe = (k: number): string => `P = ${fmtPeriod(periods[k])} d`;

  if (unreachable.length === 0) {
    let required = 0;
    for (const k of failing) required = Math.max(required, reachDays[k]);
    const c = commensurateHarmonic(periods[worst], r.baselineDays);
    const beat = c
      ? ` (near ${c.n === 1 ? '1' : `1/${c.n}`} d: its phase drifts by one cycle only every ${fmtDays(c.beatPeriodDays)})`
      : '';
    return {
      ...base,
      worstPeriodDays: periods[worst],
      commensurate: c,
      action: 'lengthenBaseline',
      requiredBaselineDays: required,
      reason: `the ${fmtDays(r.baselineDays)} baseline covers only ${fmtPercent(minCoverage)} of the phase of ${describe(worst)}${beat}; a baseline of ${fmtDays(required)} covers at least ${thresholdText} at every period from ${fmtPeriod(low)} to ${fmtPeriod(high)} d`,
    };
  }

  // The day-locked periods that even the whole campaign cannot cover decide first.
  // Locked: the phase drifts by less than a cycle over the baseline, or even over the campaign.
  const lockSpan = Math.max(r.baselineDays, spanDays);
  const locked = unreachable.filter((k) => commensurateHarmonic(periods[k], lockSpan) !== null);
  if (locked.length > 0) {
    const k = locked.reduce((a, b) => (fullCoverage[b] < fullCoverage[a] ? b : a));
    const c = commensurateHarmonic(periods[k], r.baselineDays) ?? commensurateHarmonic(periods[k], lockSpan)!;
    const beatText = Number.isFinite(c.beatPeriodDays)
      ? `its phase at a fixed time of night drifts by one cycle only every ${fmtDays(c.beatPeriodDays)} (beat period)`
      : `its phase at a fixed time of night does not drift at all`;
    return {
      ...base,
      worstPeriodDays: periods[k],
      commensurate: c,
      action: 'otherLongitude',
      requiredBaselineDays: null,
      reason:
        `${describe(k)} is close to ${c.n === 1 ? '1 d' : `1/${c.n} d`}: ${beatText}, so visits from this site cover only ${fmtPercent(coverage[k])} of its phase in the ${fmtDays(r.baselineDays)} baseline` +
        ` and ${fmtPercent(fullCoverage[k])} over the whole campaign (${fmtDays(spanDays)}), short of ${thresholdText}; nodes at other longitudes observe it at other phases`,
    };
  }

  // Periods so long that the whole campaign holds less than the threshold's share of a cycle
  // only need a longer baseline; any other period the campaign cannot cover is a sampling lock.
  const tooLong = (k: number) => periods[k] * threshold > spanDays;
  const sampling = unreachable.filter((k) => !tooLong(k));
  if (sampling.length === 0) {
    const k = unreachable[unreachable.length - 1];
    const p = periods[k];
    const estimate = Math.ceil(p * threshold);
    return {
      ...base,
      worstPeriodDays: p,
      commensurate: commensurateHarmonic(p, r.baselineDays),
      action: 'lengthenBaseline',
      requiredBaselineDays: estimate,
      reason: `${describe(k)} is too long for the campaign: the ${fmtDays(r.baselineDays)} baseline covers ${fmtPercent(coverage[k])} of its phase and the whole campaign (${fmtDays(spanDays)}) ${fmtPercent(fullCoverage[k])}; about ${fmtDays(estimate)} of baseline would cover ${thresholdText}, longer than the campaign`,
    };
  }
  const k = sampling.reduce((a, b) => (fullCoverage[b] < fullCoverage[a] ? b : a));
  const p = periods[k];
  return {
    ...base,
    worstPeriodDays: p,
    commensurate: commensurateHarmonic(p, r.baselineDays),
    action: 'changeSampling',
    requiredBaselineDays: null,
    reason:
      `${describe(k)}: ${r.visitsPerNight} visit${r.visitsPerNight === 1 ? '' : 's'} per night every ${fmtPeriod(r.nightStepDays)} night${r.nightStepDays === 1 ? '' : 's'} cover only ${fmtPercent(coverage[k])} of its phase in the ${fmtDays(r.baselineDays)} baseline` +
      ` and ${fmtPercent(fullCoverage[k])} over the whole campaign, short of ${thresholdText}; another night step or more visits per night would spread the phases`,
  };
}
