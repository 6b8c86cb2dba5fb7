import type { ErrorRequestHandler } from 'express';
import multer from 'multer';
import { ZodError } from 'zod';

export interface FieldError {
  path: string;
  message: string;
}

/** The one error type of the API: a machine code, an HTTP status and a sentence for people. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldError[],
    /** Response headers that belong to the answer, such as Retry-After on a 429. */
    readonly headers?: Record<string, string>,
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new AppError(404, 'not_found', `${what} not found.`);
export const forbidden = (reason: string) => new AppError(403, 'forbidden', reason);
export const conflict = (reason: string) => new AppError(409, 'conflict', reason);

export function fieldsFromZod(error: ZodError): FieldError[] {
  return error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

export function validationError(error: ZodError, message = 'Some fields are not valid.'): AppError {
  return new AppError(400, 'invalid_input', message, fieldsFromZod(error));
}

export const errorMiddleware: ErrorRequestHandler = (err, req, res, _next) => {
  if (err instanceof ZodError) err = validationError(err);
  if (err instanceof multer.MulterError) {
    err =
      err.code === 'LIMIT_FILE_SIZE'
        ? new AppError(413, 'too_large', 'The file is larger than the upload limit for its kind.', [
            { path: err.field ?? 'file', message: 'over the size limit' },
          ])
        : new AppError(400, 'invalid_upload', err.message, [{ path: err.field ?? 'file', message: err.message }]);
  }
  // body-parser marks its own failures (bad JSON, too large) with a status and a type.
  if (!(err instanceof AppError) && typeof err?.status === 'number' && err.status < 500) {
    const code = err.type === 'entity.parse.failed' ? 'malformed_json' : err.type === 'entity.too.large' ? 'too_large' : 'bad_request';
    const message = code === 'malformed_json' ? 'The request body is not valid JSON.' : String(err.message);
    err = new AppError(err.status, code, message);
  }
  if (err instanceof AppError) {
    if (err.headers) res.set(err.headers);
    res.status(err.status).json({ error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } });
    return;
  }
  req.log?.error({ err }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server; nothing was saved.' } });
};
