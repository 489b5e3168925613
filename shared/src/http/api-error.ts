/** Body of every non-2xx JSON response from the API. */
export interface ApiErrorBody {
  /** Stable machine-readable code, e.g. `invalid_credentials`, `validation_failed`. */
  code: string;
  /** Human-readable sentence naming what went wrong (and the field or row, when there is one). */
  message: string;
  /** Per-field messages, keyed by the field's path (`email`, `targets.14.decDeg`). */
  fieldErrors?: Record<string, string[]>;
}

/** True when an unknown value has the shape of an API error body. */
export function isApiErrorBody(value: unknown): value is ApiErrorBody {
  return (
    typeof value === 'object' &&
    value !== null &&
    typeof (value as ApiErrorBody).code === 'string' &&
    typeof (value as ApiErrorBody).message === 'string'
  );
}
