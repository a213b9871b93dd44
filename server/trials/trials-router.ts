import { Router } from 'express';
import { deleteTrialBody, trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './trials-service';

export function trialsRouter(deps: Pick<AppDeps, 'db' | 'env' | 'storage' | 'logger'>) {
  const { db, storage } = deps;
  const router = Router();
  router.get(
    '/',
    endpoint({}, async (_input, _req, res) => {
      res.json({ trials: await service.listVisibleTrials(db, actorOf(res)) });
    }),
  );
  router.get(
    '/:slug',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.trialDetail(db, params.slug, actorOf(res)));
    }),
  );
  router.delete(
    '/:slug',
    endpoint(
      { params: trialSlugParams, body: deleteTrialBody },
      async ({ params, body }, _req, res) => {
        await service.deleteTrial(
          { db, storage, logger: deps.logger },
          params.slug,
          actorOf(res),
          body.confirmSlug,
        );
        res.status(204).end();
      },
    ),
  );
  return router;
}
