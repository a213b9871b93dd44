/** The one error type the API throws on purpose; the error middleware turns it into JSON. */
export type ErrorCode =
  | 'validation_failed'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'payload_too_large'
  | 'unsupported_media_type'
  | 'unprocessable'
  | 'rate_limited'
  | 'internal'
  | 'unavailable';

const statusOf: Record<ErrorCode, number> = {
  validation_failed: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  payload_too_large: 413,
  unsupported_media_type: 415,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
};

export class AppError extends Error {
  override name = 'AppError';
  readonly status: number;

  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.status = statusOf[code];
  }

  static notFound(what: string) {
    return new AppError('not_found', `${what} was not found.`);
  }
}

/** A 400 about one field, in the shape parsing failures have (`details.fields`). */
export const fieldError = (path: string, message: string) =>
  new AppError('validation_failed', message, { fields: [{ path, message }] });
