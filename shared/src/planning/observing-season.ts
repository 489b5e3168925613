/**
 * Observing seasons: the stretches of a campaign in which a target can be observed from one
 * site, and whether a requested baseline fits inside one of them.
 *
 * Policy (Spincycle's choice):
 * - A night is usable when its usable time is > 0 and ≥ `minUsableHours` (default 0, as the
 *   windows' own summary counts it; pass the node's minimum for a stricter season).
 * - A season is a run of usable nights in which consecutive usable nights are at most
 *   `maxGapNights` apart (default 14: a fortnight of bright Moon or bad weather does not end
 *   a season, the months when the target is behind the Sun do).
 * - A season's length is the time from its first to its last usable night, days: the longest
 *   baseline (first to last visit) it can hold.
 * - A season touching the first or last night of the windows may be cut by the campaign; it
 *   is flagged, because the target's true season may be longer.
 */
import { countOf } from '../science/explained';
import { requireFiniteInRange } from '../sky/sky-input-error';
import type { TargetWindows } from '../sky/sky-types';
import { isUsableNight } from '../sky/sky-windows';

/** Longest run of unusable nights, plus one, inside one season (Spincycle's choice). */
export const DEFAULT_MAX_GAP_NIGHTS = 14;

export interface SeasonOptions {
  /** Largest gap between consecutive usable nights inside one season, nights (1 = consecutive); default 14. */
  maxGapNights?: number;
  /** A night counts when its usable time is > 0 and ≥ this, hours; default 0. */
  minUsableHours?: number;
}

/** One observing season of a target at a site. */
export interface ObservingSeason {
  firstNightIndex: number;
  lastNightIndex: number;
  /** Local date of the first usable night, `YYYY-MM-DD`. */
  firstNight: string;
  lastNight: string;
  /** Days from the first to the last usable night: the longest baseline the season holds. */
  lengthDays: number;
  usableNights: number;
  /** The season starts on the windows' first night or ends on their last: the campaign may cut it. */
  cutByCampaign: boolean;
}

/** The seasons of a target in the windows' campaign, and the longest (null when none). */
export interface ObservingSeasons {
  seasons: ObservingSeason[];
  longestSeason: ObservingSeason | null;
}

function resolveOptions(opts: SeasonOptions): Required<SeasonOptions> {
  return {
    maxGapNights: requireFiniteInRange(opts.maxGapNights ?? DEFAULT_MAX_GAP_NIGHTS, 'maxGapNights', 1, 100_000),
    minUsableHours: requireFiniteInRange(opts.minUsableHours ?? 0, 'minUsableHours', 0, 24),
  };
}

/**
 * Splits the campaign into the target's observing seasons (see the file comment). O(nights).
 *
 * @throws SkyInputError for an invalid option.
 */
export function observingSeasons(windows: TargetWindows, opts: SeasonOptions = {}): ObservingSeasons {
  const { maxGapNights, minUsableHours } = resolveOptions(opts);
  const nightCount = windows.usableHoursByNight.length;
  const seasons: ObservingSeason[] = [];
  let start = -1;
  let last = -1;
  let count = 0;
  const close = () => {
    seasons.push({
      firstNightIndex: start,
      lastNightIndex: last,
      firstNight: windows.nightDates[start],
      lastNight: windows.nightDates[last],
      lengthDays: last - start,
      usableNights: count,
      cutByCampaign: start === 0 || last === nightCount - 1,
    });
  };
  for (let n = 0; n < nightCount; n++) {
    if (!isUsableNight(windows, n, minUsableHours)) continue;
    if (start >= 0 && n - last > maxGapNights) {
      close();
      start = -1;
    }
    if (start < 0) {
      start = n;
      count = 0;
    }
    last = n;
    count++;
  }
  if (start >= 0) close();
  let longestSeason: ObservingSeason | null = null;
  for (const s of seasons) if (!longestSeason || s.lengthDays > longestSeason.lengthDays) longestSeason = s;
  return { seasons, longestSeason };
}

/** The answer of `assessSeason`. */
export interface SeasonAssessment {
  /** The baseline fits between the first and last usable night of one season. */
  fitsOneSeason: boolean;
  /** Length of the longest season in the campaign, days (0 when the target is never usable). */
  longestSeasonDays: number;
  /** Seasons found in the windows' campaign. */
  seasonsInCampaign: number;
  /**
   * When it does not fit: ceil(baseline / longest season) seasons, each holding an equal share
   * of the baseline (≤ the longest season). Null when it fits or the target is never usable.
   */
  multiSeason: { seasons: number; perSeasonBaselineDays: number } | null;
  /** Plain-language explanation when it does not fit. */
  reason: string | null;
  /** The longest season, for display. */
  longestSeason: ObservingSeason | null;
}

const plural = (n: number, word: string): string => countOf(n, word);

/**
 * Checks whether a baseline of `baselineDays` fits in one observing season of the target at
 * this site, and otherwise proposes a multi-season plan.
 *
 * @throws SkyInputError for an invalid baseline or option.
 */
export function assessSeason(windows: TargetWindows, baselineDays: number, opts: SeasonOptions = {}): SeasonAssessment {
  const baseline = requireFiniteInRange(baselineDays, 'baselineDays', 0, 100_000);
  const { seasons, longestSeason } = observingSeasons(windows, opts);
  const longestSeasonDays = longestSeason?.lengthDays ?? 0;
  const common = { longestSeasonDays, seasonsInCampaign: seasons.length, longestSeason };
  if (!longestSeason) {
    return {
      ...common,
      fitsOneSeason: false,
      multiSeason: null,
      reason: 'the target has no usable night from this site in the campaign, so it has no observing season here',
    };
  }
  if (baseline <= longestSeasonDays + 1e-9) return { ...common, fitsOneSeason: true, multiSeason: null, reason: null };

  const cut = longestSeason.cutByCampaign ? ' (cut by the campaign: the target may stay observable longer)' : '';
  const span = `${longestSeason.firstNight} to ${longestSeason.lastNight}`;
  if (longestSeasonDays <= 0) {
    return {
      ...common,
      fitsOneSeason: false,
      multiSeason: null,
      reason: `a baseline of ${plural(Math.round(baseline), 'day')} does not fit: the target's observing seasons here last a single night (${span})`,
    };
  }
  const count = Math.ceil(baseline / longestSeasonDays - 1e-9);
  const perSeason = baseline / count;
  return {
    ...common,
    fitsOneSeason: false,
    multiSeason: { seasons: count, perSeasonBaselineDays: perSeason },
    reason:
      `a baseline of ${plural(Math.round(baseline), 'day')} does not fit in one observing season: the target's longest season from this site is ${plural(longestSeasonDays, 'day')} (${span})${cut}.` +
      ` A multi-season plan would observe ${plural(count, 'season')} of about ${plural(Math.round(perSeason), 'day')} each; it spans several allocation cycles (this campaign holds ${plural(seasons.length, 'season')}), and the gaps between seasons add yearly aliases to the period search (standard observing practice; see Methods: Observing season)`,
  };
}
