import type { ErrorRequestHandler, RequestHandler } from 'express';
import { MulterError } from 'multer';
import { z } from 'zod';
import { AppError, type ErrorCode } from './app-error';
import { issuesOf, validationFailed } from './endpoint';

/** PostgreSQL's own refusals, mapped to what the client can act on. */
function fromDatabase(err: {
  code?: string;
  constraint?: string;
  detail?: string;
}): AppError | null {
  switch (err.code) {
    case '23505':
      return new AppError('conflict', 'A record with the same identifying values already exists.', {
        constraint: err.constraint,
      });
    case '23503':
      return new AppError(
        'validation_failed',
        'The record refers to something that does not exist in this trial.',
        {
          constraint: err.constraint,
        },
      );
    case '23514':
    case '23502':
    case '22021': // NUL, or a character the database encoding cannot hold
    case '22P05':
    case '22P02':
    case '22003':
    case '22007':
    case '22008':
      return new AppError(
        'validation_failed',
        'The database refused a value that is out of range or malformed.',
        {
          constraint: err.constraint,
        },
      );
    default:
      return null;
  }
}

/**
 * The database server is away (restarting, crashed, refusing connections while it starts) or
 * every connection is busy: nothing was committed by the failed statement, so the caller may
 * send the same request again.
 */
function databaseAway(err: unknown): boolean {
  // The sign-in library wraps the driver's error in its own (as `cause`).
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 5; depth++) {
    const { code, message, cause } = e as { code?: unknown; message?: unknown; cause?: unknown };
    if (typeof code === 'string') {
      if (/^(57P0[1-3]|08\w{3})$/.test(code)) return true;
      if (['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'ETIMEDOUT'].includes(code)) return true;
    }
    if (
      typeof message === 'string' &&
      /^(Connection terminated|timeout exceeded when trying to connect|Client has encountered a connection error)/.test(
        message,
      )
    )
      return true;
    e = cause;
  }
  return false;
}

const codeForStatus: Partial<Record<number, ErrorCode>> = {
  400: 'validation_failed',
  401: 'unauthenticated',
  403: 'forbidden',
  404: 'not_found',
  409: 'conflict',
  413: 'payload_too_large',
  415: 'unsupported_media_type',
  422: 'unprocessable',
  429: 'rate_limited',
};

function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof z.ZodError) return validationFailed(issuesOf(err, ''));
  if (err instanceof MulterError) {
    if (
      err.code === 'LIMIT_FILE_SIZE' ||
      err.code === 'LIMIT_FILE_COUNT' ||
      err.code === 'LIMIT_PART_COUNT'
    ) {
      return new AppError('payload_too_large', err.message, { limit: err.code, field: err.field });
    }
    return new AppError('validation_failed', err.message, { field: err.field });
  }
  const e = err as { type?: string; status?: number; code?: string; limit?: number };
  if (e?.type === 'entity.parse.failed')
    return new AppError('validation_failed', 'The request body is not valid JSON.');
  if (e?.type === 'entity.too.large') {
    return new AppError(
      'payload_too_large',
      `The request body is larger than the limit of ${e.limit} bytes.`,
    );
  }
  // Parser and router refusals (bad charset or Content-Encoding, a body that does not
  // inflate, a malformed percent-escape in the path) carry their own 4xx status.
  const status =
    typeof e?.status === 'number' ? e.status : (e as { statusCode?: number })?.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500)
    return new AppError(
      codeForStatus[status] ?? 'validation_failed',
      (e as { expose?: boolean }).expose === false
        ? 'The request could not be read.'
        : `The request could not be read: ${(err as Error).message}`,
    );
  if (databaseAway(err))
    return new AppError(
      'unavailable',
      'The database is restarting; nothing was saved. Try again in a moment.',
    );
  if (typeof e?.code === 'string') {
    const mapped = fromDatabase(e as { code: string });
    if (mapped) return mapped;
  }
  return new AppError('internal', 'Something went wrong on our side. The error has been logged.');
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const appError = toAppError(err);
  if (appError.code === 'unavailable') req.log?.warn({ err }, 'database unavailable');
  else if (appError.status >= 500) req.log?.error({ err }, 'request failed');
  if (res.headersSent) return;
  // A limit that says when it frees up (AppError details.retryAfterSeconds) tells the client too.
  const retryAfter = (appError.details as { retryAfterSeconds?: unknown } | undefined)
    ?.retryAfterSeconds;
  if (appError.status === 429 && typeof retryAfter === 'number')
    res.setHeader('Retry-After', String(Math.ceil(retryAfter)));
  if (appError.code === 'unavailable') res.setHeader('Retry-After', '1');
  res.status(appError.status).json({
    error: {
      code: appError.code,
      message: appError.message,
      ...(appError.details === undefined ? {} : { details: appError.details }),
    },
  });
};

export const apiNotFound: RequestHandler = (req) => {
  throw new AppError(
    'not_found',
    `No API route matches ${req.method} ${req.originalUrl.split('?')[0]}.`,
  );
};
