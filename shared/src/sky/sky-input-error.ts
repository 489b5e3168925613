import { between, displayNumber } from '../http/range-text';

/**
 * The one error the sky-window code throws for bad input. `field` is the path of the offending
 * value in the caller's input (`targets[3].decDeg`, `campaign.lastNight`, `ra`), so the server
 * can turn it into `fieldErrors` and the CLI can name the column.
 */
export class SkyInputError extends Error {
  /** Path of the offending value, e.g. `targets[3].decDeg`. */
  readonly field: string;
  /** Why the value was refused, without the field name, e.g. `must be between −90 and 90, got 91`. */
  readonly reason: string;

  constructor(field: string, reason: string) {
    super(`${field}: ${reason}`);
    this.name = 'SkyInputError';
    this.field = field;
    this.reason = reason;
  }
}

/** Formats a value for an error message without hiding NaN or infinities. */
export function describeValue(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  return typeof value;
}

/** Throws unless `value` is a finite number within [min, max]; `unit` follows the range when given. */
export function requireFiniteInRange(value: unknown, field: string, min: number, max: number, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new SkyInputError(field, `must be a finite number, got ${describeValue(value)}`);
  }
  if (value < min || value > max) {
    throw new SkyInputError(field, `must be ${between(min, max, unit)}, got ${displayNumber(value)}`);
  }
  return value;
}
