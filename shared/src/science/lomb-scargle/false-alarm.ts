/**
 * False-alarm probability of a Lomb–Scargle peak, Baluev (2008), MNRAS 385, 1279, eq. 6
 * ("alias-free" approximation) with the τ factor of his Table 1, exactly as astropy 5.2
 * implements `LombScargle.false_alarm_probability(method='baluev')` for the standard
 * normalisation (astropy `_statistics.fap_baluev` and `tau_davies`):
 *
 *   FAP1 = (1 − Z)^((N−3)/2)                                      (single frequency)
 *   τ    = γ(N−1)·W·(1 − Z)^((N−4)/2)·sqrt((N−1)·Z/2),  W = fmax·sqrt(4π·var(t))
 *   γ(n) = sqrt(2/n)·Γ(n/2)/Γ((n−1)/2)
 *   FAP  = 1 − (1 − FAP1)·e^(−τ), computed as −expm1(−τ) + FAP1·e^(−τ).
 *
 * Note: SCIENCE.md §6 writes γ(N); astropy evaluates γ at N_H = N − 1 (the degrees of freedom
 * of the null hypothesis). We follow astropy, which SCIENCE.md check value 14 was derived
 * from. var(t) is weighted by 1/dy² when uncertainties are given, as astropy does.
 */
import { requireFinite, requireInteger, requireNonNegative, requirePositive } from '../science-input-error';

export const BALUEV_SOURCE = 'Baluev (2008), MNRAS 385, 1279, eq. 6 and Table 1, as astropy false_alarm_probability(method="baluev")';

/**
 * ln Γ(x) for x > 0: Lanczos approximation, g = 7, 9 coefficients (common practice;
 * coefficients checked numerically against a reference ln Γ, relative error ≤ 2e-15 for
 * x = 0.87…740, and against Γ(5) = 24 and Γ(½) = √π in the tests), with the reflection formula
 * below 0.5.
 */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const g = 7;
  const c = LANCZOS;
  const z = x - 1;
  let a = c[0];
  const tt = z + g + 0.5;
  for (let i = 1; i < g + 2; i++) a += c[i] / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(tt) - tt + Math.log(a);
}

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
  -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** γ(n) = sqrt(2/n)·Γ(n/2)/Γ((n−1)/2) (astropy `_gamma`). */
export function baluevGamma(n: number): number {
  return Math.sqrt(2 / n) * Math.exp(logGamma(n / 2) - logGamma((n - 1) / 2));
}

export interface BaluevInput {
  /** Number of points N (≥ 4). */
  pointCount: number;
  /** Highest frequency searched, per day. */
  maximumFrequencyPerDay: number;
  /** Variance of the times, days² (weighted by 1/dy² when the data have uncertainties). */
  timeVarianceDays2: number;
}

/** Single-frequency false-alarm probability (1 − Z)^((N−3)/2), Baluev (2008) Table 1. */
export function singleFrequencyFalseAlarm(power: number, pointCount: number): number {
  const z = clampPower(power);
  return (1 - z) ** (0.5 * (pointCount - 3));
}

/** Baluev (2008) false-alarm probability of a peak of standard-normalised power Z (clamped to 0–1). */
export function baluevFalseAlarmProbability(power: number, input: BaluevInput): number {
  const n = requireInteger(input.pointCount, 'pointCount', 4);
  const fmax = requirePositive(input.maximumFrequencyPerDay, 'maximumFrequencyPerDay');
  const dt = requireNonNegative(input.timeVarianceDays2, 'timeVarianceDays2');
  const z = clampPower(requireFinite(power, 'power'));
  const nh = n - 1;
  const nk = n - 3;
  const W = fmax * Math.sqrt(4 * Math.PI * dt);
  const fapSingle = singleFrequencyFalseAlarm(z, n);
  const tau = baluevGamma(nh) * W * (1 - z) ** (0.5 * (nk - 1)) * Math.sqrt(0.5 * nh * z);
  const fap = -Math.expm1(-tau) + fapSingle * Math.exp(-tau);
  return Math.min(1, Math.max(0, fap));
}

function clampPower(z: number): number {
  return z < 0 ? 0 : z > 1 ? 1 : z;
}
