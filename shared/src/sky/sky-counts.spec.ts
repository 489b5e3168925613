/**
 * One test per count the product shows about a sky window, against its definition in
 * docs/science.md ("Sky counts"), on hand-made windows where the counts differ from each other
 * — the case in which screens used to disagree (one count shown under two names, a gap
 * counted as the step between nights). Definitions: this product's, written in the docs.
 */
import { observingSeasons } from '../planning/observing-season';
import { assessCadence } from './cadence-assessment';
import type { TargetWindows } from './sky-types';
import { syntheticWindows } from './testing/synthetic-windows';

const HOUR = 3_600_000;

/** Night n has one interval of `hours[n]` hours starting at n × 24 h (none when 0). */
function windowsOf(hours: number[]): TargetWindows {
  return syntheticWindows({
    usableHours: hours,
    intervalsUtcMs: hours.map((h, n) => (h > 0 ? [[n * 24 * HOUR, n * 24 * HOUR + h * HOUR] as const] : [])),
    summarize: true,
  });
}

// 12 nights: observable on 8 (hours > 0), of which 5 hold two 1-h visits (≥ 2 h).
//             n:  0  1  2    3  4  5  6    7  8  9  10   11
const HOURS = [3, 3, 0.5, 0, 0, 0, 2.5, 1, 0, 2, 0.5, 4];
const W = windowsOf(HOURS);
const TWO_VISITS = { visitsPerNight: 2, visitHours: 1, cadenceDays: 4, baselineDays: 3, totalVisits: 4 };

describe('sky counts, one definition each (docs/science.md#sky-counts)', () => {
  it('usable hours: the sum of a night’s usable intervals; in all, their sum; the longest nightly window, the largest', () => {
    expect(Array.from(W.usableHoursByNight)).toEqual(HOURS);
    expect(W.summary.totalUsableHours).toBeCloseTo(16.5, 12);
    expect(W.summary.maxNightlyUsableHours).toBe(4);
  });

  it('observable nights: nights with usable hours above zero, of all nights of the campaign', () => {
    expect(W.summary.usableNights).toBe(8);
    expect(W.summary.totalNights).toBe(12);
  });

  it('qualifying nights: nights whose intervals hold the plan’s visits of one night — fewer than the observable nights here', () => {
    const a = assessCadence(W, TWO_VISITS, 0);
    expect(a.qualifyingNights).toBe(5); // nights 0, 1, 6, 9, 11
    expect(a.verdict).toMatch(/^5 of 12 nights can hold the 2 visits/);
  });

  it('expected clear nights: qualifying nights × (1 − weather loss)', () => {
    expect(assessCadence(W, TWO_VISITS, 0.4).expectedClearNights).toBeCloseTo(3, 12);
  });

  it('longest gap: nights missed between two counted nights; consecutive nights have no gap', () => {
    // Observable nights 0 1 2 _ _ _ 6 7 _ 9 10 11: three nights missed between 2 and 6.
    expect(W.summary.longestGapNights).toBe(3);
    // Qualifying nights 0 1 _ _ _ _ 6 _ _ 9 _ 11: four nights missed between 1 and 6.
    expect(assessCadence(W, TWO_VISITS, 0).longestGapNights).toBe(4);
    expect(windowsOf([1, 1, 1]).summary.longestGapNights).toBe(0);
    expect(windowsOf([0, 1, 0]).summary.longestGapNights).toBeNull();
  });

  it('longest continuous stretch: days from the first to the last night of the longest observing season', () => {
    // With seasons broken by gaps of more than 2 nights: 0–2 (2 days) and 6–11 (5 days).
    const { seasons, longestSeason } = observingSeasons(W, { maxGapNights: 2 });
    expect(seasons.map((s) => [s.firstNightIndex, s.lastNightIndex, s.lengthDays, s.usableNights])).toEqual([
      [0, 2, 2, 3],
      [6, 11, 5, 5],
    ]);
    expect(longestSeason?.lengthDays).toBe(5);
  });

  it('cadence stretch: the shortest run of qualifying nights that spans the baseline with enough nights, by its dates', () => {
    // Qualifying nights 0, 1 | 6, 9, 11: 1 → 6 is 5 nights, more than the cadence of 4, so the
    // runs are 0–1 (1 day, shorter than the 3-day baseline) and 6–11; the shortest stretch of the
    // second that spans 3 days and holds the 2 visit nights needed is 6–9.
    const a = assessCadence(W, TWO_VISITS, 0);
    expect(a.fits).toBe(true);
    expect(a.baselineWindow).toEqual({ firstNight: W.nightDates[6], lastNight: W.nightDates[9], qualifyingNights: 2, longestGapNights: 2 });
    expect(a.stretchDays).toBe(3);
  });
});
