/**
 * Regular frequency grids for the periodogram, VanderPlas (2018), ApJS 236, 16, §7.1 (section number from memory):
 * step df = 1/(n0·T) with n0 samples per peak (5–10), from fmin to fmax; the defaults follow
 * astropy's `LombScargle.autofrequency` (fmin = df/2, fmax = nyquistFactor × the average
 * Nyquist frequency N/(2T), Nf = 1 + round((fmax − fmin)/df)).
 */
import { ScienceInputError, requireFinite, requireNonNegative, requirePositive } from '../science-input-error';

/** f_k = minFrequencyPerDay + k·stepPerDay, k = 0 … count − 1. */
export interface FrequencyGrid {
  minFrequencyPerDay: number;
  stepPerDay: number;
  count: number;
}

/** Largest grid accepted (the fast method's FFT buffers grow with it). */
export const MAX_FREQUENCIES = 1_000_000;

// §7.1 from memory, not checked (docs/science.md "Checked values"): the shown string names no section.
export const FREQUENCY_GRID_SOURCE = 'VanderPlas (2018), ApJS 236, 16; defaults as astropy LombScargle.autofrequency';

export interface AutoGridOptions {
  /** n0, samples per peak (default 10). */
  samplesPerPeak?: number;
  /** Multiple of the average Nyquist frequency for the default fmax (default 5). */
  nyquistFactor?: number;
  minimumFrequencyPerDay?: number;
  maximumFrequencyPerDay?: number;
}

export const DEFAULT_SAMPLES_PER_PEAK = 10;
export const DEFAULT_NYQUIST_FACTOR = 5;

/** The grid for a baseline and point count (see the module comment). */
export function autoFrequencyGrid(baselineDays: number, pointCount: number, options: AutoGridOptions = {}): FrequencyGrid {
  const T = requirePositive(baselineDays, 'baselineDays');
  const spp = requirePositive(options.samplesPerPeak ?? DEFAULT_SAMPLES_PER_PEAK, 'samplesPerPeak');
  const nyq = requirePositive(options.nyquistFactor ?? DEFAULT_NYQUIST_FACTOR, 'nyquistFactor');
  const df = 1 / T / spp;
  const fmin =
    options.minimumFrequencyPerDay === undefined ? 0.5 * df : requireNonNegative(options.minimumFrequencyPerDay, 'minimumFrequencyPerDay');
  const fmax =
    options.maximumFrequencyPerDay === undefined
      ? (nyq * 0.5 * pointCount) / T
      : requirePositive(options.maximumFrequencyPerDay, 'maximumFrequencyPerDay');
  if (fmax <= fmin) throw new ScienceInputError('maximumFrequencyPerDay', `must exceed the minimum frequency ${fmin}`);
  const count = 1 + Math.round((fmax - fmin) / df);
  if (count > MAX_FREQUENCIES) {
    throw new ScienceInputError(
      'maximumFrequencyPerDay',
      `gives ${count} frequencies (at most ${MAX_FREQUENCIES}); lower it or the samples per peak`,
    );
  }
  return { minFrequencyPerDay: fmin, stepPerDay: df, count };
}

/** Validates an explicit grid. */
export function validateGrid(grid: FrequencyGrid): FrequencyGrid {
  if (typeof grid !== 'object' || grid === null) throw new ScienceInputError('grid', 'is missing');
  requireNonNegative(grid.minFrequencyPerDay, 'grid.minFrequencyPerDay');
  requirePositive(grid.stepPerDay, 'grid.stepPerDay');
  const c = requireFinite(grid.count, 'grid.count');
  if (!Number.isInteger(c) || c < 1 || c > MAX_FREQUENCIES) {
    throw new ScienceInputError('grid.count', `must be an integer within [1, ${MAX_FREQUENCIES}] (got ${c})`);
  }
  return grid;
}

/** Highest frequency of a grid. */
export function gridMaxFrequency(grid: FrequencyGrid): number {
  return grid.minFrequencyPerDay + grid.stepPerDay * (grid.count - 1);
}

/** The grid's frequencies as an array (f0 + k·df, the same arithmetic as numpy's f0 + df·arange). */
export function gridFrequencies(grid: FrequencyGrid): Float64Array {
  const f = new Float64Array(grid.count);
  for (let k = 0; k < grid.count; k++) f[k] = grid.minFrequencyPerDay + grid.stepPerDay * k;
  return f;
}
