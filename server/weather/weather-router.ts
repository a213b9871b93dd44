import { Router } from 'express';
import {
  seasonQuery,
  weatherDayBody,
  weatherDayParams,
  weatherImportBody,
  weatherListQuery,
} from '../../common/contracts/weather';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import * as service from './weather-service';

/** Mounted at /api/trials/:slug: daily weather per site and the season summary. */
export function weatherRouter({ db }: Pick<AppDeps, 'db'>) {
  const router = Router({ mergeParams: true });
  router.get(
    '/weather',
    endpoint({ params: trialSlugParams, query: weatherListQuery }, async (input, _req, res) => {
      res.json(await service.listWeather(db, input.params.slug, actorOf(res), input.query));
    }),
  );
  router.post(
    '/weather/import',
    endpoint({ params: trialSlugParams, body: weatherImportBody }, async (input, _req, res) => {
      const result = await service.importCsv(db, input.params.slug, actorOf(res), input.body);
      res.status(result.dryRun ? 200 : 201).json(result);
    }),
  );
  router.put(
    '/weather/:siteId/:date',
    endpoint({ params: weatherDayParams, body: weatherDayBody }, async (input, _req, res) => {
      const { slug, siteId, date } = input.params;
      res.json(await service.putDay(db, slug, actorOf(res), siteId, date, input.body));
    }),
  );
  router.delete(
    '/weather/:siteId/:date',
    endpoint({ params: weatherDayParams }, async (input, _req, res) => {
      const { slug, siteId, date } = input.params;
      await service.removeDay(db, slug, actorOf(res), siteId, date);
      res.status(204).end();
    }),
  );
  router.get(
    '/season',
    endpoint({ params: trialSlugParams, query: seasonQuery }, async (input, _req, res) => {
      res.json(await service.season(db, input.params.slug, actorOf(res), input.query));
    }),
  );
  return router;
}
