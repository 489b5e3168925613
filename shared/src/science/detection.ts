/**
 * Detecting a period in a campaign: visits needed at a false-alarm probability, the
 * detectability of a given campaign, and the period precision a baseline gives
 * (SCIENCE.md §6).
 */
import { requireInRange, requireNonNegative, requirePositive } from './science-input-error';

export const DETECTION_SOURCE =
  "z ≈ N·A²/(4σ²) and z0 ≈ ln(M/p) [derived from the periodogram definition, SCIENCE.md §6]; M ≈ T·fmax independent frequencies";
export const PERIOD_PRECISION_SOURCE =
  'Montgomery & O\'Donoghue (1999), DSSN 13, 28; Kovács (1981) form (from memory): σf = sqrt(6/N)·σ/(π·A·T), σP = P²·σf';

/** Effective number of independent frequencies searched, M ≈ T·fmax (at least 1). */
export function independentFrequencyCount(baselineDays: number, maxFrequencyPerDay: number): number {
  return Math.max(1, requirePositive(baselineDays, 'baselineDays') * requirePositive(maxFrequencyPerDay, 'maxFrequencyPerDay'));
}

/** Detection threshold on the (psd-normalised) peak power, z0 = ln(M/p). */
export function detectionThresholdPower(independentFrequencies: number, falseAlarmProbability: number): number {
  const m = Math.max(1, requirePositive(independentFrequencies, 'independentFrequencies'));
  const p = requireInRange(falseAlarmProbability, 'falseAlarmProbability', 0, 1, true);
  return Math.log(m / p);
}

/**
 * Visits needed to detect a sinusoid of semi-amplitude A in noise σ (same units) at
 * false-alarm probability p over M independent frequencies: N ≥ 4σ²·ln(M/p)/A² [derived,
 * SCIENCE.md §6], rounded up; at least 4 (the periodogram fits 3 parameters).
 */
export function visitsForDetection(input: {
  semiAmplitudePpm: number;
  sigmaPpm: number;
  independentFrequencies: number;
  falseAlarmProbability: number;
}): number {
  const a = requirePositive(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const z0 = detectionThresholdPower(input.independentFrequencies, input.falseAlarmProbability);
  return Math.max(4, Math.ceil((4 * s * s * z0) / (a * a) - 1e-9));
}

/**
 * Expected false-alarm probability of the signal's peak for a campaign: the expected peak
 * power z = N·A²/(4σ²) [derived], and FAP = 1 − (1 − e^(−z))^M (M independent frequencies).
 * Falls as N grows: more visits never make a signal less detectable.
 */
export function expectedFalseAlarmProbability(input: {
  visits: number;
  semiAmplitudePpm: number;
  sigmaPpm: number;
  independentFrequencies: number;
}): number {
  const n = requireNonNegative(input.visits, 'visits');
  const a = requireNonNegative(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const m = Math.max(1, requirePositive(input.independentFrequencies, 'independentFrequencies'));
  const z = (n * a * a) / (4 * s * s);
  const single = Math.exp(-z);
  if (single >= 1) return 1;
  return Math.min(1, Math.max(0, -Math.expm1(m * Math.log1p(-single))));
}

/** Frequency and period precision of a sinusoid fit (Montgomery & O'Donoghue 1999). */
export function periodPrecision(input: {
  visits: number;
  sigmaPpm: number;
  semiAmplitudePpm: number;
  baselineDays: number;
  periodDays: number;
}): { sigmaFrequencyPerDay: number; sigmaPeriodDays: number } {
  const n = requirePositive(input.visits, 'visits');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const a = requirePositive(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const t = requirePositive(input.baselineDays, 'baselineDays');
  const p = requirePositive(input.periodDays, 'periodDays');
  const sigmaF = (Math.sqrt(6 / n) * s) / (Math.PI * a * t);
  return { sigmaFrequencyPerDay: sigmaF, sigmaPeriodDays: p * p * sigmaF };
}

/**
 * Baseline that gives the requested period precision with N visits: the σP formula solved
 * for T, T = P²·sqrt(6/N)·σ/(π·A·σP) [derived from Montgomery & O'Donoghue 1999].
 */
export function baselineForPeriodPrecision(input: {
  visits: number;
  sigmaPpm: number;
  semiAmplitudePpm: number;
  periodDays: number;
  periodPrecisionDays: number;
}): number {
  const n = requirePositive(input.visits, 'visits');
  const s = requirePositive(input.sigmaPpm, 'sigmaPpm');
  const a = requirePositive(input.semiAmplitudePpm, 'semiAmplitudePpm');
  const p = requirePositive(input.periodDays, 'periodDays');
  const sp = requirePositive(input.periodPrecisionDays, 'periodPrecisionDays');
  return (p * p * Math.sqrt(6 / n) * s) / (Math.PI * a * sp);
}
