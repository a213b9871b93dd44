import { Router } from 'express';
import { z } from 'zod';
import { analysisBases, traitKey } from '../../common/contracts/analysis';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './comparison-service';

const entrySiteQuery = z.object({ trait: traitKey, basis: z.enum(analysisBases).default('plot') });

/** Under /api/trials/:slug/comparison: readers of the trial. */
export function comparisonRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/harvest-curve',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.harvestCurve(db, params.slug, actorOf(res)));
    }),
  );
  router.get(
    '/entry-site',
    endpoint(
      { params: trialSlugParams, query: entrySiteQuery },
      async ({ params, query }, _req, res) => {
        res.json(await service.entryBySite(db, params.slug, actorOf(res), query));
      },
    ),
  );
  return router;
}
