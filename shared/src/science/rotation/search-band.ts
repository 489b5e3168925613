/**
 * The band of frequencies searched: the expected period's range with margin, within what the
 * data can tell (Spincycle's rule, stated in `why`):
 * - with an expected period (low … high days): from 1/(2·high) (twice the longest plausible
 *   period) to 3/low (a third of the shortest: room for the half-period peak of a star with two
 *   spot groups, which the double-period check then recognises), widened to the plan's band
 *   when there is one;
 * - without: the plan's band, else periods of {@link SHORTEST_PERIOD_DAYS} d up to T/1.5;
 * - never below 1/T (a period longer than the time covered cannot be measured) nor above the
 *   data's useful limit min(1/{@link SHORTEST_PERIOD_DAYS} d, 5·N/(2T)) (five times the mean
 *   Nyquist frequency, astropy's default: VanderPlas (2018), ApJS 236, 16).
 * Grid step 1/(10·T) (10 samples per peak, VanderPlas 2018).
 */
import type { ExpectedPeriod } from '../../photometry/photometry';
import { fmt } from '../explained';
import { MAX_FREQUENCIES } from '../lomb-scargle/frequency-grid';

/** Shortest rotation period searched, days (the fastest rotators: a few hours). */
export const SHORTEST_PERIOD_DAYS = 0.1;
export const SAMPLES_PER_PEAK = 10;

export interface SearchBand {
  minFrequencyPerDay: number;
  maxFrequencyPerDay: number;
  stepPerDay: number;
  count: number;
  why: string;
}

const days = (f: number) => `${fmt(1 / f)} d`;

export function searchBand(
  baselineDays: number,
  points: number,
  expected: ExpectedPeriod | null,
  band: { minFrequencyPerDay: number; maxFrequencyPerDay: number } | null | undefined,
): SearchBand {
  const T = baselineDays;
  const floor = 1 / T;
  const limit = Math.min(1 / SHORTEST_PERIOD_DAYS, (5 * points) / (2 * T));
  const parts: string[] = [];
  let fmin: number;
  let fmax: number;
  if (expected) {
    fmin = 1 / (2 * expected.highDays);
    fmax = 3 / expected.lowDays;
    parts.push(
      `The expected period is ${fmt(expected.lowDays)}–${fmt(expected.highDays)} d (${expected.from}): searched from a third of the shortest (room for the half period of two spot groups) to twice the longest, ${days(fmax)} to ${days(fmin)}`,
    );
    if (band) {
      if (band.minFrequencyPerDay < fmin && band.minFrequencyPerDay > 0) fmin = band.minFrequencyPerDay;
      if (band.maxFrequencyPerDay > fmax) fmax = band.maxFrequencyPerDay;
      parts.push(
        `widened to the plan's band where it is wider (${days(band.maxFrequencyPerDay)} to ${band.minFrequencyPerDay > 0 ? days(band.minFrequencyPerDay) : 'any period'})`,
      );
    }
  } else if (band && band.maxFrequencyPerDay > band.minFrequencyPerDay) {
    fmin = band.minFrequencyPerDay;
    fmax = band.maxFrequencyPerDay;
    parts.push(`The plan's search band: periods from ${days(fmax)} to ${fmin > 0 ? days(fmin) : 'any length'}`);
  } else {
    fmin = 1.5 / T;
    fmax = 1 / SHORTEST_PERIOD_DAYS;
    parts.push(`No expected period: searched from ${fmt(SHORTEST_PERIOD_DAYS)} d to two thirds of the time covered (${fmt(T / 1.5)} d)`);
  }
  if (fmin < floor) {
    fmin = floor;
    parts.push(`periods longer than the ${fmt(T)} d covered left out`);
  }
  if (fmax > limit) {
    fmax = limit;
    parts.push(
      `periods shorter than ${days(limit)} left out (${limit === 1 / SHORTEST_PERIOD_DAYS ? 'the fastest rotators' : 'the limit these points can tell: five times their mean Nyquist frequency'})`,
    );
  }
  let step = 1 / (SAMPLES_PER_PEAK * T);
  if (!(fmax > fmin + 4 * step)) {
    // The expectation and the data do not overlap: search what the data can tell.
    fmin = Math.min(1.5 / T, limit / 2);
    fmax = limit;
    parts.push(`that left nothing to search: searched instead from ${days(fmax)} to ${days(fmin)}, all the data can tell`);
  }
  let count = Math.floor((fmax - fmin) / step + 1e-9) + 1;
  if (count > MAX_FREQUENCIES) {
    count = MAX_FREQUENCIES;
    step = (fmax - fmin) / (count - 1);
    parts.push(`grid of ${MAX_FREQUENCIES.toLocaleString('en-GB')} frequencies at most: step ${fmt(step)} d⁻¹, coarser than 1/(10·T)`);
  } else {
    parts.push(`grid step 1/(10 × ${fmt(T)} d), ${count.toLocaleString('en-GB')} frequencies`);
  }
  return { minFrequencyPerDay: fmin, maxFrequencyPerDay: fmin + step * (count - 1), stepPerDay: step, count, why: `${parts.join('; ')}.` };
}
