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
    /** Extra members of the answer beside `error` (e.g. the current revision of a stale write) and headers. */
    readonly extra: { body?: Record<string, unknown>; headers?: Record<string, string> } = {},
  ) {
    super(message);
  }
}

/** A reason the server cannot start, said in one line (the process prints it and exits). */
export class StartupError extends Error {}

export const notFound = (what: string) => new AppError(404, 'not_found', `${what} not found.`);
export const forbidden = (reason: string) => new AppError(403, 'forbidden', reason);
export const conflict = (reason: string) => new AppError(409, 'conflict', reason);

function fieldsFromZod(error: ZodError): FieldError[] {
  return error.issues.map((issue) => ({ path: issue.path.join('.'), message: issue.message }));
}

export function validationError(error: ZodError, message = 'Some fields are not valid.'): AppError {
  return new AppError(400, 'invalid_input', message, fieldsFromZod(error));
}

const systemCode = (err: unknown): string => String((err as { code?: unknown } | null)?.code ?? '');

/**
 * Faults of the disk or the database rather than of the request: a busy database (another process
 * holds the write lock past the busy timeout), a full disk, a read-only data folder. Each is an answer
 * a client can act on, never a 500, and nothing was stored (the transaction rolled back).
 */
export function storageFault(err: unknown): AppError | null {
  const code = systemCode(err);
  // PostgreSQL's SQLSTATEs beside SQLite's codes: lock wait timed out, deadlock, serialization failure.
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED') || ['55P03', '40P01', '40001'].includes(code)) {
    return new AppError(503, 'busy', 'The database is busy with another writer; nothing was saved. Try again in a moment.', undefined, {
      headers: { 'Retry-After': '2' },
    });
  }
  if (code === 'ENOSPC' || code === 'EDQUOT' || code.startsWith('SQLITE_FULL') || code === '53100') {
    return new AppError(507, 'insufficient_storage', 'The server has no storage space left; nothing was saved. Ask the administrator to free space.');
  }
  if (code === 'EROFS' || code === 'EACCES' || code === 'EPERM' || code.startsWith('SQLITE_READONLY') || code === '25006') {
    return new AppError(503, 'read_only', 'The data folder is read-only at the moment; nothing was saved. Reading still works.', undefined, {
      headers: { 'Retry-After': '60' },
    });
  }
  return null;
}

export const errorMiddleware: ErrorRequestHandler = (err, req, res, _next) => {
  if (res.headersSent) {
    // A download that failed half-way: the status is gone, so the client sees a cut-off answer.
    req.log?.warn({ err }, 'error after the answer had started');
    res.destroy();
    return;
  }
  if (err instanceof ZodError) err = validationError(err);
  if (err instanceof multer.MulterError) {
    err =
      err.code === 'LIMIT_FILE_SIZE'
        ? new AppError(413, 'too_large', 'The file is larger than the upload limit for its kind.', [
            { path: err.field ?? 'file', message: 'over the size limit' },
          ])
        : new AppError(400, 'invalid_upload', err.message, [{ path: err.field ?? 'file', message: err.message }]);
  }
  // body-parser marks its own failures (bad JSON, too large, too deep) with a status and a type.
  if (!(err instanceof AppError) && typeof err?.status === 'number' && err.status < 500) {
    const codes: Record<string, string> = {
      'entity.parse.failed': 'malformed_json',
      'entity.too.large': 'too_large',
      'entity.too.deep': 'too_deep',
      'charset.unsupported': 'unsupported_charset',
    };
    const code = codes[String(err.type)] ?? 'bad_request';
    const message = code === 'malformed_json' ? 'The request body is not valid JSON.' : String(err.message);
    err = new AppError(err.status, code, message);
  }
  if (!(err instanceof AppError)) {
    const fault = storageFault(err);
    if (fault) {
      req.log?.warn({ err }, fault.code);
      err = fault;
    }
  }
  if (err instanceof AppError) {
    for (const [name, value] of Object.entries(err.extra.headers ?? {})) res.setHeader(name, value);
    res
      .status(err.status)
      .json({ error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) }, ...err.extra.body });
    return;
  }
  req.log?.error({ err }, 'unhandled error');
  res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on the server; nothing was saved.' } });
};
