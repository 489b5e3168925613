import { HttpErrorResponse } from '@angular/common/http';
import { isApiErrorBody } from '@spincycle/shared/http/api-error';
import type { LightCurveRowError } from '@spincycle/shared/photometry/photometry';

/** The problems a refused light-curve upload listed, and how many there were in all. */
export interface LightCurveProblems {
  rows: LightCurveRowError[];
  totalErrors: number;
}

/** The `rows` and `totalErrors` of a 400 `invalid_light_curve` body, or none. */
export function lightCurveProblemsOf(error: unknown): LightCurveProblems {
  if (!(error instanceof HttpErrorResponse) || !isApiErrorBody(error.error)) return { rows: [], totalErrors: 0 };
  const body = error.error as { rows?: unknown; totalErrors?: unknown };
  const rows = Array.isArray(body.rows) ? (body.rows as LightCurveRowError[]) : [];
  const total = typeof body.totalErrors === 'number' && body.totalErrors >= rows.length ? body.totalErrors : rows.length;
  return { rows, totalErrors: total };
}
