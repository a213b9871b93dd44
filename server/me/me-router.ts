import { Router } from 'express';
import { type Me, updateMeBody } from '../../common/contracts/me';
import type { DB } from '../../db/database';
import type { AppDeps } from '../app-deps';
import { actorOf, requireActor } from '../auth/actor';
import { AppError } from '../lib/app-error';
import { endpoint } from '../lib/endpoint';

async function loadMe(db: DB, userId: string): Promise<Me> {
  const user = await db
    .selectFrom('users')
    .select(['id', 'name', 'email', 'email_verified', 'unit_system', 'is_admin'])
    .where('id', '=', userId)
    .executeTakeFirst();
  if (!user) throw new AppError('unauthenticated', 'Sign in to do this.');
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    emailVerified: user.email_verified,
    unitSystem: user.unit_system,
    isAdmin: user.is_admin,
  };
}

export function meRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router();
  router.get(
    '/',
    endpoint({}, async (_input, _req, res) => {
      res.json(await loadMe(db, requireActor(res).userId));
    }),
  );
  router.patch(
    '/',
    endpoint({ body: updateMeBody }, async ({ body }, _req, res) => {
      const actor = requireActor(res);
      const changes = {
        ...(body.name ? { name: body.name } : {}),
        ...(body.unitSystem ? { unit_system: body.unitSystem } : {}),
      };
      if (Object.keys(changes).length) {
        await db
          .updateTable('users')
          .set({ ...changes, updated_at: new Date() })
          .where('id', '=', actor.userId)
          .execute();
      }
      res.json(await loadMe(db, actor.userId));
    }),
  );
  return router;
}

/**
 * GET /api/session: who is signed in, or `{ user: null }`. Pages that work signed out too (the
 * public results sheet) ask this instead of /api/me, so a reader's browser logs no 401.
 */
export function sessionRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router();
  router.get(
    '/',
    endpoint({}, async (_input, _req, res) => {
      const actor = actorOf(res);
      res.json({ user: actor ? await loadMe(db, actor.userId) : null });
    }),
  );
  return router;
}
