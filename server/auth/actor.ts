import type { RequestHandler, Response } from 'express';
import { fromNodeHeaders } from 'better-auth/node';
import type { Actor } from '../../common/policy';
import { AppError } from '../lib/app-error';
import type { Auth } from './auth';

/**
 * Reads the session cookie once per request and leaves the signed-in user in res.locals.
 * Requests for which `readsAsNobody(path)` holds (routes that serve anyone alike) skip the
 * session lookup and act as nobody.
 */
export function resolveActor(
  auth: Auth,
  readsAsNobody: (path: string) => boolean = () => false,
): RequestHandler {
  return async (req, res, next) => {
    if (readsAsNobody(req.path)) {
      res.locals.actor = null;
      next();
      return;
    }
    const session = await auth.api.getSession({ headers: fromNodeHeaders(req.headers) });
    res.locals.actor = session
      ? ({
          userId: session.user.id,
          isAdmin: Boolean((session.user as { isAdmin?: boolean }).isAdmin),
        } satisfies Actor)
      : null;
    next();
  };
}

export function actorOf(res: Response): Actor | null {
  return (res.locals.actor as Actor | null | undefined) ?? null;
}

export function requireActor(res: Response): Actor {
  const actor = actorOf(res);
  if (!actor) throw new AppError('unauthenticated', 'Sign in to do this.');
  return actor;
}
