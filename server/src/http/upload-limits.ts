import { tmpdir } from 'node:os';
import { rm } from 'node:fs/promises';
import type { RequestHandler } from 'express';
import multer, { MulterError } from 'multer';
import { AppError } from './app-error';

/** Largest justification PDF accepted. */
export const JUSTIFICATION_MAX_BYTES = 10 * 1024 * 1024;
/** Largest target-list CSV accepted (2000 rows of a dozen columns stay far below it). */
export const TARGET_CSV_MAX_BYTES = 5 * 1024 * 1024;

export interface SingleFileUploadOptions {
  /** Multipart field carrying the file. */
  field: string;
  maxBytes: number;
  /** Message of the 413 answer, naming what was too large and the limit. */
  tooLargeMessage: string;
}

/**
 * One file in memory from a multipart form, with multer's errors turned into AppErrors that
 * name the limit (413 `file_too_large`) or the expected field (400), so that they leave
 * through the one error handler like every other error.
 */
export function singleFileUpload(options: SingleFileUploadOptions): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // File names in browsers' multipart bodies are UTF-8.
    defParamCharset: 'utf8',
    limits: { fileSize: options.maxBytes, files: 1, fields: 20, parts: 25 },
  }).single(options.field);
  return (req, res, next) => {
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE')
          return next(new AppError('file_too_large', options.tooLargeMessage, 413, { [options.field]: [options.tooLargeMessage] }));
        if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
          const message = `Send exactly one file, in the form field "${options.field}"`;
          return next(new AppError('unexpected_file_field', message, 400, { [options.field]: [message] }));
        }
        return next(new AppError('bad_upload', `The upload was refused: ${err.message}`, 400));
      }
      // busboy's own errors (a truncated or malformed multipart body) are the client's.
      const message = err instanceof Error ? err.message : String(err);
      return next(new AppError('bad_upload', `The upload could not be read: ${message}`, 400));
    });
  };
}

/** The uploaded file, or 400 `file_missing` naming the field. */
export function requireUploadedFile(file: Express.Multer.File | undefined, field: string): Express.Multer.File {
  if (!file) {
    const message = `Attach the file as multipart/form-data in the field "${field}"`;
    throw new AppError('file_missing', message, 400, { [field]: [message] });
  }
  return file;
}

export interface MultiFileUploadOptions {
  field: string;
  maxBytes: number;
  maxFiles: number;
  tooLargeMessage: string;
}

/**
 * Several files of a multipart form, each written to a temporary file (large files are read
 * back as streams, never held whole in memory); the files are removed when the response ends,
 * whatever happens. Multer's errors become AppErrors as in {@link singleFileUpload}.
 */
export function multiFileUpload(options: MultiFileUploadOptions): RequestHandler {
  const upload = multer({
    storage: multer.diskStorage({ destination: tmpdir() }),
    defParamCharset: 'utf8',
    limits: { fileSize: options.maxBytes, files: options.maxFiles, fields: 20, parts: options.maxFiles + 20 },
  }).array(options.field, options.maxFiles);
  return (req, res, next) => {
    const cleanUp = () => {
      const files = Array.isArray(req.files) ? req.files : [];
      for (const f of files) if (f.path) void rm(f.path, { force: true });
    };
    res.on('close', cleanUp);
    upload(req, res, (err?: unknown) => {
      if (!err) return next();
      if (err instanceof MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE')
          return next(new AppError('file_too_large', options.tooLargeMessage, 413, { [options.field]: [options.tooLargeMessage] }));
        if (err.code === 'LIMIT_FILE_COUNT' || (err.code === 'LIMIT_UNEXPECTED_FILE' && err.field === options.field)) {
          const message = `Send at most ${options.maxFiles} files at once`;
          return next(new AppError('too_many_files', message, 400, { [options.field]: [message] }));
        }
        if (err.code === 'LIMIT_UNEXPECTED_FILE') {
          const message = `Send the files in the form field "${options.field}"`;
          return next(new AppError('unexpected_file_field', message, 400, { [options.field]: [message] }));
        }
        return next(new AppError('bad_upload', `The upload was refused: ${err.message}`, 400));
      }
      const message = err instanceof Error ? err.message : String(err);
      return next(new AppError('bad_upload', `The upload could not be read: ${message}`, 400));
    });
  };
}
