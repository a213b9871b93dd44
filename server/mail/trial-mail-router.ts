import { Router } from 'express';
import { trialMailQuery } from '../../common/contracts/mail';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './trial-mail-service';

/** Mounted at /api/trials/:slug/mail: pending, sent and failed mail the trial caused. */
export function trialMailRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint(
      { params: trialSlugParams, query: trialMailQuery },
      async ({ params, query }, _req, res) => {
        res.json(await service.trialMail(db, params.slug, actorOf(res), query));
      },
    ),
  );
  return router;
}
