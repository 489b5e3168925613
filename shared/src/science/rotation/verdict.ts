/**
 * The verdict on a target's period, by a fixed rule the screens show beside every verdict
 * (Spincycle's rule; the thresholds are common practice, no single source: a false-alarm
 * probability of 0.1 % for a detection and 5 % for a hint, and three cycles in the baseline
 * before a period counts as measured — SCIENCE.md §6 "baseline ≥ 3 periods").
 */
import type { RotationVerdict } from '../../photometry/photometry';
import { fmt } from '../explained';

export const VERDICT_RULES = {
  /** Measured: the false-alarm probability at most this… */
  measuredMaxFalseAlarm: 0.001,
  /** …at least this many cycles of the period in the baseline… */
  measuredMinCycles: 3,
  /** Tentative: the false-alarm probability at most this, and at least this many cycles. */
  tentativeMaxFalseAlarm: 0.05,
  tentativeMinCycles: 1.5,
} as const;

export const VERDICT_RULE_TEXT = `Measured: false-alarm probability at most ${VERDICT_RULES.measuredMaxFalseAlarm}, at least ${VERDICT_RULES.measuredMinCycles} cycles of the period in the time covered, and no possible alias (a peak at least 80 % as strong at a frequency the sampling links to the best one, unless the data clearly prefer the best). Tentative: false-alarm probability at most ${VERDICT_RULES.tentativeMaxFalseAlarm} and at least ${VERDICT_RULES.tentativeMinCycles} cycles (this includes a strong peak that has a possible alias or fewer than ${VERDICT_RULES.measuredMinCycles} cycles). Otherwise: not detected.`;

export interface VerdictInput {
  falseAlarmProbability: number;
  cyclesCovered: number;
  aliasFlagged: boolean;
  /** The alias check's own line (what it found), shown instead of the generic one. */
  aliasNote?: string;
}

const pct = (p: number) => (p >= 0.001 ? fmt(p, 2) : p.toExponential(1));

/** The verdict and one line per rule applied. */
export function rotationVerdict(input: VerdictInput | null, whyNone?: string): { verdict: RotationVerdict; reasons: string[] } {
  if (!input) return { verdict: 'not_detected', reasons: [whyNone ?? 'No period could be searched for.'] };
  const r = VERDICT_RULES;
  const fap = input.falseAlarmProbability;
  const cycles = input.cyclesCovered;
  const reasons: string[] = [];
  const fapMeasured = fap <= r.measuredMaxFalseAlarm;
  const fapTentative = fap <= r.tentativeMaxFalseAlarm;
  reasons.push(
    `False-alarm probability ${pct(fap)}: ${fapMeasured ? `at most ${r.measuredMaxFalseAlarm} (enough for measured)` : fapTentative ? `above ${r.measuredMaxFalseAlarm} but at most ${r.tentativeMaxFalseAlarm} (enough for tentative only)` : `above ${r.tentativeMaxFalseAlarm} (not enough for a detection)`}.`,
  );
  const cyclesMeasured = cycles >= r.measuredMinCycles;
  const cyclesTentative = cycles >= r.tentativeMinCycles;
  reasons.push(
    `${fmt(cycles)} cycles of the period in the time covered: ${cyclesMeasured ? `at least ${r.measuredMinCycles} (enough for measured)` : cyclesTentative ? `fewer than ${r.measuredMinCycles} but at least ${r.tentativeMinCycles} (enough for tentative only)` : `fewer than ${r.tentativeMinCycles} (too few to count as a period)`}.`,
  );
  if (input.aliasNote) reasons.push(`${input.aliasNote}${input.aliasFlagged ? ' The period cannot count as measured.' : ''}`);
  else {
    reasons.push(
      input.aliasFlagged ? 'A possible alias has comparable power: the period cannot count as measured.' : 'No alias of comparable power.',
    );
  }
  let verdict: RotationVerdict;
  if (fapMeasured && cyclesMeasured && !input.aliasFlagged) verdict = 'measured';
  else if (fapTentative && cyclesTentative) verdict = 'tentative';
  else verdict = 'not_detected';
  return { verdict, reasons };
}
