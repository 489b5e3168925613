/**
 * The alias check: a peak of the spectral window at f_w makes a signal at f appear also at
 * f ± f_w and at f_w − f (the mirror). For each strong window peak (and the sidereal day,
 * always), the periodogram's highest power within a tolerance of f_best + f_w, f_best − f_w
 * and f_w − f_best is compared with the best peak's; a candidate with at least
 * {@link ALIAS_RULES.flagPowerRatio} of the best's power flags the best period as a possible
 * alias (Spincycle's rule; the aliasing itself: Deeming (1975), Ap&SS 36, 137; VanderPlas
 * (2018), ApJS 236, 16, §4 — section from memory).
 */
import type { AliasCandidate, SpectrumPeak } from '../../photometry/photometry';
import { fmt } from '../explained';
import type { PreparedLightCurve } from '../lomb-scargle/light-curve';
import { lombScarglePowerAt } from '../lomb-scargle/lomb-scargle-power';

export const ALIAS_RULES = {
  /** Window peaks count from this frequency up (and from 2/T), 1/d: below it lies the window's central peak. */
  windowMinFrequencyPerDay: 0.05,
  /** Window peaks of at least this power (0…1) count. */
  windowMinPower: 0.1,
  /** Window peaks used at most (the strongest). */
  windowPeaks: 5,
  /** A candidate with at least this fraction of the best peak's power flags the best as a possible alias… */
  flagPowerRatio: 0.8,
  /**
   * …unless the data prefer the best clearly: N·ln((1 − p_c)/(1 − p_best)) (−2 ln of the
   * likelihood ratio of the two sinusoid fits with the noise level fitted, from their residual
   * sums of squares RSS ∝ 1 − p) at least this (a likelihood ratio above e⁵ ≈ 150). Without it,
   * every well-measured single-site period would be flagged: at high signal-to-noise the
   * daily alias keeps 80–90 % of the power although the fit is far worse (common practice of
   * likelihood-ratio tests, no single source; the threshold is this product's choice).
   */
  decisiveDeltaChiSquare: 10,
  /** Candidates listed from this fraction of the best's power. */
  listPowerRatio: 0.5,
  /** Sidereal day as a frequency, 1/d (always checked: single-site nightly sampling). */
  siderealDayPerDay: 1.0027379,
} as const;

export const ALIAS_RULE_TEXT = `The best period is flagged as a possible alias when the periodogram has, within max(1.5 grid steps, 1/(2T)) of f + f_w, f − f_w or f_w − f (f the best frequency, f_w a peak of the spectral window of power at least ${ALIAS_RULES.windowMinPower} above ${ALIAS_RULES.windowMinFrequencyPerDay} d⁻¹, or the sidereal day 1.0027 d⁻¹), a power at least ${ALIAS_RULES.flagPowerRatio * 100} % of the best peak's, even outside the band searched — unless the data prefer the best clearly: N·ln((1 − p_alias)/(1 − p_best)) ≥ ${ALIAS_RULES.decisiveDeltaChiSquare} (the two sinusoid fits' likelihood ratio above e⁵ ≈ 150 to 1).`;

/** The window's strongest peaks (refined by a parabola through the three highest grid points). */
export function windowPeaksOf(window: Float64Array, f0: number, df: number, baselineDays: number): SpectrumPeak[] {
  const fLow = Math.max(ALIAS_RULES.windowMinFrequencyPerDay, 2 / baselineDays);
  const found: SpectrumPeak[] = [];
  for (let k = 1; k < window.length - 1; k++) {
    const p = window[k];
    const f = f0 + k * df;
    if (f < fLow || p < ALIAS_RULES.windowMinPower || p < window[k - 1] || p <= window[k + 1]) continue;
    const a = window[k - 1];
    const c = window[k + 1];
    const denom = a - 2 * p + c;
    const shift = denom < 0 ? (0.5 * (a - c)) / denom : 0;
    const fr = f + Math.max(-0.5, Math.min(0.5, shift)) * df;
    found.push({ frequencyPerDay: fr, periodDays: 1 / fr, power: p });
  }
  found.sort((x, y) => y.power - x.power);
  return found.slice(0, ALIAS_RULES.windowPeaks);
}

export interface AliasInput {
  data: PreparedLightCurve;
  /** The periodogram grid and power. */
  f0: number;
  df: number;
  power: Float64Array;
  best: { frequencyPerDay: number; periodDays: number; power: number; gridPower: number };
  windowPeaks: SpectrumPeak[];
  falseAlarm: (power: number) => number;
}

export interface AliasResult {
  flagged: boolean;
  windowPeaks: SpectrumPeak[];
  candidates: AliasCandidate[];
  message: string | null;
  /** One line for the verdict's reasons: flagged, dismissed by the likelihood test, or none. */
  note: string;
}

