import { between, displayNumber } from '../http/range-text';

/**
 * The one error type of the science core: thrown for input that is missing, not finite,
 * out of its physical range, or outside every relation that could use it. The science core
 * never returns NaN; when it cannot produce a number it throws this, naming the field.
 */
export class ScienceInputError extends Error {
  /** Path of the offending input, e.g. `ageMyr`, `colour.value`, `series[3].timeDays`. */
  readonly field: string;
  /** The reason alone, without the field prefix (the message is `field: reason`). */
  readonly reason: string;

  constructor(field: string, reason: string) {
    super(`${field}: ${reason}`);
    this.name = 'ScienceInputError';
    this.field = field;
    this.reason = reason;
  }
}

/** True when a value is a ScienceInputError (also across module copies, by name and shape). */
export function isScienceInputError(value: unknown): value is ScienceInputError {
  return (
    value instanceof ScienceInputError ||
    (value instanceof Error && value.name === 'ScienceInputError' && typeof (value as ScienceInputError).field === 'string')
  );
}

/** Throws unless `value` is a finite number; returns it. */
export function requireFinite(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ScienceInputError(field, `must be a finite number (got ${describe(value)})`);
  }
  return value;
}

/** Throws unless `value` is a finite number > 0. */
export function requirePositive(value: unknown, field: string): number {
  const v = requireFinite(value, field);
  if (v <= 0) throw new ScienceInputError(field, `must be positive (got ${v})`);
  return v;
}

/** Throws unless `value` is a finite number ≥ 0. */
export function requireNonNegative(value: unknown, field: string): number {
  const v = requireFinite(value, field);
  if (v < 0) throw new ScienceInputError(field, `must not be negative (got ${v})`);
  return v;
}

/**
 * Throws unless `min ≤ value ≤ max` (or `min < value < max` when `exclusive`), in the one range
 * notation of the product ("must be between −2 and 25 mag (got 40)"; shared/src/http/range-text).
 * `unit` is written after the range when given.
 */
export function requireInRange(value: unknown, field: string, min: number, max: number, exclusive = false, unit = ''): number {
  const v = requireFinite(value, field);
  const bad = exclusive ? v <= min || v >= max : v < min || v > max;
  if (bad) {
    const u = unit === '' ? '' : unit === '°' ? '°' : ` ${unit}`;
    const range = exclusive
      ? `must be greater than ${displayNumber(min)} and less than ${displayNumber(max)}${u}`
      : `must be ${between(min, max, unit)}`;
    throw new ScienceInputError(field, `${range} (got ${displayNumber(v)})`);
  }
  return v;
}

/** Throws unless `value` is a positive integer (≥ `min`). */
export function requireInteger(value: unknown, field: string, min = 1): number {
  const v = requireFinite(value, field);
  if (!Number.isInteger(v) || v < min) throw new ScienceInputError(field, `must be an integer ≥ ${min} (got ${v})`);
  return v;
}

/** Throws unless `value` is one of `allowed`. */
export function requireOneOf<T extends string>(value: unknown, field: string, allowed: readonly T[]): T {
  if (typeof value !== 'string' || !(allowed as readonly string[]).includes(value)) {
    throw new ScienceInputError(field, `must be one of ${allowed.join(', ')} (got ${describe(value)})`);
  }
  return value as T;
}

function describe(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  return typeof value;
}
