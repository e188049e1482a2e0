import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { ERROR_STATUS, type ErrorBody, type ErrorCode, type FieldErrors, fieldErrorsFromIssues } from '#shared/errors.ts';

/** The one error type handlers throw; the error middleware turns it into the one reply shape. */
export class ApiError extends Error {
  constructor(
    public readonly code: ErrorCode,
    message: string,
    public readonly details?: Record<string, unknown> & { fields?: FieldErrors },
  ) {
    super(message);
  }
  get status(): number {
    return ERROR_STATUS[this.code];
  }
}

export const notFound = (what = 'That record') => new ApiError('not_found', `${what} was not found.`);
export const forbidden = (action: string) => new ApiError('forbidden', `You do not have permission to ${action}.`);
export const unauthenticated = () => new ApiError('unauthenticated', 'Sign in to continue.');
export const conflict = (message: string, details?: Record<string, unknown>) => new ApiError('conflict', message, details);
export const invalid = (fields: FieldErrors, message = 'Some fields need attention.') =>
  new ApiError('validation_failed', message, { fields });

// Connection-level failures mean the database is away, not that the request was wrong.
const DB_DOWN_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', '57P01', '57P02', '57P03', '08000', '08003', '08006', '08001', '08004']);

function isDatabaseDown(err: unknown): boolean {
  if (!err || typeof err !== 'object') return false;
  const e = err as { code?: string; message?: string; errors?: unknown[] };
  if (e.code && DB_DOWN_CODES.has(e.code)) return true;
  if (Array.isArray(e.errors) && e.errors.some(isDatabaseDown)) return true;
  const m = e.message ?? '';
  return /Connection terminated|timeout exceeded when trying to connect|connect ECONNREFUSED|the database system is (starting up|shutting down)/.test(m);
}

/** Maps constraint violations that reach us to a useful reply rather than a 500. */
function fromPostgres(err: unknown): ApiError | null {
  if (!err || typeof err !== 'object') return null;
  const e = err as { code?: string; constraint?: string };
  if (isUniqueViolation(e)) return new ApiError('conflict', 'That would duplicate an existing record.');
  if (e.code === '23503') return new ApiError('conflict', 'That refers to a record that does not exist or is still in use.');
  if (e.code === '22P02' || e.code === '23514') return new ApiError('validation_failed', 'A value was not acceptable.', {});
  // Text PostgreSQL cannot store (a NUL that got past the guard) and dates out of its range.
  if (e.code === '22021' || e.code === '22P05') return new ApiError('validation_failed', 'Some text holds characters that cannot be stored.', {});
  if (e.code === '22008' || e.code === '22007' || e.code === '22003') return new ApiError('validation_failed', 'A date or number is out of range.', {});
  return null;
}

export function toApiError(err: unknown): ApiError {
  if (err instanceof ApiError) return err;
  if (err instanceof ZodError) return invalid(fieldErrorsFromIssues(err.issues));
  const e = err as { type?: string; status?: number; code?: string; name?: string } | null;
  if (e?.type === 'entity.too.large' || e?.code === 'LIMIT_FILE_SIZE') return new ApiError('payload_too_large', 'That is larger than allowed.');
  if (e?.type === 'entity.parse.failed') return new ApiError('validation_failed', 'The request body is not valid JSON.', { fields: {} });
  if (e?.type === 'charset.unsupported') return new ApiError('unsupported_media_type', 'Send JSON encoded as UTF-8.');
  if (e?.type === 'encoding.unsupported') return new ApiError('unsupported_media_type', 'That content encoding is not accepted; send the body uncompressed or gzip-compressed.');
  // A body that claims a compression it does not have, or is cut short.
  if (e?.type === 'request.aborted' || e?.code === 'Z_DATA_ERROR' || e?.code === 'Z_BUF_ERROR' || (e?.status === 400 && typeof e?.type === 'string')) {
    return new ApiError('validation_failed', 'The request body could not be read.', { fields: {} });
  }
  if (isDatabaseDown(err)) return new ApiError('unavailable', 'The database is not reachable right now. Try again in a moment.');
  const pgErr = fromPostgres(err);
  if (pgErr) return pgErr;
  return new ApiError('internal', 'Something went wrong on our side. It has been logged.');
}

export function errorBody(err: ApiError): ErrorBody {
  return { error: { code: err.code, message: err.message, ...(err.details ? { details: err.details } : {}) } };
}

// One-time signing, withdrawal and confirmation tokens are the performer's alone: never written to a log.
const TOKEN_PATHS = /(\/(?:api\/)?(?:signing|sign|withdrawal-links|withdraw|email-confirmations|confirm-email|account-invitations|join)\/)[^/?#]+/g;

/** A URL fit for a log line: token path segments and the whole query string replaced. */
export function redactUrl(url: string): string {
  const [pathPart] = url.split(/[?#]/, 1);
  const redacted = (pathPart ?? '').replace(TOKEN_PATHS, '$1[redacted]');
  return url.length > (pathPart ?? '').length ? `${redacted}?[redacted]` : redacted;
}

export function errorHandler(log: (msg: string, err?: unknown) => void): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const apiErr = toApiError(err);
    if (apiErr.code === 'internal') log(`${req.method} ${redactUrl(req.originalUrl)} failed`, err);
    if (res.headersSent) return;
    res.status(apiErr.status).json(errorBody(apiErr));
  };
}

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new ApiError('not_found', `No API route ${req.method} ${req.path}.`));
};

/** Whether a database error is a unique-key violation (of this constraint, when named). */
export function isUniqueViolation(err: unknown, constraint?: string): boolean {
  const e = err as { code?: string; constraint?: string } | null;
  return e?.code === '23505' && (constraint === undefined || e.constraint === constraint);
}

/**
 * A duplicate that got past the checks answers as the check would have: the constraint's field
 * message. Anything else goes on to the error handler unchanged.
 */
export function duplicateAsFields(fieldsByConstraint: Record<string, Record<string, string[]>>): (err: unknown) => never {
  return (err: unknown) => {
    for (const [constraint, fields] of Object.entries(fieldsByConstraint)) {
      if (isUniqueViolation(err, constraint)) throw invalid(fields);
    }
    throw err;
  };
}