/** The alias check (see the module comment). */
export function checkAliases(input: AliasInput): AliasResult {
  const { data, f0, df, power, best, windowPeaks } = input;
  const T = data.baselineDays;
  const tol = Math.max(1.5 * df, 1 / (2 * T));
  const fb = best.frequencyPerDay;
  const fMaxGrid = f0 + df * (power.length - 1);
  const links: number[] = windowPeaks.map((w) => w.frequencyPerDay);
  if (!links.some((f) => Math.abs(f - ALIAS_RULES.siderealDayPerDay) <= tol)) links.push(ALIAS_RULES.siderealDayPerDay);

  const candidates: AliasCandidate[] = [];
  // The ratio before capping at 1 (a candidate outside the band may beat the best).
  const rawRatio: number[] = [];
  // Whether the data prefer the best clearly over each candidate (see ALIAS_RULES.decisiveDeltaChiSquare).
  const decisive: boolean[] = [];
  const seen: number[] = [];
  for (const fw of links) {
    const fwText = fmt(fw, 4);
    const positions: { f: number; relation: string }[] = [
      { f: fb + fw, relation: `f + ${fwText} d⁻¹` },
      { f: fb - fw, relation: `f − ${fwText} d⁻¹` },
      { f: fw - fb, relation: `${fwText} d⁻¹ − f` },
    ];
    for (const pos of positions) {
      if (pos.f <= tol || Math.abs(pos.f - fb) <= tol || seen.some((s) => Math.abs(s - pos.f) <= tol)) continue;
      seen.push(pos.f);
      const found = highestNear(data, f0, df, power, pos.f, tol, fMaxGrid);
      const bestPower = found.inGrid ? best.gridPower : best.power;
      const ratio = found.power / bestPower;
      if (!(ratio >= ALIAS_RULES.listPowerRatio)) continue;
      decisive.push(data.n * Math.log((1 - found.power) / Math.max(1e-12, 1 - bestPower)) >= ALIAS_RULES.decisiveDeltaChiSquare);
      candidates.push({
        frequencyPerDay: found.frequencyPerDay,
        periodDays: 1 / found.frequencyPerDay,
        power: found.power,
        falseAlarmProbability: input.falseAlarm(found.power),
        windowFrequencyPerDay: fw,
        relation: pos.relation,
        powerRatio: Math.min(1, ratio),
      });
      rawRatio.push(ratio);
    }
  }
  const order = candidates.map((_, i) => i).sort((a, b) => rawRatio[b] - rawRatio[a]);
  const sorted = order.map((i) => candidates[i]);
  const flaggedBy = order.find((i) => rawRatio[i] >= ALIAS_RULES.flagPowerRatio && !decisive[i]);
  const flagged = flaggedBy !== undefined;
  let message: string | null = null;
  if (flaggedBy !== undefined) {
    const c = candidates[flaggedBy];
    const top = rawRatio[flaggedBy];
    const fw = c.windowFrequencyPerDay;
    const daily = Math.abs(fw - 1) < 0.05;
    const how =
      top > 1.005
        ? 'fits better (it lies outside the band searched)'
        : top >= 0.995
          ? 'fits as well'
          : `fits almost as well (its peak has ${Math.round(c.powerRatio * 100)} % of the best peak's power)`;
    message = `The best period, ${fmt(best.periodDays)} d, may be an alias: the sampling repeats every ${fmt(1 / fw, 4)} d (a peak of the spectral window at ${fmt(fw, 4)} d⁻¹), and a period of ${fmt(c.periodDays)} d (${c.relation}) ${how}. ${daily ? 'More points per night, or nodes at other longitudes, would tell them apart.' : 'Less regular sampling would tell them apart.'}`;
  }
  let note = 'No possible alias with at least 80 % of the best peak’s power.';
  const dismissed = order.find((i) => rawRatio[i] >= ALIAS_RULES.flagPowerRatio && decisive[i]);
  if (message !== null) note = message;
  else if (dismissed !== undefined) {
    const c = candidates[dismissed];
    note = `The possible alias at ${fmt(c.periodDays)} d (${c.relation}) has ${Math.round(c.powerRatio * 100)} % of the best peak's power but fits clearly worse (likelihood ratio above 150 to 1): not counted as an alias.`;
  }
  return { flagged, windowPeaks, candidates: sorted, message, note };
}

/**
 * The highest power within ±tol of `f`: from the grid when the interval lies inside it, else
 * the exact power at 5 points across the interval, refined by a parabola through the highest.
 */
function highestNear(
  data: PreparedLightCurve,
  f0: number,
  df: number,
  power: Float64Array,
  f: number,
  tol: number,
  fMaxGrid: number,
): { frequencyPerDay: number; power: number; inGrid: boolean } {
  if (f - tol >= f0 && f + tol <= fMaxGrid) {
    const a = Math.max(0, Math.ceil((f - tol - f0) / df));
    const b = Math.min(power.length - 1, Math.floor((f + tol - f0) / df));
    let k = a;
    for (let i = a + 1; i <= b; i++) if (power[i] > power[k]) k = i;
    return { frequencyPerDay: f0 + k * df, power: power[k], inGrid: true };
  }
  const step = tol / 2;
  const fs = [f - 2 * step, f - step, f, f + step, f + 2 * step].filter((x) => x > 0);
  const p = lombScarglePowerAt(data, fs);
  let k = 0;
  for (let i = 1; i < p.length; i++) if (p[i] > p[k]) k = i;
  let fr = fs[k];
  if (k > 0 && k < p.length - 1) {
    const denom = p[k - 1] - 2 * p[k] + p[k + 1];
    if (denom < 0) fr += Math.max(-0.5, Math.min(0.5, (0.5 * (p[k - 1] - p[k + 1])) / denom)) * step;
  }
  const pr = fr === fs[k] ? p[k] : Math.max(p[k], lombScarglePowerAt(data, [fr])[0]);
  return { frequencyPerDay: fr, power: pr, inGrid: false };
}
