/**
 * Ticks of a logarithmic axis on the 1–2–5 sequence (0.1, 0.2, 0.5, 1, 2, 5, 10, …): evenly
 * spread on a log scale, easy to read and to interpolate between. chart.js's own log ticks put
 * a grid line at every 1…9 × 10ⁿ and a label at the axis ends (0.37, 83), which crowd the axis
 * and read oddly; `logAxis125` replaces them.
 */
import type { Scale } from 'chart.js';

const MANTISSAS_125 = [1, 2, 5] as const;
/** Relative slack when comparing with the axis ends, against floating-point noise. */
const EPSILON = 1e-9;

/** m × 10ᵉ without floating-point noise (5 × 10⁻³ → 0.005, not 0.005000000000000001). */
function sequenceValue(mantissa: number, exponent: number): number {
  return Number((mantissa * 10 ** exponent).toPrecision(12));
}

/** The largest 1–2–5 value ≤ x (x > 0): 0.37 → 0.2, 7 → 5, 10 → 10. */
export function floor125(x: number): number {
  const exponent = Math.floor(Math.log10(x) + EPSILON);
  const mantissa = [...MANTISSAS_125].reverse().find((m) => sequenceValue(m, exponent) <= x * (1 + EPSILON)) ?? 1;
  return sequenceValue(mantissa, exponent);
}

/** The smallest 1–2–5 value ≥ x (x > 0): 0.37 → 0.5, 7 → 10, 10 → 10. */
export function ceil125(x: number): number {
  const exponent = Math.floor(Math.log10(x) + EPSILON);
  const mantissa = MANTISSAS_125.find((m) => sequenceValue(m, exponent) >= x * (1 - EPSILON));
  return mantissa === undefined ? sequenceValue(1, exponent + 1) : sequenceValue(mantissa, exponent);
}

/**
 * Tick values from `min` to `max` (both > 0): every 1–2–5 value when at most `maxTicks` fit,
 * else only the powers of ten, else every second, third, … power of ten (always including 1
 * when it is in range). Empty for a range that a log axis cannot show.
 */
export function ticks125(min: number, max: number, maxTicks = Number.POSITIVE_INFINITY): number[] {
  if (!(min > 0) || !(max >= min) || !Number.isFinite(max)) return [];
  const low = Math.floor(Math.log10(min) + EPSILON);
  const high = Math.floor(Math.log10(max) + EPSILON);
  const pick = (mantissas: readonly number[], stride: number): number[] => {
    const out: number[] = [];
    for (let exponent = low; exponent <= high; exponent++) {
      if (((exponent % stride) + stride) % stride !== 0) continue;
      for (const m of mantissas) {
        const value = sequenceValue(m, exponent);
        if (value >= min * (1 - EPSILON) && value <= max * (1 + EPSILON)) out.push(value);
      }
    }
    return out;
  };
  const all = pick(MANTISSAS_125, 1);
  if (all.length <= maxTicks) return all;
  for (let stride = 1; stride <= high - low + 1; stride++) {
    const decades = pick([1], stride);
    if (decades.length <= Math.max(maxTicks, 2) || stride === high - low + 1) return decades.length ? decades : all.slice(0, 1);
  }
  return all;
}

/** Smallest spacing between tick labels, px: wider across (labels side by side) than up an axis. */
export const TICK_SPACING_PX = { horizontal: 56, vertical: 26 } as const;

/**
 * Scale hooks of a log axis with 1–2–5 ticks: the axis runs from the 1–2–5 value at or below
 * the data (or the given `min`) to the one at or above it, and its ticks (and grid lines) are
 * the 1–2–5 values that fit its length (`ticks125`). Spread into a chart.js scale of type
 * `logarithmic`; label the ticks with `logTickLabel`.
 */
export function logAxis125Hooks() {
  return {
    afterDataLimits: (scale: Scale) => {
      if (scale.min > 0) scale.min = floor125(scale.min);
      if (scale.max > 0) scale.max = ceil125(scale.max);
    },
    afterBuildTicks: (scale: Scale) => {
      const horizontal = scale.isHorizontal();
      const length = horizontal ? scale.width : scale.height;
      const maxTicks =
        length > 0 ? Math.max(2, Math.floor(length / (horizontal ? TICK_SPACING_PX.horizontal : TICK_SPACING_PX.vertical)) + 1) : undefined;
      const values = ticks125(scale.min, scale.max, maxTicks);
      if (values.length) scale.ticks = values.map((value) => ({ value, major: Number.isInteger(Math.log10(value)) }));
    },
  };
}
