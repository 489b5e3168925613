/** An error with an HTTP status and a stable code; messages of statuses < 500 reach the client. */
export class AppError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly status = 400,
    readonly fieldErrors?: Record<string, string[]>,
    /** Further members of the error body (e.g. `rows` of a refused target list); never `code`, `message` or `fieldErrors`. */
    readonly details?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what: string) => new AppError('not_found', `${what} was not found`, 404);

/** 400 `validation_failed` about one field of the input, in the shape of a zod refusal (`field: message`). */
export const invalidField = (field: string, message: string) =>
  new AppError('validation_failed', `${field}: ${message}`, 400, { [field]: [message] });
