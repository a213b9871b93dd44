import express, { Router } from 'express';
import {
  ANALYZE_MAX_BYTES,
  analyzeJsonBody,
  analyzeOptions,
  rankingQuery,
  trialAnalysisQuery,
} from '../../common/contracts/analysis';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf, requireActor } from '../auth/actor';
import { AppError } from '../lib/app-error';
import { endpoint, parseOr400 } from '../lib/endpoint';
import { rateLimit } from '../lib/rate-limit';
import * as service from './analysis-service';

/** One limit for every route that runs the analysis engine, per account (or address). */
function analysisRateLimit({ db, env }: Pick<AppDeps, 'db' | 'env'>) {
  return rateLimit(db, {
    bucket: 'analysis',
    max: env.ANALYSIS_RATE_PER_MINUTE,
    windowSeconds: 60,
  });
}

/** Mounted at /api/trials/:slug: a trial's analysis and ranking (trial.read). */
export function trialAnalysisRouter(deps: Pick<AppDeps, 'db' | 'env'>) {
  const { db } = deps;
  const limited = analysisRateLimit(deps);
  const router = Router({ mergeParams: true });
  router.get(
    '/analysis',
    limited,
    endpoint({ params: trialSlugParams, query: trialAnalysisQuery }, async (input, _req, res) => {
      res.json(await service.trialAnalysis(db, input.params.slug, actorOf(res), input.query));
    }),
  );
  router.get(
    '/ranking',
    limited,
    endpoint({ params: trialSlugParams, query: rankingQuery }, async (input, _req, res) => {
      res.json(await service.trialRanking(db, input.params.slug, actorOf(res), input.query));
    }),
  );
  return router;
}

/**
 * Mounted at /api/analyze: a spreadsheet in, the analyze command's JSON out, nothing stored.
 * Any signed-in account may use it (it reads no trial). The CSV comes as a text/csv body (up
 * to 2 MB, options in the query string) or as `csv` in a JSON body (the app's 1 MB JSON limit).
 */
export function analyzeRouter(deps: Pick<AppDeps, 'db' | 'env'>) {
  const router = Router();
  const csvText = express.text({
    type: ['text/csv', 'text/plain', 'application/csv'],
    limit: ANALYZE_MAX_BYTES,
  });
  router.post(
    '/',
    (_req, res, next) => {
      requireActor(res);
      next();
    },
    analysisRateLimit(deps),
    csvText,
    async (req, res) => {
      let csv: string;
      let raw: unknown;
      let part: 'query' | 'body';
      if (req.is(['text/csv', 'text/plain', 'application/csv'])) {
        csv = typeof req.body === 'string' ? req.body : '';
        raw = req.query;
        part = 'query';
        if (csv.trim() === '')
          throw new AppError('validation_failed', 'The spreadsheet is empty.', {
            fields: [{ path: 'body', message: 'The spreadsheet is empty.' }],
          });
      } else if (req.is('application/json')) {
        const body = parseOr400(analyzeJsonBody, req.body ?? {}, 'body');
        csv = body.csv;
        raw = body;
        part = 'body';
      } else {
        throw new AppError(
          'unsupported_media_type',
          'Send the spreadsheet as text/csv (or JSON with a "csv" field).',
        );
      }
      const options = parseOr400(analyzeOptions, raw, part);
      res.json(await service.analyzeSpreadsheet(csv, options));
    },
  );
  return router;
}
