import { HttpErrorResponse } from '@angular/common/http';
import { isApiErrorBody, type ApiErrorBody } from '@spincycle/shared/http/api-error';

/**
 * The API's `{ code, message, fieldErrors? }` from any failure a page may receive
 * (an HttpClient error, or a resource error wrapping one), with a plain sentence when the
 * server did not send such a body.
 */
export function readApiError(error: unknown): ApiErrorBody {
  const cause = error instanceof HttpErrorResponse ? error : (error as { cause?: unknown } | null)?.cause;
  if (cause instanceof HttpErrorResponse) {
    if (isApiErrorBody(cause.error)) return cause.error;
    if (cause.status === 0) return { code: 'unreachable', message: 'The server could not be reached.' };
    if (cause.status >= 500) return { code: 'server_error', message: 'The server could not complete the request.' };
    return { code: `http_${cause.status}`, message: `The request was refused (${cause.status}).` };
  }
  return { code: 'unexpected', message: 'Something went wrong.' };
}

/**
 * The error state of a failed read: `lead` ("The cycles could not be loaded.") followed by
 * the API's message, or null while `error` is empty (a resource's `error()` without a failure).
 */
export function loadErrorText(error: unknown, lead: string): string | null {
  return error ? `${lead} ${readApiError(error).message}` : null;
}

/**
 * As loadErrorText, but null for a 404 too: for a card that shows nothing when there is nothing
 * yet (a decision not released, a program not planned). Reads the status from the error or, for
 * a resource's error, from its cause.
 */
export function loadErrorTextUnlessMissing(error: unknown, lead: string): string | null {
  if (!error) return null;
  const cause = error instanceof HttpErrorResponse ? error : (error as { cause?: unknown }).cause;
  if (cause instanceof HttpErrorResponse && cause.status === 404) return null;
  return loadErrorText(error, lead);
}
