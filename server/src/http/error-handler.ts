import type { ErrorRequestHandler, RequestHandler } from 'express';
import { MulterError } from 'multer';
import { ZodError } from 'zod';
import type { ApiErrorBody } from '@spincycle/shared/http/api-error';
import { AppError } from './app-error';

/** Turns a ZodError into `{ fieldErrors }` keyed by dotted path, and a message naming the first field. */
function zodToBody(err: ZodError): ApiErrorBody {
  const fieldErrors: Record<string, string[]> = {};
  for (const issue of err.issues) {
    const key = issue.path.length ? issue.path.join('.') : '_';
    (fieldErrors[key] ??= []).push(issue.message);
  }
  const first = err.issues[0];
  const where = first && first.path.length ? `${first.path.join('.')}: ` : '';
  return { code: 'validation_failed', message: `${where}${first?.message ?? 'Invalid input'}`, fieldErrors };
}

/** Errors thrown by body parsers and multer carry a status and a type. */
interface HttpishError {
  status?: number;
  statusCode?: number;
  type?: string;
  code?: string;
  expose?: boolean;
  message: string;
}

/** The one error handler, last in the chain. Everything non-2xx leaves as `{ code, message, fieldErrors? }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) return;
  if (err instanceof ZodError) {
    res.status(400).json(zodToBody(err));
    return;
  }
  // 503: a service the request needs (e.g. the card processor) is unreachable; its message is written for users.
  if (err instanceof AppError && (err.status < 500 || err.status === 503)) {
    const body: ApiErrorBody & Record<string, unknown> = { ...err.details, code: err.code, message: err.message };
    if (err.fieldErrors) body.fieldErrors = err.fieldErrors;
    res.status(err.status).json(body);
    return;
  }
  if (err instanceof MulterError) {
    // Upload routes translate multer's errors themselves (http/upload-limits.ts); this is the
    // safety net for any other, so that they still leave in the API error shape.
    const status = err.code === 'LIMIT_FILE_SIZE' ? 413 : 400;
    res
      .status(status)
      .json({ code: err.code.toLowerCase(), message: `Upload refused: ${err.message}${err.field ? ` (field ${err.field})` : ''}` });
    return;
  }
  const e = err as HttpishError;
  const status = e.status ?? e.statusCode;
  if (status && status >= 400 && status < 500) {
    const code =
      e.type === 'entity.parse.failed'
        ? 'malformed_json'
        : e.type === 'entity.too.large'
          ? 'payload_too_large'
          : (e.code?.toLowerCase() ?? 'bad_request');
    const message = e.type === 'entity.parse.failed' ? 'The request body is not valid JSON' : e.message;
    res.status(status).json({ code, message });
    return;
  }
  req.log?.error({ err }, 'unhandled error');
  res.status(500).json({ code: 'internal_error', message: 'Something went wrong on the server. The error has been logged.' });
};

/** 404 for unknown `/api` paths (the single-page app handles every other path). */
export const apiNotFound: RequestHandler = (req, res) => {
  res.status(404).json({ code: 'not_found', message: `No API route for ${req.method} ${req.originalUrl}` });
};
