/**
 * How the science core explains its numbers: every intermediate quantity of a target plan
 * carries its unit, a short human "why" line and the source of its formula, so that the
 * interface can show a tooltip or side panel for it (DESIGN.md: "every computed number can
 * explain itself").
 */

/**
 * How much to trust a source, as SCIENCE.md tags it:
 * - `paper`: read in the cited paper or its official data release;
 * - `derived`: computed from a cited formula;
 * - `memory`: recalled, not re-read (verify before relying on it);
 * - `practice`: a fact of the trade, no single source;
 * - `choice`: a Spincycle policy (a default we chose), no source;
 * - `facility`: the node's own configuration or rate card (not a scientific source).
 */
export type SourceTag = 'paper' | 'derived' | 'memory' | 'practice' | 'choice' | 'facility';

/** A number with its unit, the reason it has this value, and where its formula comes from. */
export interface Explained<T = number> {
  value: T;
  /** Unit in plain text (`d`, `ppm`, `s`, `h`, `1` for dimensionless, `eur minor units`...). */
  unit: string;
  /** One short sentence: what this number is and what set it. */
  why: string;
  /** Citation of the formula, `Author (year), journal volume, page, eq. N`, or a policy name. */
  source: string;
  tag: SourceTag;
}

/** Builds an {@link Explained} value. */
export function explained<T>(value: T, unit: string, why: string, source: string, tag: SourceTag): Explained<T> {
  return { value, unit, why, source, tag };
}

/** Severity of a flag: `info` explains a choice, `caution` warns, `blocking` means the plan cannot be executed as is. */
export type FlagSeverity = 'info' | 'caution' | 'blocking';

/** A remark attached to a result: outside a calibrated range, saturation, weakened braking... */
export interface ScienceFlag {
  /** Stable machine-readable code, e.g. `colourOutsideCalibration`, `weakenedBraking`. */
  code: string;
  severity: FlagSeverity;
  message: string;
  source?: string;
}

/** Builds a {@link ScienceFlag}. */
export function flag(code: string, severity: FlagSeverity, message: string, source?: string): ScienceFlag {
  return source === undefined ? { code, severity, message } : { code, severity, message, source };
}

/**
 * Rounds to `digits` significant figures for display in "why" lines (never used for the
 * values themselves). Plain arithmetic rather than toPrecision: plans format dozens of
 * numbers each, and this is on their hot path.
 */
export function fmt(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  const a = Math.abs(value);
  if (a >= 1e6 || a < 1e-3) return value.toExponential(digits - 1);
  const e = Math.floor(Math.log10(a));
  const p = digits - 1 - e;
  if (p >= 0) {
    const f = POW10[p] ?? 10 ** p;
    const r = Math.round(value * f);
    // The decimal r·10^−p written from whole numbers: the same text as String(r / f) (r / f is
    // the double nearest that short decimal, whose shortest form it is), without converting a
    // fraction, the slow part of number-to-text.
    if (p > 12 || Math.abs(r) > 2 ** 31) return String(r / f);
    const m = r < 0 ? -r : r;
    const whole = Math.floor(m / f);
    let frac = m - whole * f;
    const sign = r < 0 ? '-' : '';
    if (frac === 0) return sign + whole;
    let digitsLeft = p;
    while (frac % 10 === 0) {
      frac /= 10;
      digitsLeft--;
    }
    const fracText = String(frac);
    return `${sign}${whole}.${'0'.repeat(digitsLeft - fracText.length)}${fracText}`;
  }
  const f = POW10[-p] ?? 10 ** -p;
  return String(Math.round(value / f) * f);
}

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12];

/**
 * A whole count as a sentence shows it: digits grouped with commas from 10 000 up
 * ("12,932"), plain below ("2048"), so that a large number of visits or nights reads at a
 * glance. Values themselves are never rounded by it.
 */
export function countText(n: number): string {
  if (!Number.isFinite(n)) return String(n);
  if (Math.abs(n) < 10000) return String(n);
  // Grouped by hand: toLocaleString builds a number formatter on every call (a plan has dozens).
  const whole = String(Math.round(Math.abs(n)));
  let out = '';
  for (let i = whole.length; i > 0; i -= 3) out = (i > 3 ? ',' : '') + whole.slice(Math.max(0, i - 3), i) + out;
  return n < 0 ? `-${out}` : out;
}

/** "1 night", "181 nights", "12,932 visits": a count with its noun, singular for one. */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${countText(n)} ${n === 1 ? singular : plural}`;
}
