import type { RequestHandler } from 'express';
import { sql } from 'kysely';
import type { DB } from '../../db/database';
import { actorOf } from '../auth/actor';
import { CLIENT_IP_HEADER } from '../auth/auth';
import { AppError } from './app-error';

export interface RateLimit {
  /** Name of the limit, shared by the routes it covers. */
  bucket: string;
  /** Requests allowed per caller in one window. */
  max: number;
  windowSeconds: number;
}

/**
 * At most `max` requests per caller (the signed-in account, else the caller's address) in a
 * fixed window, counted in PostgreSQL so every app process agrees. One statement counts the
 * request and reads the total, so concurrent requests cannot both take the last place.
 */
export function rateLimit(db: DB, limit: RateLimit): RequestHandler {
  return async (req, res, next) => {
    const actor = actorOf(res);
    const caller = actor
      ? `account:${actor.userId}`
      : `address:${String(req.headers[CLIENT_IP_HEADER] ?? 'unknown').slice(0, 180)}`;
    const window = sql`make_interval(secs => ${limit.windowSeconds})`;
    const { rows } = await sql<{ hits: number; retry_after: number }>`
      insert into request_rate_windows as w (bucket, caller, window_started_at, hits)
      values (${limit.bucket}, ${caller}, now(), 1)
      on conflict (bucket, caller) do update set
        hits = case when w.window_started_at <= now() - ${window} then 1 else w.hits + 1 end,
        window_started_at =
          case when w.window_started_at <= now() - ${window} then now() else w.window_started_at end
      returning hits,
        extract(epoch from (window_started_at + ${window} - now()))::float8 as retry_after`.execute(
      db,
    );
    const { hits, retry_after } = rows[0]!;
    if (hits > limit.max) {
      const seconds = Math.max(1, Math.ceil(retry_after));
      throw new AppError(
        'rate_limited',
        `At most ${limit.max} requests of this kind per ${limit.windowSeconds} s; try again in ${seconds} s.`,
        {
          limit: limit.bucket,
          max: limit.max,
          windowSeconds: limit.windowSeconds,
          retryAfterSeconds: seconds,
        },
      );
    }
    next();
  };
}
