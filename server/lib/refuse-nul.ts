import type { RequestHandler } from 'express';
import { AppError } from './app-error';

const MESSAGE = 'Text cannot contain a NUL character (code 0).';

/** The first place (as "body.a.0.b") where a string or key holds a NUL character, if any. */
function findNul(value: unknown, path: string, depth = 0): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path : null;
  if (depth > 32 || value === null || typeof value !== 'object') return null;
  for (const [key, inner] of Object.entries(value)) {
    const at = `${path}.${key}`;
    if (key.includes('\u0000')) return at;
    const found = findNul(inner, at, depth + 1);
    if (found) return found;
  }
  return null;
}

/**
 * PostgreSQL text cannot hold NUL, and no field of ours has a use for it: a NUL in the path,
 * the query string or a JSON body is refused here with the field named, before any service
 * (or the sign-in library) sees it.
 */
export const refuseNul: RequestHandler = (req, _res, next) => {
  const url = req.originalUrl;
  const hasNul = (text: string) => text.includes('\0') || /%00/i.test(text);
  const place = hasNul(url)
    ? hasNul(url.split('?')[0]!)
      ? 'path'
      : 'query'
    : findNul(req.body, 'body');
  if (place)
    throw new AppError('validation_failed', `Check ${place}: ${MESSAGE}`, {
      fields: [{ path: place, message: MESSAGE }],
    });
  next();
};
