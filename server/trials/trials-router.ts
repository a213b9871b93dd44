import { Router } from 'express';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './trials-service';

export function trialsRouter({ db }: Pick<AppDeps, 'db'>) {
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
  return router;
}
